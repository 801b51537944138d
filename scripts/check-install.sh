#!/usr/bin/env bash
# Packs both packages as a user would get them (npm pack runs each package's prepack build), installs
# the tarballs globally into a temporary prefix, and runs the demo files from another folder with the
# installed `refdelta`: points (GeoPackage, KML, DXF, a national grid), check, and a standalone solve.
# Needs the npm registry for the packages' dependencies. Usage: npm run check:install
set -euo pipefail
ROOT="$(cd "$(dirname "$0")/.." && pwd)"
WORK="$(mktemp -d)"
trap 'rm -rf "$WORK"' EXIT
D="$ROOT/fixtures/demo"
cd "$ROOT"
npm pack -w packages/core -w packages/cli --pack-destination "$WORK" >/dev/null
npm install -g --prefix "$WORK/prefix" --no-audit --no-fund "$WORK"/refdelta-core-*.tgz "$WORK"/refdelta-cli-*.tgz >/dev/null
BIN="$WORK/prefix/bin/refdelta"
mkdir -p "$WORK/run" && cd "$WORK/run"
echo "installed: refdelta $("$BIN" --version) in $WORK/prefix"
"$BIN" points --rover "$D/rover-1s.obs" --reference "$D/KFRD-reference-5s.obs" --nav "$D/broadcast-mixed.nav" \
  --ref-coord KFRD --marks "$D/control-marks.csv" --projection EPSG:2157 --outputs epochs,gpkg,kml,dxf,summary --out pts --quiet
"$BIN" check --points pts/points.csv --marks "$D/control-marks.csv" --out chk --quiet || [ $? -eq 3 ]
"$BIN" solve --rover "$D/rover-1s.obs" --nav "$D/broadcast-mixed.nav" --out alone --quiet
for f in pts/points.csv pts/positions.gpkg pts/points.dxf pts/points.kml pts/points.prj chk/control-check.csv alone/epochs.csv; do
  test -s "$f" || { echo "missing output $f" >&2; exit 1; }
done
echo "ok: packed, installed globally and ran the demo files from $WORK/run"
