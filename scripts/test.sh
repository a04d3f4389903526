#!/usr/bin/env bash
# Quick start, part two: install what is missing, build everything, run the whole test suite.
# SORTIE_WERROR=ON (CI sets it) turns compiler warnings into errors; ccache is used when present.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/install-deps.sh --test
flags=(-DCMAKE_BUILD_TYPE=Release -DSORTIE_BUILD_TESTS=ON "-DSORTIE_WERROR=${SORTIE_WERROR:-OFF}")
if command -v ccache >/dev/null; then flags+=(-DCMAKE_CXX_COMPILER_LAUNCHER=ccache); fi
cmake -S . -B build "${flags[@]}" >/dev/null
cmake --build build -j"$(nproc)"
ctest --test-dir build --output-on-failure -j"$(nproc)"
