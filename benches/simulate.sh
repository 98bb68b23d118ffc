#!/usr/bin/env bash
# eyrie simulate against scipy's solve_ivp (LSODA, BDF, Radau) on the same
# networks at the same tolerances (benches/simulate_scipy.py builds the ODE
# from `eyrie analyze --json` rate constants). Reports:
#   (a) whole process, `eyrie simulate profiles/demo.toml` against the fastest
#       scipy method's whole process (python start, imports, integration),
#       with hyperfine and a baseline (`cat` of the profile) in the same run;
#       target: scipy/eyrie >= 50;
#   (b) integration alone on generated networks of 10, 100 and 1000 states
#       (eyrie: examples/simulate_timing; scipy: time.perf_counter around
#       solve_ivp), both from the reference state over the time eyrie's default
#       run reaches; target: fastest scipy/eyrie >= 10 at each size, and the
#       exponent of a log-log fit of eyrie's time against the size (near 1);
#   peak memory (/usr/bin/time -v) of each whole process.
# Needs hyperfine (Debian package), /usr/bin/time, and a python with scipy:
#
#   python3 -m venv /tmp/venv && /tmp/venv/bin/pip install scipy
#   PYTHON=/tmp/venv/bin/python benches/simulate.sh
set -euo pipefail
cd "$(dirname "$0")/.."
python=${PYTHON:-python3}
if ! "$python" -c "import scipy" 2>/dev/null; then
  echo "benches/simulate.sh needs scipy: set PYTHON to a python that has it (see the header)" >&2
  exit 2
fi
target=${CARGO_TARGET_DIR:-target}
cargo build --release --quiet --bin eyrie --example simulate_timing --example gen_network
bin=$target/release/eyrie
timing=$target/release/examples/simulate_timing
scipy_script=benches/simulate_scipy.py
demo=profiles/demo.toml
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT

# The end time of eyrie's default run (99 % conversion or equilibrium).
end_time() { python3 -c "import json, sys; print(json.load(open(sys.argv[1]))['time_s'])" "$1"; }

prepare() { # profile name
  "$bin" analyze "$1" --json > "$out/$2.analyze.json"
  "$bin" simulate "$1" --json > "$out/$2.simulate.json" 2>/dev/null
}

echo "== scipy and numpy =="
"$python" -c "import scipy, numpy; print('scipy', scipy.__version__, '/ numpy', numpy.__version__)"

echo
echo "== (b) integration alone =="
for n in 10 100 1000; do
  "$target/release/examples/gen_network" "$n" > "$out/net-$n.toml"
  prepare "$out/net-$n.toml" "net-$n"
  t_end=$(end_time "$out/net-$n.simulate.json")
  repeats=$([ "$n" -ge 1000 ] && echo 10 || echo 30)
  "$timing" "$out/net-$n.toml" "$repeats" | sed 's/^/eyrie /' | tee -a "$out/integration.txt"
  # LSODA's dense Jacobian takes tens of seconds at 1000 states: one run;
  # the sparse methods are repeated so that their best run is not a disturbed one.
  for method in LSODA BDF Radau; do
    scipy_repeats=$([ "$n" -ge 1000 ] && [ "$method" = LSODA ] && echo 1 || echo 5)
    "$python" "$scipy_script" "$out/net-$n.analyze.json" --t-end "$t_end" --method "$method" --timing \
      --repeat "$scipy_repeats" --compare "$out/net-$n.simulate.json" \
      | sed 's/^/scipy /' | tee -a "$out/integration.txt"
  done
done
python3 - "$out/integration.txt" <<'EOF'
import json, math, sys
eyrie, scipy = {}, {}
for line in open(sys.argv[1]):
    side, data = line.split(" ", 1)
    d = json.loads(data)
    if side == "eyrie":
        eyrie[d["states"]] = d
    else:
        scipy.setdefault(d["states"], []).append(d)
