#!/usr/bin/env bash
# Render the demo mission's HTML report in headless Chromium and check the screenshot is a
# page, not a blank: tests/browser/render_fly.sh SORTIE PNG_CHECK SOURCE_DIR ARTIFACT_DIR
# The page and its screenshot stay in ARTIFACT_DIR for a person to look at. Exit 77 (ctest:
# skipped) when Chromium is not installed (scripts/install-deps.sh --test installs it).
set -euo pipefail
sortie=$1 png_check=$2 src=$3 out=$4
browser=$(command -v chromium || true)
if [[ -z "$browser" ]]; then
  echo "render_fly: chromium is not installed (bash scripts/install-deps.sh --test): skipped"
  exit 77
fi
mkdir -p "$out"
html="$out/fly-demo-quad-water-tank.html" png="$out/fly-demo-quad-water-tank.png"
rm -f "$html" "$png"
"$sortie" fly "$src/profiles/demo-quad-water-tank.json" --html "$html" --quiet
profile=$(mktemp -d)
trap 'rm -rf "$profile"' EXIT
# No network, no first-run work, a profile of its own; the page itself names nothing outside.
timeout 120 "$browser" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
  --disable-background-networking --disable-component-update --disable-sync \
  --user-data-dir="$profile" --window-size=1280,2400 --screenshot="$png" "file://$html" \
  >"$out/chromium.log" 2>&1 || { echo "render_fly: chromium failed:"; tail -20 "$out/chromium.log"; exit 1; }
[[ -s "$png" ]] || { echo "render_fly: no screenshot written"; tail -20 "$out/chromium.log"; exit 1; }
"$png_check" "$png" --width 1280 --height 2400 --min-colours 200 --min-ink 0.05
echo "render_fly: screenshot kept at $png"
