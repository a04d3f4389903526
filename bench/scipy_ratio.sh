#!/bin/sh
# Runs the 4S2P 300 W discharge cases of the bench program and the SciPy reference
# (bench/scipy_reference.py, Debian python3-scipy) and prints the ratio of their medians.
# Usage: bench/scipy_ratio.sh [BUILD_DIR]   (default: build)
set -eu
here=$(dirname "$0")
build=${1:-build}
py=/usr/bin/python3
if ! "$py" -c 'import scipy' 2>/dev/null; then
  echo "scipy_ratio: $py has no scipy (apt-get install python3-scipy); no ratio" >&2
  exit 2
fi
ref=$("$py" "$here/scipy_reference.py" 5)
echo "$ref"
"$build/bench/sortie_bench" discharge_300W_4S2P_2RC | while read -r name us _rest; do
  echo "$name $us us"
  base=${name%_dopri5}
  line=$(echo "$ref" | grep "^$base " || true)
  [ -n "$line" ] || continue
  ref_us=$(echo "$line" | cut -d' ' -f2)
  awk -v n="$name" -v a="$us" -v b="$ref_us" 'BEGIN { printf "  %s: %.0fx faster than SciPy RK45 (%.1f us vs %.1f us)\n", n, b / a, a, b }'
done
