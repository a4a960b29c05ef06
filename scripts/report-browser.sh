#!/usr/bin/env bash
# Renders the demo project's calculation report in a real browser: Debian's chromium prints it
# to PDF and takes a PNG screenshot, headless. Fails if the PDF has no pages or the screenshot
# is blank. Installs chromium and poppler-utils when missing (Debian, as root).
#
#   scripts/report-browser.sh [OUT_DIR]     (default target/report-browser)
set -euo pipefail
cd "$(dirname "$0")/.."

if ! command -v chromium >/dev/null || ! command -v pdfinfo >/dev/null; then
    if [ "$(id -u)" != 0 ]; then
        echo "report-browser: chromium or pdfinfo missing and not root; install: chromium poppler-utils" >&2
        exit 1
    fi
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq chromium poppler-utils >/dev/null
fi

out="${1:-target/report-browser}"
mkdir -p "$out"
out="$(cd "$out" && pwd)"
cargo build --release --quiet
target/release/planewise report --project assets/demo-bracket-project.json \
    --out "$out/report.html" --figures 3d,map,mohr
rm -f "$out/report.pdf" "$out/report.png"
browser=(chromium --headless --no-sandbox --disable-gpu --user-data-dir="$(mktemp -d)")
timeout 180 "${browser[@]}" --no-pdf-header-footer --print-to-pdf="$out/report.pdf" \
    "file://$out/report.html" 2>/dev/null
timeout 180 "${browser[@]}" --window-size=1000,1400 --screenshot="$out/report.png" \
    "file://$out/report.html" 2>/dev/null
pages=$(pdfinfo "$out/report.pdf" | awk '/^Pages:/ {print $2}')
[ "${pages:-0}" -gt 0 ] || { echo "report-browser: the PDF has no pages" >&2; exit 1; }
[ -s "$out/report.png" ] || { echo "report-browser: no screenshot" >&2; exit 1; }
python3 - "$out/report.png" <<'PY'
import sys, zlib, struct
data = open(sys.argv[1], "rb").read()
assert data[:8] == b"\x89PNG\r\n\x1a\n", "not a PNG"
pos, idat, w, h, ctype = 8, b"", 0, 0, 6
while pos < len(data):
    n, kind = struct.unpack(">I4s", data[pos:pos + 8])
    body = data[pos + 8:pos + 8 + n]
    if kind == b"IHDR":
        w, h, depth, ctype = struct.unpack(">IIBB", body[:10])
    elif kind == b"IDAT":
        idat += body
    pos += 12 + n
raw = zlib.decompress(idat)
bpp = 4 if ctype == 6 else 3
stride = w * bpp + 1
values = set()
for y in range(0, h, 9):
    row = raw[y * stride + 1:(y + 1) * stride]
    for x in range(0, w * bpp, bpp * 11):
        values.add(row[x:x + bpp])
print(f"report-browser: screenshot {w}x{h}, {len(values)} distinct sampled pixel values")
assert len(values) > 20, "the screenshot looks blank"
PY
echo "report-browser: ok ($pages pages, $out/report.pdf)"
