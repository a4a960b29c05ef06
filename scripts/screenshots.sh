#!/usr/bin/env bash
# Regenerates the README's images in screenshots/ with the program itself: the window under
# Xvfb (needs what scripts/gui-smoke.sh installs) and headless figures. Never edit them by hand.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p screenshots
scripts/gui-smoke.sh screenshots/window-demo.png
scripts/gui-smoke.sh screenshots/window-mohr.png mohr
scripts/gui-smoke.sh screenshots/window-envelope.png envelope
scripts/gui-smoke.sh screenshots/window-walkthrough.png walkthrough
# The Table tab on an invented table: a random stress field with a hot spot on an invented mesh.
mkdir -p target
python3 - target/screenshot-table.csv <<'PY'
import math, random, sys
random.seed(3)
with open(sys.argv[1], "w") as f:
    f.write("# Invented example: a random stress field on an invented mesh, not results of a real model\n")
    f.write("element,x_mm,y_mm,SXX,SYY,SZZ,SXY,SYZ,SZX\n")
    for i in range(50000):
        x, y = random.uniform(0, 120), random.uniform(0, 40)
        k = math.exp(-((x - 100) ** 2 + (y - 5) ** 2) / 300)
        v = [random.gauss(0, 30) + 180 * k, random.gauss(0, 20) - 40 * k, random.gauss(0, 10),
             random.gauss(0, 20) + 60 * k, random.gauss(0, 8), random.gauss(0, 10)]
        f.write(f"E{i + 1},{x:.2f},{y:.2f}," + ",".join(f"{a:.3f}" for a in v) + "\n")
PY
scripts/gui-smoke.sh screenshots/window-table.png table --table target/screenshot-table.csv --table-unit MPa
# Load cases as tables: the invented plate example, three tables joined on their ids under the
# example project's generated combinations.
cases=examples/load-cases
scripts/gui-smoke.sh screenshots/window-load-cases.png table --project "$cases/plate.json" \
    --table "$cases/dead.csv" --table-unit MPa --table-ids element,ip,section --table-as dead \
    --table-case "live=$cases/live.csv" --table-case "wind=$cases/wind.csv"
# The built-in demo project (an invented scenario) and its first factored combination; the cut
# plane comes from the project.
demo=(--project assets/demo-bracket-project.json --case "ULS 1")
bin=target/release/planewise
$bin figure "${demo[@]}" --layers cube,plane,labels,legend,triad \
    --view three-quarter --size 1100x750 --out screenshots/cut-plane-traction.png
$bin figure "${demo[@]}" --layers ellipsoid,axes,labels,legend,triad \
    --view three-quarter --perspective --size 1100x750 --out screenshots/ellipsoid-principal-axes.png
$bin map "${demo[@]}" --measure shear --size 1100x750 \
    --out screenshots/orientation-map-shear.png
# The annotated figure: the project's caption and pinned note on ULS 1, and the title block.
$bin mohr "${demo[@]}" --measure mohr-coulomb --cohesion 10 \
    --friction-angle 30 --size 1100x750 --title-block --title "Example bracket check" \
    --out screenshots/mohr-circles.png
$bin figure "${demo[@]}" --measure shear \
    --layers cube,plane,axes,labels,legend,triad --view three-quarter --size 1100x750 \
    --out screenshots/worst-planes-3d.png
# The stress element (iso and looking down z: the plane element and its turned copy), and the
# traction over all directions with the lit ellipsoid.
$bin figure "${demo[@]}" --layers cube,element,labels,legend,triad \
    --view three-quarter --size 1100x750 --out screenshots/stress-element.png
$bin figure "${demo[@]}" --layers cube,element,labels,legend,triad \
    --view z --size 1100x750 --out screenshots/plane-element.png
$bin figure "${demo[@]}" --layers cube,field,ellipsoid,axes,legend,triad \
    --view three-quarter --size 1100x750 --out screenshots/traction-field.png
# The Fatigue tab on the invented shaft, judged with finite life.
scripts/gui-smoke.sh screenshots/window-fatigue.png fatigue \
    --fatigue-history examples/fatigue-shaft/history.csv --fatigue-unit MPa \
    --fatigue-limits 320,200 --fatigue-sn 550,-0.08
# Fatigue: the invented shaft in out-of-phase bending and torsion; the critical plane's shear
# path with the governing cycle shaded, and the Findley utilization over every plane.
shaft=examples/fatigue-shaft
$bin fatigue --history $shaft/history.csv --bending-limit 320 --torsion-limit 200 \
    --sn 550,-0.08 --path-figure screenshots/fatigue-path.png > /dev/null
$bin fatigue --history $shaft/history.csv --bending-limit 320 --torsion-limit 200 \
    --map screenshots/fatigue-map.png > /dev/null
# A page of the calculation report as a real browser prints it.
scripts/report-browser.sh target/report-browser
pdftoppm -png -r 80 -f 3 -l 3 -singlefile target/report-browser/report.pdf screenshots/report-page
ls -l screenshots
