#!/usr/bin/env bash
# Times `planewise batch` against the obvious alternative on the same generated table: pandas'
# C parser plus numpy's batched eigvalsh (principal values) and von Mises, top 100. Both read
# the same 1,000,000-row CSV (id + six components, an invented random field, generated here and
# never committed). Prints each time (best of 3), the ratio, and the peak memory of a top-100
# and of a full ranking. Needs python3 with pip (installs
# pandas and numpy when missing).
#   scripts/bench-batch.sh [ROWS]
set -euo pipefail
cd "$(dirname "$0")/.."
rows=${1:-1000000}
dir=target/bench-batch
mkdir -p "$dir"
table="$dir/table-$rows.csv"
python3 -c "import pandas, numpy" 2>/dev/null || python3 -m pip install --quiet pandas numpy \
    || python3 -m pip install --quiet --break-system-packages pandas numpy
if [ ! -f "$table" ]; then
    python3 - "$rows" "$table" <<'PY'
import sys, numpy as np
n, path = int(sys.argv[1]), sys.argv[2]
rng = np.random.default_rng(7)
v = rng.uniform(-200, 200, size=(n, 6))
ids = np.arange(1, n + 1)
with open(path, "w") as f:
    f.write("id,xx,yy,zz,xy,yz,zx\n")
    np.savetxt(f, np.column_stack([ids, v]), fmt=["%d"] + ["%.6g"] * 6, delimiter=",")
PY
fi
ls -l "$table"
[ -x target/release/planewise ] || cargo build --release --quiet
best() { # best of three wall times of a command, seconds
    local b=999
    for _ in 1 2 3; do
        local s e
        s=$(date +%s.%N); "$@" >/dev/null; e=$(date +%s.%N)
        b=$(python3 -c "print(min($b, $e - $s))")
    done
    echo "$b"
}
ours=$(best target/release/planewise batch "$table" --unit MPa --rank von-mises --top 100 --quiet)
cat > "$dir/alternative.py" <<'PY'
import sys, numpy as np, pandas as pd
d = pd.read_csv(sys.argv[1], engine="c")
c = d[["xx", "yy", "zz", "xy", "yz", "zx"]].to_numpy()
m = np.empty((len(c), 3, 3))
m[:, 0, 0], m[:, 1, 1], m[:, 2, 2] = c[:, 0], c[:, 1], c[:, 2]
m[:, 0, 1] = m[:, 1, 0] = c[:, 3]
m[:, 1, 2] = m[:, 2, 1] = c[:, 4]
m[:, 2, 0] = m[:, 0, 2] = c[:, 5]
p = np.linalg.eigvalsh(m)
vm = np.sqrt(0.5 * ((p[:, 0] - p[:, 1]) ** 2 + (p[:, 1] - p[:, 2]) ** 2 + (p[:, 2] - p[:, 0]) ** 2))
top = np.argpartition(-vm, 100)[:100]
top = top[np.argsort(-vm[top])]
print(d["id"].to_numpy()[top][:3])
PY
theirs=$(best python3 "$dir/alternative.py" "$table")
echo "planewise batch (top 100 by von Mises): ${ours} s"
echo "pandas C parser + numpy eigvalsh:        ${theirs} s"
python3 -c "print(f'ratio: {$theirs / $ours:.1f}x')"
# Peak memory (resident set, from GNU time) of the top-100 run and of a full ranking written to a
# file: the full ranking holds 40 bytes a row, the top-N run a fixed amount.
if [ -x /usr/bin/time ]; then
    for run in "--top 100" ""; do
        # shellcheck disable=SC2086
        /usr/bin/time -f "planewise batch ${run:-(every row)}: %M KB peak, %e s" \
            target/release/planewise batch "$table" --unit MPa --rank von-mises $run --quiet \
            --out "$dir/ranked.csv" >/dev/null
    done
else
    echo "peak memory: needs GNU time (/usr/bin/time; Debian package 'time')"
fi
