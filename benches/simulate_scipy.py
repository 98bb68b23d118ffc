#!/usr/bin/env python3
"""The comparison side of benches/simulate.sh: the mass-action network of a
profile integrated with scipy's solve_ivp (LSODA, BDF, Radau).

The network is built independently of eyrie's integrator from the rate
constants `eyrie analyze --json` reports (steps[].k_forward, k_reverse, κ,
tunnelling and corrections already applied): both sides then integrate the
same ODE, so the timings compare integrators and not two implementations of
the Eyring equation and the profile's corrections. The right-hand side is the
net flux of each step (forward − reverse), as in eyrie, and the Jacobian is
analytic (the system is linear: a constant matrix, sparse from 40 states as in
eyrie; LSODA takes a dense one only).

Tolerances are eyrie's (src/simulate/integrate.rs `Tolerances`): rtol 1e-10,
atol 1e-14 × the total material. The initial state is eyrie's default: 1 mol/L
of the profile's `zero` state. Profiles with closed catalytic cycles or
co-reactants are out of scope (the benchmark networks have neither).

    python3 simulate_scipy.py ANALYZE.json --t-end T [--method M|all] [--repeat N]
        [--compare SIMULATE.json] [--timing]

Without --timing it integrates once and prints the final concentrations
(whole-process runs under hyperfine). With --timing it prints one JSON line
per method: seconds (median of --repeat runs of solve_ivp alone, timed with
time.perf_counter), best_seconds (the fastest run), solver counters, and the
scipy and numpy versions.
"""

import argparse
import json
import statistics
import sys
import time

import numpy as np
import scipy
import scipy.sparse
from scipy.integrate import solve_ivp

RTOL = 1e-10
ATOL_FRACTION = 1e-14
SPARSE_FROM = 40
METHODS = ("LSODA", "BDF", "Radau")


def network(report):
    """Species (minima, in point order), reaction index arrays and rate constants."""
    if report.get("cycles"):
        sys.exit("closed catalytic cycles are not supported by this benchmark script")
    if report.get("coreactants"):
        sys.exit("co-reactants are not supported by this benchmark script")
    ids = [p["id"] for p in report["points"] if p["kind"] == "minimum"]
    index = {i: n for n, i in enumerate(ids)}
    steps = report["steps"]
    fr = np.array([index[s["from"]] for s in steps], dtype=np.intp)
    to = np.array([index[s["to"]] for s in steps], dtype=np.intp)
    kf = np.array([s["k_forward"] for s in steps], dtype=float)
    kr = np.array([s["k_reverse"] for s in steps], dtype=float)
    return ids, fr, to, kf, kr


def system(n, fr, to, kf, kr, sparse):
    """Net-flux right-hand side and the (constant) analytic Jacobian."""

    def rhs(_t, y):
        net = kf * y[fr] - kr * y[to]
        return np.bincount(to, net, n) - np.bincount(fr, net, n)

    # d(net)/dy_from = kf, d(net)/dy_to = −kr; net leaves `from`, enters `to`.
    rows = np.concatenate([fr, fr, to, to])
    cols = np.concatenate([fr, to, fr, to])
    vals = np.concatenate([-kf, kr, kf, -kr])
    jac = scipy.sparse.csc_matrix((vals, (rows, cols)), shape=(n, n))
    if not sparse:
        dense = jac.toarray()
        # LSODA takes the Jacobian only as a callable.
        jac = lambda _t, _y: dense  # noqa: E731
    return rhs, jac


def solve(method, n, fr, to, kf, kr, y0, t_end):
    sparse = n >= SPARSE_FROM and method != "LSODA"
    rhs, jac = system(n, fr, to, kf, kr, sparse)
    atol = ATOL_FRACTION * np.abs(y0).sum()
    return solve_ivp(rhs, (0.0, t_end), y0, method=method, jac=jac, rtol=RTOL, atol=atol)


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("analyze_json")
    ap.add_argument("--t-end", type=float, required=True, help="end time, s")
    ap.add_argument("--method", default="LSODA", help="LSODA, BDF, Radau or all")
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--timing", action="store_true")
    ap.add_argument("--compare", help="eyrie simulate --json of the same run")
    args = ap.parse_args()

    with open(args.analyze_json) as f:
        report = json.load(f)
    ids, fr, to, kf, kr = network(report)
    n = len(ids)
    y0 = np.zeros(n)
    y0[ids.index(report["zero"])] = 1.0
    methods = METHODS if args.method == "all" else (args.method,)
    expected = None
    if args.compare:
        with open(args.compare) as f:
            expected = json.load(f)["final"]

    for method in methods:
        if not args.timing:
            sol = solve(method, n, fr, to, kf, kr, y0, args.t_end)
            if not sol.success:
                sys.exit(f"{method}: {sol.message}")
            print(json.dumps(dict(zip(ids, sol.y[:, -1].tolist()))))
            continue
        times = []
        for _ in range(max(args.repeat, 1)):
            start = time.perf_counter()
            sol = solve(method, n, fr, to, kf, kr, y0, args.t_end)
            times.append(time.perf_counter() - start)
        line = {
            "method": method,
            "states": n,
            "t_end_s": args.t_end,
            "seconds": statistics.median(times),
            "best_seconds": min(times),
            "success": bool(sol.success),
            "steps": int(sol.t.size - 1),
            "nfev": int(sol.nfev),
            "njev": int(sol.njev),
            "nlu": int(sol.nlu),
            "sparse_jacobian": n >= SPARSE_FROM and method != "LSODA",
            "scipy": scipy.__version__,
            "numpy": np.__version__,
        }
        if expected is not None:
            # Largest difference from eyrie's final state, relative to the
            # total material (1 mol/L).
            final = sol.y[:, -1]
            line["max_abs_diff_vs_eyrie"] = max(
                abs(final[i] - expected[name]) for i, name in enumerate(ids)
            )
        print(json.dumps(line), flush=True)


if __name__ == "__main__":
    main()
