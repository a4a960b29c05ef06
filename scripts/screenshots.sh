#!/usr/bin/env bash
# Regenerates the README's images in screenshots/ with the program itself: the window under
# Xvfb (needs what scripts/gui-smoke.sh installs) and headless figures. Never edit them by hand.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p screenshots
scripts/gui-smoke.sh screenshots/window-demo.png
scripts/gui-smoke.sh screenshots/window-mohr.png mohr
demo="xx=120,yy=-35,zz=15,xy=48,yz=-12,zx=22"   # the built-in demo: an invented scenario
bin=target/release/planewise
$bin figure --stress "$demo" --normal 1,0.5,0.3 --layers cube,plane,labels,legend,triad \
    --view iso --size 1100x750 --out screenshots/cut-plane-traction.png
$bin figure --stress "$demo" --normal 1,0.5,0.3 --layers ellipsoid,axes,labels,legend,triad \
    --view iso --perspective --size 1100x750 --out screenshots/ellipsoid-principal-axes.png
$bin map --stress "$demo" --normal 1,0.5,0.3 --measure shear --size 1100x750 \
    --out screenshots/orientation-map-shear.png
$bin mohr --stress "$demo" --normal 1,0.5,0.3 --measure mohr-coulomb --cohesion 10 \
    --friction-angle 30 --size 1100x750 --out screenshots/mohr-circles.png
$bin figure --stress "$demo" --normal 1,0.5,0.3 --measure shear \
    --layers cube,plane,axes,labels,legend,triad --view iso --size 1100x750 \
    --out screenshots/worst-planes-3d.png
ls -l screenshots
