#!/usr/bin/env bash
# The invented pack-ageing series: six synthetic flight logs of one demo pack whose capacity
# factor falls 1.00 -> 0.80 and R0 factor rises 1.0 -> 1.4, made by sortie's own simulator
# (tests/estimate/pack_ageing_example_test.cpp writes them to examples/pack-ageing/), then the
# logbook walk-through of the README: the pack added, each flight added with its date, the trend.
# Usage: scripts/make-demo-pack-ageing.sh [BUILD_DIR]   (a build with -DSORTIE_BUILD_TESTS=ON)
#        SORTIE_AGEING_LOGS_ONLY=1 scripts/make-demo-pack-ageing.sh   (the logs, no walk-through)
set -euo pipefail
cd "$(dirname "$0")/.."
build=${1:-build}
cmake --build "$build" --target sortie sortie_tests -j2 >/dev/null
SORTIE_WRITE_PACK_AGEING=1 "$build/tests/sortie_tests" -tc='pack ageing example*' >/dev/null
[ "${SORTIE_AGEING_LOGS_ONLY:-0}" = 1 ] && exit 0

work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
db="$work/ageing.sqlite"
run() {
  # Show the command as a reader would type it (sortie on the PATH, the logbook by its name).
  local shown
  shown=$(printf ' %q' "$@")
  echo "\$ sortie${shown//$work\//}"
  "$build/sortie" "$@" | sed "s|$work/||g"
}
run logbook "$db" add-pack models/packs/demo-6s1p-lipo-5000.json --name "ageing demo pack" --serial A1 --first-use 2026-01-02
for log in examples/pack-ageing/flight-*.csv; do
  date=$(sed -n 's/^# .*Flown \([0-9-]*\) .*/\1/p' "$log")  # the date each invented log says it was flown
  run logbook "$db" add-flight "$log" --pack 1 --profile profiles/demo-quad-water-tank.json --date "$date" -q
done
run logbook "$db" trend --pack 1
