#!/usr/bin/env bash
# Quick start, part one: install what is missing, build sortie, run it on a bundled demo.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/install-deps.sh
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release -DSORTIE_BUILD_TESTS=OFF >/dev/null
cmake --build build -j"$(nproc)" --target sortie
./build/sortie discharge models/packs/demo-4s1p-lipo-5000.json --power 300
