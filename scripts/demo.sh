#!/usr/bin/env bash
# The run command of the README: set up if needed, then run the small survey of
# examples/ (12 random plats and two hand-typed control lines) end to end as a batch
# and print its summary. About a minute on a 2-core machine.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
OUT=runs/demo-survey-small
rm -rf "$OUT"   # the demo's own output folder from an earlier demo run
.venv/bin/plait batch examples/survey-small.jsonl --out "$OUT" --steps 3000 --seed 1
# a picture of one item: the figure-eight control line before and after the search
.venv/bin/plait draw "$(ls -d "$OUT"/runs/control-4_1-* | head -n 1)" --before-after \
    --out "$OUT/control-4_1.svg"
echo
echo "rows: $OUT/results.jsonl and $OUT/results.csv; summary: $OUT/summary.json"
echo "pictures: $OUT/summary.svg (the batch) and $OUT/control-4_1.svg (one item)"
