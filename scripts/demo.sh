#!/usr/bin/env bash
# Quick start, part one: install what is missing, build sortie, fly the bundled demo mission.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/install-deps.sh
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release -DSORTIE_BUILD_TESTS=OFF >/dev/null
cmake --build build -j"$(nproc)" --target sortie
./build/sortie fly profiles/demo-quad-water-tank.json
