#!/usr/bin/env bash
# Runs every benchmark, one after another (they time themselves; run on an idle machine).
# Output: one JSON line per measurement, also appended to bench/results/<timestamp>.jsonl.
#   npm run bench             all
#   npm run bench -- scan     one (convert | binning | scan | binned | trials | rayleigh | cli | map-draw | analysis | coverage | ingest)
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p bench/results
out="bench/results/$(date -u +%Y%m%dT%H%M%SZ).jsonl"
only="${1:-all}"
tsx=./node_modules/.bin/tsx
N=1000000
data="bench/data/events-$N.csv"
[ -f "$data" ] || $tsx bench/make-events.ts --n $N --out "$data"

run() { echo "# $*" >&2; "$@" | tee -a "$out"; }
want() { [ "$only" = all ] || [ "$only" = "$1" ]; }

want convert && run $tsx bench/convert.ts --repeat 3
want binning && run $tsx bench/binning.ts --repeat 5
want scan && run $tsx bench/scan.ts --repeat 3
want binned && run $tsx bench/binned-scan.ts
want trials && run $tsx bench/trials.ts --skies 1000 --n 2000 --workers 2
want rayleigh && run $tsx bench/rayleigh.ts
want cli && run $tsx bench/cli.ts
want map-draw && run $tsx bench/map-draw.ts
# 20 and 40 skies measured, 1,000 extrapolated (the full run: npx tsx --conditions=react-server bench/analysis.ts --skies 1000)
want analysis && run $tsx --conditions=react-server bench/analysis.ts --skies 40
want coverage && run $tsx bench/coverage.ts
want ingest && { bash scripts/db.sh start >/dev/null; run $tsx --conditions=react-server bench/ingest.ts; }
echo "results appended to $out" >&2
