#!/bin/sh
# Rebuild the invented demo flight log models/logs/demo-flight-quad-synthetic.csv from the
# bundled quad profile with sortie's own simulator (see tests/sim/demo_flight_log_test.cpp).
# Usage: scripts/make-demo-flight-log.sh [BUILD_DIR]   (a build with -DSORTIE_BUILD_TESTS=ON)
set -eu
build=${1:-build}
cmake --build "$build" --target sortie_tests -j2
SORTIE_WRITE_DEMO_LOG=1 "$build/tests/sortie_tests" -tc='demo flight log*'
