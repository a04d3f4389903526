#!/usr/bin/env bash
# Install the Debian packages sortie needs, only those missing. Works as root, or through sudo.
# Usage: scripts/install-deps.sh [--test]   (--test adds what the test suite needs: doctest, and
# Debian's chromium for the headless browser check of the HTML reports, ctest -L browser, and
# python3-geographiclib, the independent geodesic reference the route tests compare with);
# scripts/install-deps.sh --bench adds python3-scipy for bench/scipy_ratio.sh (not for the tests)
set -euo pipefail
pkgs=(g++ cmake make libboost-dev libeigen3-dev libcli11-dev nlohmann-json3-dev libgeographiclib-dev libsqlite3-dev)
if [[ "${1:-}" == "--test" ]]; then
  pkgs+=(doctest-dev chromium python3-geographiclib)
fi
if [[ "${1:-}" == "--bench" ]]; then
  pkgs+=(python3-scipy)
fi
missing=()
for p in "${pkgs[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if ((${#missing[@]} == 0)); then
  exit 0
fi
echo "sortie: installing ${missing[*]}" >&2
as_root=()
if [[ $(id -u) -ne 0 ]]; then
  as_root=(sudo)
fi
export DEBIAN_FRONTEND=noninteractive
"${as_root[@]}" apt-get update -qq
"${as_root[@]}" apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