print()
print("Ratios of the fastest runs (best of N: least disturbed by other work on the")
print("machine) and of the medians, against the fastest scipy method at each size.")
print()
print("| states | eyrie best s | median s | steps | LU | fastest scipy | best s | median s | steps | LU | scipy/eyrie best | median |")
print("|---|---|---|---|---|---|---|---|---|---|---|---|")
for n in sorted(eyrie):
    e = eyrie[n]
    best = min(scipy[n], key=lambda d: d["best_seconds"])
    print(f"| {n} | {e['best_seconds']:.3g} | {e['seconds']:.3g} | {e['steps']} | {e['nlu']} | {best['method']} "
          f"| {best['best_seconds']:.3g} | {best['seconds']:.3g} | {best['steps']} | {best['nlu']} "
          f"| {best['best_seconds'] / e['best_seconds']:.1f} | {best['seconds'] / e['seconds']:.1f} |")
xs = [math.log(n) for n in sorted(eyrie)]
for label, ys in [("time", [math.log(eyrie[n]["best_seconds"]) for n in sorted(eyrie)]),
                  ("time per step", [math.log(eyrie[n]["best_seconds"] / eyrie[n]["steps"]) for n in sorted(eyrie)])]:
    mx, my = sum(xs) / len(xs), sum(ys) / len(ys)
    slope = sum((x - mx) * (y - my) for x, y in zip(xs, ys)) / sum((x - mx) ** 2 for x in xs)
    print(f"eyrie {label} grows as N^{slope:.2f} (log-log least squares over {sorted(eyrie)}, best runs)")
EOF

echo
echo "== (a) whole process on $demo =="
prepare "$demo" demo
t_end=$(end_time "$out/demo.simulate.json")
fastest=$("$python" "$scipy_script" "$out/demo.analyze.json" --t-end "$t_end" --method all --timing --repeat 5 \
  | python3 -c "import json, sys; print(min((json.loads(l) for l in sys.stdin), key=lambda d: d['best_seconds'])['method'])")
echo "fastest scipy method on the demo: $fastest"
hyperfine --warmup 3 --min-runs 20 -N --export-json "$out/whole.json" --export-markdown "$out/whole.md" \
  -n baseline "cat $demo" \
  -n eyrie "$bin simulate $demo" \
  -n "scipy-$fastest" "$python $scipy_script $out/demo.analyze.json --t-end $t_end --method $fastest" \
  > /dev/null
cat "$out/whole.md"
python3 - "$out/whole.json" <<'EOF'
import json, sys
results = json.load(open(sys.argv[1]))["results"]
for stat in ("mean", "min"):
    r = {x["command"]: x[stat] for x in results}
    base, eyrie = r["baseline"], r["eyrie"]
    scipy = next(v for k, v in r.items() if k.startswith("scipy"))
    print(f"{stat}: eyrie = {eyrie / base:.1f} x baseline; scipy = {scipy / base:.1f} x baseline; "
          f"scipy/eyrie = {scipy / eyrie:.0f} (target >= 50)")
EOF

echo
echo "== peak memory (maximum resident set) =="
rss() { /usr/bin/time -v "$@" 2>&1 >/dev/null | awk -F: '/Maximum resident/ {gsub(/ /,"",$2); print $2}'; }
echo "eyrie simulate demo:        $(rss "$bin" simulate "$demo") kB"
echo "eyrie simulate 1000 states: $(rss "$bin" simulate "$out/net-1000.toml") kB"
echo "scipy $fastest demo:        $(rss "$python" "$scipy_script" "$out/demo.analyze.json" --t-end "$t_end" --method "$fastest") kB"
t1000=$(end_time "$out/net-1000.simulate.json")
for m in LSODA BDF; do
  echo "scipy $m 1000 states:   $(rss "$python" "$scipy_script" "$out/net-1000.analyze.json" --t-end "$t1000" --method "$m") kB"
done
