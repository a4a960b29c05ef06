#!/usr/bin/env python3
"""Checks that the figure colours that carry meaning stay apart for the common colour-vision
deficiencies: each pair that must be told apart is simulated (colorspacious, after Machado,
Oliveira & Fernandes 2009, severity 100) for protanomaly, deuteranomaly and tritanomaly and
its distance measured in CAM02-UCS (ΔE'). Colours are read from the sources, so the check
follows the palette. Prints a table; exits 1 when a pair falls below the threshold.

Run: python3 scripts/palette-cvd.py   (installs colorspacious with pip when missing)
"""
import itertools
import re
import subprocess
import sys
from pathlib import Path

try:
    import colorspacious as cs
except ImportError:
    pip = [sys.executable, "-m", "pip", "install", "--quiet", "colorspacious"]
    # Debian's Python refuses system-wide installs unless told (CI runs as root on Debian).
    if subprocess.run(pip).returncode != 0:
        subprocess.run(pip + ["--break-system-packages"], check=True)
    import colorspacious as cs

ROOT = Path(__file__).resolve().parent.parent
PATTERN = re.compile(r"pub const (\w+): Rgba = Rgba::rgb\((\d+), (\d+), (\d+)\)")


def palette(path):
    return {m[1]: tuple(int(v) for v in m.groups()[1:]) for m in PATTERN.finditer(path.read_text())}


scene = palette(ROOT / "src/picture/scene/style.rs")
# Pairs a reader must tell apart in one picture (3D view; 2D figures).
PAIRS = [
    (scene, "TENSION", "COMPRESSION"),
    (scene, "NORMAL_PART", "SHEAR_PART"),
    (scene, "TRACTION", "NORMAL_PART"),
    (scene, "TRACTION", "SHEAR_PART"),
    (scene, "TENSION", "SHEAR_PART"),
    (scene, "COMPRESSION", "NORMAL_PART"),
    (scene, "PLANE_NORMAL", "TENSION"),
    (scene, "PLANE_NORMAL", "NORMAL_PART"),
    (scene, "WORST_PLANE", "TENSION"),
    (scene, "WORST_PLANE", "COMPRESSION"),
    (scene, "PLANE_NORMAL", "WORST_PLANE"),
]
# Below these ΔE' two line colours are hard to tell apart at a glance (our thresholds). The
# red-green deficiencies are the common ones (several per cent of men) and get the strict one;
# tritanomaly is rare and every arrow also carries a label, so it gets a looser one.
THRESHOLD = {None: 12.0, "protanomaly": 12.0, "deuteranomaly": 12.0, "tritanomaly": 9.0}
KINDS = [None, "protanomaly", "deuteranomaly", "tritanomaly"]


def seen(rgb, kind):
    srgb = [c / 255 for c in rgb]
    if kind is None:
        return srgb
    space = {"name": "sRGB1+CVD", "cvd_type": kind, "severity": 100}
    return [min(max(c, 0.0), 1.0) for c in cs.cspace_convert(srgb, space, "sRGB1")]


def main():
    worst = {}
    print(f"{'pair':34}" + "".join(f"{k or 'normal':>15}" for k in KINDS))
    failed = False
    for table, a, b in PAIRS:
        row = []
        for kind in KINDS:
            d = cs.deltaE(seen(table[a], kind), seen(table[b], kind), input_space="sRGB1", uniform_space="CAM02-UCS")
            row.append(d)
            worst[kind] = min(worst.get(kind, 1e9), d)
            failed |= d < THRESHOLD[kind]
        print(f"{a + ' / ' + b:34}" + "".join(f"{d:15.1f}" for d in row))
    print("smallest: " + ", ".join(f"{k or 'normal'} {worst[k]:.1f}" for k in KINDS))
    limits = ", ".join(f"{k or 'normal'} {v}" for k, v in THRESHOLD.items())
    print("FAIL" if failed else f"ok: every pair at least as far apart as {limits}")
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
