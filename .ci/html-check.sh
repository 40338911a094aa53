#!/usr/bin/env bash
# Renders the HTML report of the demo corpus in headless Chromium (Debian's
# package chromium) and checks that the page loads without console errors
# and that its screenshot is not blank. .ci/run calls it.
#
#   .ci/html-check.sh [OUTDIR]     (OUTDIR keeps report.html and shot.png)
set -euo pipefail
cd "$(dirname "$0")/.."
out=${1:-$(mktemp -d)}
mkdir -p "$out"
browser=$(command -v chromium || command -v chromium-browser || true)
if [ -z "$browser" ]; then
  echo "html-check: chromium is not installed (apt-get install chromium)" >&2
  exit 1
fi
go run ./cmd/assay demo --format html --out "$out/report.html"
profile=$(mktemp -d)
"$browser" --headless --no-sandbox --disable-gpu --disable-background-networking \
  --disable-component-update --disable-sync --no-first-run --user-data-dir="$profile" \
  --window-size=1280,2400 --enable-logging=stderr --v=0 \
  --screenshot="$out/shot.png" "file://$out/report.html" 2>"$out/chromium.log" || {
  cat "$out/chromium.log" >&2; exit 1; }
rm -rf "$profile"
# Console messages of the page are logged as CONSOLE(line) "message".
if grep -E 'CONSOLE|Uncaught' "$out/chromium.log" >&2; then
  echo "html-check: the page wrote to the console" >&2
  exit 1
fi
go run .ci/pngcheck.go "$out/shot.png"
echo "html-check: report rendered without console messages; screenshot $out/shot.png"
