#!/usr/bin/env bash
# Runs the real window under Xvfb with Mesa's software GL and --screenshot, and fails if the
# program exits with an error or the image is blank. Installs what it needs (Debian, as root).
set -euo pipefail
cd "$(dirname "$0")/.."

need=(xvfb-run Xvfb)
missing=0
for tool in "${need[@]}"; do command -v "$tool" >/dev/null || missing=1; done
if [ "$missing" = 1 ] || ! ldconfig -p | grep -q libGL.so.1 || ! ldconfig -p | grep -q libxkbcommon-x11; then
    if [ "$(id -u)" != 0 ]; then
        echo "gui-smoke: missing Xvfb or Mesa libraries and not root; install: xvfb xauth libgl1 libglx-mesa0 libegl1 libegl-mesa0 libgl1-mesa-dri libx11-xcb1 libxcursor1 libxi6 libxrandr2 libxkbcommon-x11-0" >&2
        exit 1
    fi
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq xvfb xauth libgl1 libglx-mesa0 libegl1 libegl-mesa0 libgl1-mesa-dri \
        libx11-xcb1 libxcursor1 libxi6 libxrandr2 libxkbcommon-x11-0 >/dev/null
fi

cargo build --release --quiet
out="${1:-target/gui-smoke.png}"
rm -f "$out"
export WINIT_X11_SCALE_FACTOR=1 LIBGL_ALWAYS_SOFTWARE=1
# Keep the run's saved state out of the user's home.
export XDG_DATA_HOME="$(mktemp -d)"
# A second argument picks the tab the window opens on (3d, map, mohr, envelope, walkthrough,
# table, fatigue); any further arguments go to planewise (e.g. --table FILE).
tab=(); [ -n "${2:-}" ] && tab=(--tab "$2")
timeout 120 xvfb-run -a -s "-screen 0 1280x800x24" target/release/planewise --screenshot "$out" "${tab[@]}" "${@:3}"
[ -s "$out" ] || { echo "gui-smoke: no screenshot written" >&2; exit 1; }
# Blank check: the image must have many distinct colours (a blank window has one or two).
python3 - "$out" <<'PY'
import sys, zlib, struct
data = open(sys.argv[1], "rb").read()
assert data[:8] == b"\x89PNG\r\n\x1a\n", "not a PNG"
pos, idat, w, h = 8, b"", 0, 0
while pos < len(data):
    n, kind = struct.unpack(">I4s", data[pos:pos + 8])
    body = data[pos + 8:pos + 8 + n]
    if kind == b"IHDR":
        w, h, depth, ctype = struct.unpack(">IIBB", body[:10])
        assert depth == 8 and ctype == 6, f"unexpected PNG format {depth} {ctype}"
    elif kind == b"IDAT":
        idat += body
    pos += 12 + n
raw = zlib.decompress(idat)
stride = w * 4 + 1
# Sample every 7th row's raw bytes (filters make this approximate, but a blank image still
# compresses to a handful of distinct byte patterns).
colours = set()
for y in range(0, h, 7):
    row = raw[y * stride + 1:(y + 1) * stride]
    for x in range(0, w * 4, 28):
        colours.add(row[x:x + 4])
print(f"gui-smoke: {w}x{h}, {len(colours)} distinct sampled pixel values")
assert w >= 640 and h >= 400, "window too small"
assert len(colours) > 50, "the screenshot looks blank"
PY
echo "gui-smoke: ok ($out)"
