#!/usr/bin/env bash
# Renderer speed: `eyrie render` of the demo to SVG, PDF and PNG at 600 dpi
# against a hand-written matplotlib script drawing the same figure
# (benches/render_matplotlib.py, same 85 × 65 mm page and dpi), as whole
# processes in one hyperfine run with a baseline (`cat` of the profile: the
# cost of starting a process and reading the file). Prints mean times, the
# ratio matplotlib / eyrie per format (targets: ≥ 100× for SVG and PDF, ≥ 50×
# for PNG at 600 dpi), peak RSS of each from /usr/bin/time -v, and the
# in-process time per stage (examples/stage_times.rs).
#
# EYRIE_BEFORE=/path/to/older/eyrie adds that binary to the same hyperfine
# run (eyrie-before-*), so a change is measured against its own baseline.
#
# Needs hyperfine (Debian package) and matplotlib in a venv; CI does not run it.
#
#   python3 -m venv /tmp/venv-mpl && /tmp/venv-mpl/bin/pip install matplotlib
#   MPL_PYTHON=/tmp/venv-mpl/bin/python benches/render.sh
set -euo pipefail
cd "$(dirname "$0")/.."
py="${MPL_PYTHON:-python3}"
"$py" -c 'import matplotlib' 2>/dev/null || {
  echo "matplotlib not found for $py; set MPL_PYTHON to a python with matplotlib" >&2
  exit 2
}
cargo build --release --quiet --example stage_times
bin="${CARGO_TARGET_DIR:-target}/release/eyrie"
stages="${CARGO_TARGET_DIR:-target}/release/examples/stage_times"
demo=profiles/demo.toml
mpl=benches/render_matplotlib.py
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
# One matplotlib run first, so its font cache exists before timing.
"$py" "$mpl" "$demo" "$out/warm.svg" >/dev/null

before=()
if [ -n "${EYRIE_BEFORE:-}" ]; then
  before=(-n eyrie-before-svg "$EYRIE_BEFORE render $demo -o $out/b.svg"
    -n eyrie-before-pdf "$EYRIE_BEFORE render $demo -o $out/b.pdf"
    -n eyrie-before-png600 "$EYRIE_BEFORE render $demo -o $out/b.png --dpi 600")
fi

hyperfine --warmup 2 --min-runs 10 -N \
  --export-json "$out/times.json" --export-markdown "$out/times.md" \
  -n baseline "cat $demo" \
  -n eyrie-svg "$bin render $demo -o $out/e.svg" \
  -n eyrie-pdf "$bin render $demo -o $out/e.pdf" \
  -n eyrie-png600 "$bin render $demo -o $out/e.png --dpi 600" \
  -n mpl-svg "$py $mpl $demo $out/m.svg" \
  -n mpl-pdf "$py $mpl $demo $out/m.pdf" \
  -n mpl-png600 "$py $mpl $demo $out/m.png --dpi 600" \
  "${before[@]}"
cat "$out/times.md"
echo
python3 - "$out/times.json" <<'EOF'
import json, sys
results = json.load(open(sys.argv[1]))["results"]
r = {x["command"]: x["mean"] for x in results}
# CPU time (user + system) is less disturbed than wall time when other work
# shares the machine; the targets are on wall time.
cpu = {x["command"]: x["user"] + x["system"] for x in results}
print(f"baseline (cat): {r['baseline'] * 1e3:.2f} ms")
for fmt, target in (("svg", 100), ("pdf", 100), ("png600", 50)):
    e, m = r[f"eyrie-{fmt}"], r[f"mpl-{fmt}"]
    ce, cm = cpu[f"eyrie-{fmt}"], cpu[f"mpl-{fmt}"]
    verdict = "meets" if m / e >= target else "MISSES"
    print(f"{fmt:>7}: eyrie {e * 1e3:8.2f} ms, matplotlib {m * 1e3:8.1f} ms, "
          f"ratio {m / e:6.0f}x ({verdict} the {target}x target); "
          f"CPU {ce * 1e3:.1f} vs {cm * 1e3:.0f} ms, {cm / ce:.0f}x")
    if f"eyrie-before-{fmt}" in r:
        b = r[f"eyrie-before-{fmt}"]
        print(f"{'':>7}  before: {b * 1e3:8.2f} ms, ratio {m / b:6.0f}x; "
              f"now {b / e:.2f}x faster than before")
EOF
echo
rss() { /usr/bin/time -v "$@" 2>&1 >/dev/null | awk -F: '/Maximum resident/ {gsub(/ /,"",$2); print $2}'; }
for ext in svg pdf png; do
  e=$(rss "$bin" render "$demo" -o "$out/e.$ext" --dpi 600)
  m=$(rss "$py" "$mpl" "$demo" "$out/m.$ext" --dpi 600)
  b=${EYRIE_BEFORE:+$(rss "$EYRIE_BEFORE" render "$demo" -o "$out/b.$ext" --dpi 600)}
  echo "peak RSS $ext: eyrie ${e} kB, matplotlib ${m} kB${b:+, eyrie before ${b} kB}"
done
echo
"$stages" "$demo" 600 200
