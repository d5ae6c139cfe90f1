#!/usr/bin/env bash
# Screenshots of a report.html as a person sees it, at a desktop width (1400 px) and a narrow
# window (500 px), with headless Chromium; prints the length of the page at each width.
#
#   scripts/report-screenshots.sh [REPORT_HTML] [OUT_DIR]
#
# Defaults: analyses the bundled demo study into a temporary folder and writes the pictures to
# target/screenshots/. Writes OUT_DIR/report-1400.png and report-500.png (the whole page, cropped
# to its length) and OUT_DIR/report-1400-first-screen.png (the first 900 px: what shows without
# scrolling).
#
# Needs Debian's `chromium` and `python3-pil` (apt-get install chromium python3-pil); the Java
# test suite does not. The report has no script and no remote resource, so nothing is fetched.
# The length is measured as the last row of the screenshot that differs from the page's
# background colour, so it does not depend on the window height asked for.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
report="${1:-}"
out="${2:-$here/target/screenshots}"
mkdir -p "$out"
if [ -z "$report" ]; then
  tmp="$(mktemp -d)"
  trap 'rm -rf "$tmp"' EXIT
  "$here/accordia" analyze "$here/demo-masks" --out "$tmp/report" --quiet >/dev/null
  report="$tmp/report/report.html"
fi
[ -f "$report" ] || { echo "report-screenshots: no such file: $report" >&2; exit 2; }
url="file://$(cd "$(dirname "$report")" && pwd)/$(basename "$report")"
profile="$(mktemp -d)"
for width in 1400 500; do
  # tall enough for the longest report we expect; the picture is cropped to the page below
  chromium --headless --no-sandbox --disable-gpu --hide-scrollbars --user-data-dir="$profile" \
    --window-size="$width,30000" --screenshot="$out/report-$width.png" "$url" >/dev/null 2>&1
done
rm -rf "$profile"
/usr/bin/python3 - "$out" <<'EOF'
import sys
from PIL import Image
out = sys.argv[1]
for width in (1400, 500):
    path = f"{out}/report-{width}.png"
    img = Image.open(path).convert("RGB")
    w, h = img.size
    background = img.getpixel((w - 1, h - 1))
    px = img.load()
    last = 0
    for y in range(h - 1, -1, -1):
        if any(px[x, y] != background for x in range(0, w, 2)):
            last = y + 1
            break
    page = min(h, last + 24)
    img.crop((0, 0, w, page)).save(path)
    if width == 1400:
        img.crop((0, 0, w, min(page, 900))).save(f"{out}/report-1400-first-screen.png")
    print(f"report at {width} px wide: {page} px long ({path})")
EOF
