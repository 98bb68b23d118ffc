#!/usr/bin/env python3
"""The baseline for benches/render.sh: the demo figure drawn by hand with
matplotlib, as a chemist would script it.

Reads the profile with tomllib and draws a bar per state at its energy, a
dashed connector per step in each path's colour, the energy above each bar and
the label below, on an 85 x 65 mm page (the single-column size eyrie draws),
to SVG, PDF or PNG (the format from the output's extension; PNG at --dpi).

    python3 benches/render_matplotlib.py profiles/demo.toml out.png --dpi 600

Not part of cargo test; needs matplotlib (see benches/render.sh).
"""

import argparse
import tomllib

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

MM = 1 / 25.4
COLOURS = ["#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00"]
DASHES = [(0, (3.4, 2.3)), (0, (1.1, 1.7)), (0, (6.8, 1.7, 1.1, 1.7))]


def columns(paths):
    """x of each state: its longest step count from the start of any path
    that has it, states sharing a column spread side by side."""
    depth = {}
    for _ in paths:  # enough passes for paths that join later paths
        for path in paths:
            via = path["via"]
            depth.setdefault(via[0], 0)
            for p, q in zip(via, via[1:]):
                depth[q] = max(depth.get(q, 0), depth.get(p, 0) + 1)
    x = {}
    for d in sorted(set(depth.values())):
        same = [s for s in depth if depth[s] == d]
        for k, s in enumerate(same):
            x[s] = d + (k - (len(same) - 1) / 2) * 0.5
    return x


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("profile")
    ap.add_argument("output")
    ap.add_argument("--dpi", type=int, default=600)
    a = ap.parse_args()
    with open(a.profile, "rb") as f:
        doc = tomllib.load(f)
    states = {**doc.get("states", {}), **doc.get("ts", {})}
    paths = doc["path"]
    col = columns(paths)

    fig, ax = plt.subplots(figsize=(85 * MM, 65 * MM), dpi=a.dpi)
    plt.rcParams["font.size"] = 7
    half = 0.2
    colour_of = {}
    for k, path in enumerate(paths):
        colour, dash = COLOURS[k % len(COLOURS)], DASHES[k % len(DASHES)]
        via = path["via"]
        for s in via:
            colour_of.setdefault(s, colour)
        for p, q in zip(via, via[1:]):
            x0, x1 = col[p] + half, col[q] - half
            if col[q] < col[p]:
                x0, x1 = col[p] - half, col[q] + half
            ax.plot([x0, x1], [states[p]["g"], states[q]["g"]], color=colour,
                    linestyle=dash, linewidth=0.75)
    for s, st in states.items():
        x, g = col[s], st["g"]
        ax.plot([x - half, x + half], [g, g], color=colour_of.get(s, "black"),
                linewidth=2.0, solid_capstyle="butt")
        ax.annotate(f"{g:.1f}".replace("-", "\u2212"), (x, g), xytext=(0, 2),
                    textcoords="offset points", ha="center", va="bottom", fontsize=7)
        ax.annotate(st.get("label", s), (x, g), xytext=(0, -3),
                    textcoords="offset points", ha="center", va="top", fontsize=7)
    ax.set_ylabel("\u0394G (kcal mol\u207b\u00b9)", fontsize=8)
    ax.set_xlabel("reaction coordinate", fontsize=7)
    ax.set_xticks([])
    for side in ("top", "right", "bottom"):
        ax.spines[side].set_visible(False)
    ax.tick_params(labelsize=7)
    fig.tight_layout()
    fig.savefig(a.output, dpi=a.dpi)


if __name__ == "__main__":
    main()
