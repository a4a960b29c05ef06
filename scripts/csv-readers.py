#!/usr/bin/env python3
"""Checks that `planewise batch --out` writes a CSV that other programs read as they are: pandas'
`read_csv` with no options and Python's `csv` module take the first line as the header, find
units in the column names and read every row, with the numbers planewise printed. The table is
an invented one (four states, MPa).

Run: python3 scripts/csv-readers.py [path/to/planewise]   (installs pandas with pip when missing;
builds planewise with cargo when no path is given)
"""
import csv
import subprocess
import sys
import tempfile
from pathlib import Path

try:
    import pandas as pd
except ImportError:
    pip = [sys.executable, "-m", "pip", "install", "--quiet", "pandas"]
    # Debian's Python refuses system-wide installs unless told (CI runs as root on Debian).
    if subprocess.run(pip).returncode != 0:
        subprocess.run(pip + ["--break-system-packages"], check=True)
    import pandas as pd

ROOT = Path(__file__).resolve().parent.parent
TABLE = "id,xx,yy,zz,xy,yz,zx\nA,-10,-20,-30,0,0,0\nB,5,-20,-30,0,0,0\nC,-10,-11,-60,0,0,0\nD,-50,-50,-50,0,0,0\n"


def main():
    if len(sys.argv) > 1:
        exe = sys.argv[1]
    else:
        subprocess.run(["cargo", "build", "--quiet"], cwd=ROOT, check=True)
        exe = str(ROOT / "target" / "debug" / "planewise")
    failures = 0
    passes = 0
    with tempfile.TemporaryDirectory() as tmp:
        table = Path(tmp) / "invented.csv"
        table.write_text(TABLE)
        for rank in ["von-mises", "sigma1", "slip-tendency", "utilization-mohr-coulomb"]:
            out = Path(tmp) / f"ranked-{rank}.csv"
            extra = ["--cohesion", "0", "--friction-angle", "30"] if "mohr" in rank else []
            subprocess.run(
                [exe, "batch", str(table), "--unit", "MPa", "--rank", rank, "--quiet", "--out", str(out)] + extra,
                check=True,
                capture_output=True,
            )
            frame = pd.read_csv(out)
            with out.open(newline="") as f:
                rows = list(csv.reader(f))
            checks = [
                ("pandas reads 4 rows", len(frame) == 4),
                ("pandas header starts with line", list(frame.columns)[0] == "line"),
                ("units in the column names", "xx_MPa" in frame.columns and "sigma1_MPa" in frame.columns),
                ("no column twice", len(set(frame.columns)) == len(frame.columns)),
                ("csv module: header first", rows[0][0] == "line" and len(rows) == 5),
                ("ids carried", sorted(frame["id"]) == ["A", "B", "C", "D"]),
                ("a condition for each row", frame["condition"].notna().all()),
            ]
            for what, ok in checks:
                print(f"{'ok  ' if ok else 'FAIL'} {rank}: {what}")
                passes += ok
                failures += not ok
    print(f"csv readers: {passes} checks hold, {failures} do not")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
