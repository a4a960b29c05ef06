#!/usr/bin/env bash
# Times `planewise fatigue` over many points: two load-case tables (bending and torsion per unit
# factor; an invented random field generated here, never committed) of POINTS points each, a
# STEPS-step factor history with the torsion out of phase and a second harmonic, Findley with
# the circumscribed circle, ranked top 20. Prints the wall time, points per second and the
# peak memory. Run after `cargo build --release`.
#   scripts/bench-fatigue.sh [POINTS] [STEPS]
set -euo pipefail
cd "$(dirname "$0")/.."
points=${1:-10000}
steps=${2:-200}
dir=target/bench-fatigue
mkdir -p "$dir"
python3 - "$points" "$steps" "$dir" <<'PY'
import math, random, sys
n, steps, d = int(sys.argv[1]), int(sys.argv[2]), sys.argv[3]
rng = random.Random(24)
for case, scale in (("bending", (150, 40, 10, 30, 10, 10)), ("torsion", (10, 10, 5, 90, 20, 20))):
    with open(f"{d}/{case}-{n}.csv", "w") as f:
        f.write("node,xx,yy,zz,xy,yz,zx\n")
        for i in range(n):
            f.write(f"{i + 1}," + ",".join(f"{rng.uniform(-s, s):.5g}" for s in scale) + "\n")
with open(f"{d}/factors-{steps}.csv", "w") as f:
    f.write("step,bending,torsion\n")
    for i in range(steps):
        w = 2 * math.pi * i / steps
        f.write(f"{i},{math.sin(w) + 0.3 * math.sin(3 * w):.6g},{0.2 + math.sin(w - 1.1):.6g}\n")
PY
[ -x target/release/planewise ] || cargo build --release --quiet
cmd=(target/release/planewise fatigue --case-table "bending=$dir/bending-$points.csv"
    --case-table "torsion=$dir/torsion-$points.csv" --ids node --factors "$dir/factors-$steps.csv"
    --bending-limit 320 --torsion-limit 200 --top 20 --quiet)
/usr/bin/time -f "%e s wall, %M KB peak" "${cmd[@]}" > "$dir/out.txt" 2> "$dir/time.txt"
head -5 "$dir/out.txt"
wall=$(cut -d' ' -f1 "$dir/time.txt")
echo "planewise fatigue: $points points × $steps steps: $(cat "$dir/time.txt"); $(python3 -c "print(f'{$points / $wall:.0f} points/s on $(nproc) cores')")"
