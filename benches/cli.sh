#!/usr/bin/env bash
# Whole-process timings of the main commands on the demo profile (and of
# analyze on a generated 1000-state network), as ratios
# against a baseline measured in the same run (`cat` of the same profile: the
# cost of starting a process and reading the file). Needs hyperfine (Debian
# package `hyperfine`) and /usr/bin/time for peak memory.
#
#   benches/cli.sh            # builds --release, prints the table and peak RSS
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
bin=target/release/eyrie
demo=profiles/demo.toml
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
cargo run --release --quiet --example gen_network -- 1000 > "$out/network-1000.toml"
hyperfine --warmup 5 --min-runs 50 -N \
  --export-markdown "$out/times.md" \
  -n baseline "cat $demo" \
  -n analyze "$bin analyze $demo" \
  -n analyze-json "$bin analyze $demo --json" \
  -n render "$bin render $demo -o $out/demo.svg" \
  -n analyze-1000-states "$bin analyze $out/network-1000.toml"
cat "$out/times.md"
echo
for cmd in "analyze $demo" "render $demo -o $out/demo.svg"; do
  rss=$(/usr/bin/time -v $bin $cmd 2>&1 >/dev/null | awk -F: '/Maximum resident/ {gsub(/ /,"",$2); print $2}')
  echo "peak RSS of 'eyrie $cmd': ${rss} kB"
done
