#!/usr/bin/env bash
# Renders every profile in profiles/ with eyrie itself to gallery/<name>.svg
# and gallery/<name>.png (300 dpi, single column: 85 × 65 mm → 1004 × 768 px).
# Run it after any change to layout or rendering, look at the PNGs, commit.
#
#   gallery/regenerate.sh
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
eyrie="${CARGO_TARGET_DIR:-target}/release/eyrie"
for profile in profiles/*.toml; do
  name=$(basename "$profile" .toml)
  extra=()
  # Absolute hartree energies read best in kcal/mol.
  [ "$name" = hartree-absolute ] && extra=(--unit kcal/mol)
  "$eyrie" render "$profile" -o "gallery/$name.svg" "${extra[@]}"
  "$eyrie" render "$profile" -o "gallery/$name.png" --dpi 300 "${extra[@]}"
done
