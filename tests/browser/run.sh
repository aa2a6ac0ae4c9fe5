#!/usr/bin/env bash
# The batch sheet in a real browser: saltwise-cli writes the sheet of a demo project, headless
# Chromium prints it to PDF and to a PNG, and check_sheet.py reads the PDF's text (pdftotext)
# against the numbers the command line itself gives for the same recipe (ph, dose, titrate
# --json), so this checks the rendering, not numbers written into the test.
#
# Usage: tests/browser/run.sh [--screenshot PATH]   (PATH: also keep the PNG there)
set -euo pipefail
cd "$(dirname "$0")/../.."
screenshot_copy=""
if [[ "${1:-}" == "--screenshot" ]]; then
    screenshot_copy="${2:?--screenshot needs a path}"
fi
chromium_bin="${CHROMIUM:-/usr/bin/chromium}"
if [[ ! -x "$chromium_bin" ]] || ! command -v pdftotext >/dev/null 2>&1; then
    echo "tests/browser: skipped (needs $chromium_bin and pdftotext; CI installs chromium and poppler-utils)" >&2
    exit 0
fi
target="${CARGO_TARGET_DIR:-target}"
cargo build --quiet -p saltwise-cli
cli="$target/debug/saltwise-cli"
out="$target/browser-test"
rm -rf "$out"
mkdir -p "$out"
out="$(cd "$out" && pwd)"
project=assets/demo/tidewater-degreaser.ron
batch=250kg

"$cli" report --project "$project" --batch "$batch" --date 2031-04-05 --out "$out/sheet.html" >/dev/null
"$cli" ph --project "$project" --json >"$out/ph.json"
"$cli" titrate --project "$project" --sample 10g --titrant hcl --normality 0.1 --json >"$out/titrate.json"
adjuster=$(sed -n 's/.*adjuster: "\([a-z0-9_]*\)".*/\1/p' "$project")
target_ph=$(sed -n 's/.*target_ph: Some(\([0-9.]*\)).*/\1/p' "$project")
"$cli" dose --project "$project" --adjuster "$adjuster" --target-ph "$target_ph" --json >"$out/dose.json"

profile=$(mktemp -d)
trap 'rm -rf "$profile"' EXIT
chrome() {
    timeout 180 "$chromium_bin" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
        --disable-background-networking --disable-component-update --disable-sync \
        --disable-dev-shm-usage --hide-scrollbars --user-data-dir="$profile" "$@" \
        "file://$out/sheet.html" >"$out/chromium.log" 2>&1
}
chrome --no-pdf-header-footer --print-to-pdf="$out/sheet.pdf"
chrome --window-size=1000,3600 --screenshot="$out/sheet.png"
pdftotext -layout "$out/sheet.pdf" "$out/sheet.txt"
python3 tests/browser/check_sheet.py "$out" "$batch"
if [[ -n "$screenshot_copy" ]]; then
    cp "$out/sheet.png" "$screenshot_copy"
fi
echo "tests/browser: the batch sheet renders its numbers (PDF and PNG in $out)"
