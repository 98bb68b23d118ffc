#!/usr/bin/env bash
# Renders every profile in profiles/ with eyrie itself to gallery/<name>.svg
# and gallery/<name>.png (300 dpi), with every annotation, smooth connectors,
# the zero line and the axis break. Single column (85 × 65 mm) unless noted.
# Run it after any change to layout or rendering, look at the PNGs, commit.
#
#   gallery/regenerate.sh
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
eyrie="${CARGO_TARGET_DIR:-target}/release/eyrie"
for profile in profiles/*.toml; do
  name=$(basename "$profile" .toml)
  # Each example shows the annotation that tells its story; all of them at
  # once crowd a single-column figure.
  case "$name" in
    demo) extra=() ;;
    catalytic-cycle|hydrogenation-cycle) extra=(--annotate span --connectors smooth) ;;
    conformers|curtin-hammett|entropy-switch|three-branch) extra=(--annotate selectivity --connectors smooth) ;;
    # Absolute hartree energies read best in kcal/mol.
    hartree-absolute) extra=(--annotate barriers --unit kcal/mol) ;;
    # The isotopologue and the co-catalyst drawn over the profile.
    hydride-transfer) extra=(--variants all) ;;
    # More than about 16 states need the full page width, and 25 states with
    # their names clear of every line a little more than 90 mm of height.
    dense-network) extra=(--size double --height 120 --axis-break) ;;
    *) extra=(--annotate barriers --connectors smooth) ;;
  esac
  "$eyrie" render "$profile" -o "gallery/$name.svg" "${extra[@]}"
  "$eyrie" render "$profile" -o "gallery/$name.png" --dpi 300 "${extra[@]}"
done
# Charts (--plot): the product shares of the entropy-driven switch across
# temperature with its isoselective point, and the demo's concentrations in time.
charts() {
  "$eyrie" sweep profiles/entropy-switch.toml --from "-78 C" --to "100 C" --steps 41 "$@" >/dev/null
}
charts --plot gallery/entropy-switch-sweep.svg
charts --plot gallery/entropy-switch-sweep.png --dpi 300
"$eyrie" simulate profiles/demo.toml --plot gallery/demo-concentrations.svg >/dev/null
"$eyrie" simulate profiles/demo.toml --plot gallery/demo-concentrations.png --dpi 300 >/dev/null
