#!/usr/bin/env python3
"""Checks `planewise cycles` (our ASTM E1049-85 rainflow count) against the `rainflow` package
from PyPI (an independent implementation of the same standard) on random histories: the same
cycles — range, mean, count and the two reversals' times — in the same order. The histories
are random numbers, nothing else (seeded, so a failure repeats).

Two conventions differ and are not compared: on a plateau (equal neighbours) we report the
first point of the plateau as the reversal and the package the last (the ranges, means and
counts agree; only the times differ), and a history of two points is one half cycle for us and
none for the package (ASTM E1049-85 counts the residue as half cycles).

Run: python3 scripts/rainflow-check.py [path/to/planewise]   (installs rainflow with pip when
missing; builds planewise with cargo when no path is given)
"""
import json
import random
import subprocess
import sys
import tempfile
from pathlib import Path

try:
    import rainflow
except ImportError:
    pip = [sys.executable, "-m", "pip", "install", "--quiet", "rainflow"]
    # Debian's Python refuses system-wide installs unless told (CI runs as root on Debian).
    if subprocess.run(pip).returncode != 0:
        subprocess.run(pip + ["--break-system-packages"], check=True)
    import rainflow

ROOT = Path(__file__).resolve().parent.parent


def main():
    if len(sys.argv) > 1:
        exe = sys.argv[1]
    else:
        subprocess.run(["cargo", "build", "--quiet"], cwd=ROOT, check=True)
        exe = str(ROOT / "target" / "debug" / "planewise")
    rng = random.Random(20261205)
    checked = 0
    with tempfile.TemporaryDirectory() as tmp:
        for trial in range(200):
            n = rng.choice([3, 5, 10, 50, 400])
            plateaus = trial % 4 == 3
            # Mostly continuous values; some trials on a coarse grid so that equal neighbours
            # (plateaus) occur.
            if plateaus:
                values = [float(rng.randint(-5, 5)) for _ in range(n)]
            else:
                values = [round(rng.uniform(-100.0, 100.0), 6) for _ in range(n)]
            path = Path(tmp) / f"h{trial}.csv"
            path.write_text("step,v\n" + "".join(f"{i},{v!r}\n" for i, v in enumerate(values)))
            out = subprocess.run(
                [exe, "cycles", str(path), "--column", "v", "--json"],
                capture_output=True, text=True, check=True,
            )
            ours = [
                (c["range"], c["mean"], c["count"], c["from_time"], c["to_time"])
                for c in json.loads(out.stdout)["cycles"]
            ]
            theirs = [
                (r, m, c, float(i), float(j))
                for r, m, c, i, j in rainflow.extract_cycles(values)
                if r > 0
            ]
            compared = 3 if plateaus else 5
            if len(ours) != len(theirs) or any(
                abs(a[0] - b[0]) > 1e-9 or abs(a[1] - b[1]) > 1e-9 or a[2:compared] != b[2:compared]
                for a, b in zip(ours, theirs)
            ):
                print(f"trial {trial}: values {values}\n ours   {ours}\n theirs {theirs}")
                sys.exit(1)
            checked += len(ours)
    print(f"rainflow-check: 200 random histories, {checked} cycles, the same as rainflow {rainflow.__version__}")


if __name__ == "__main__":
    main()
