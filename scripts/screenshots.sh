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
# The built-in demo project (an invented scenario) and its first factored combination; the cut
# plane comes from the project.
demo=(--project assets/demo-bracket-project.json --case "ULS 1")
bin=target/release/planewise
$bin figure "${demo[@]}" --layers cube,plane,labels,legend,triad \
    --view iso --size 1100x750 --out screenshots/cut-plane-traction.png
$bin figure "${demo[@]}" --layers ellipsoid,axes,labels,legend,triad \
    --view iso --perspective --size 1100x750 --out screenshots/ellipsoid-principal-axes.png
$bin map "${demo[@]}" --measure shear --size 1100x750 \
    --out screenshots/orientation-map-shear.png
# The annotated figure: the project's caption and pinned note on ULS 1, and the title block.
$bin mohr "${demo[@]}" --measure mohr-coulomb --cohesion 10 \
    --friction-angle 30 --size 1100x750 --title-block --title "Example bracket check" \
    --out screenshots/mohr-circles.png
$bin figure "${demo[@]}" --measure shear \
    --layers cube,plane,axes,labels,legend,triad --view iso --size 1100x750 \
    --out screenshots/worst-planes-3d.png
# The stress element (iso and looking down z: the plane element and its turned copy), and the
# traction over all directions with the lit ellipsoid.
$bin figure "${demo[@]}" --layers cube,element,labels,legend,triad \
    --view iso --size 1100x750 --out screenshots/stress-element.png
$bin figure "${demo[@]}" --layers cube,element,labels,legend,triad \
    --view z --size 1100x750 --out screenshots/plane-element.png
$bin figure "${demo[@]}" --layers cube,field,ellipsoid,axes,legend,triad \
    --view iso --size 1100x750 --out screenshots/traction-field.png
# A page of the calculation report as a real browser prints it.
scripts/report-browser.sh target/report-browser
pdftoppm -png -r 80 -f 3 -l 3 -singlefile target/report-browser/report.pdf screenshots/report-page
ls -l screenshots
