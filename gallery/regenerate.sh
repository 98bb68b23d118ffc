#!/usr/bin/env bash
# Renders every profile in profiles/ to gallery/<name>.svg, plus a PNG preview
# when rsvg-convert (Debian package librsvg2-bin) is installed.
#
#   gallery/regenerate.sh
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
for profile in profiles/*.toml; do
  name=$(basename "$profile" .toml)
  extra=()
  # Absolute hartree energies read best in kcal/mol.
  [ "$name" = hartree-absolute ] && extra=(--unit kcal/mol)
  target/release/eyrie render "$profile" -o "gallery/$name.svg" "${extra[@]}"
  if command -v rsvg-convert >/dev/null; then
    rsvg-convert --dpi-x 300 --dpi-y 300 "gallery/$name.svg" -o "gallery/$name.png"
  fi
done
