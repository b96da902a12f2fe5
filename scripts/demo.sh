#!/usr/bin/env bash
# The run command of the README: set up if needed, then run the small survey of
# examples/ (12 random plats and two hand-typed control lines) end to end as a batch
# and print its summary. About a minute on a 2-core machine.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
OUT=runs/demo-survey-small
rm -rf "$OUT"   # the demo's own output folder from an earlier demo run
.venv/bin/plait batch examples/survey-small.jsonl --out "$OUT" --steps 500 --seed 1
echo
echo "rows: $OUT/results.jsonl and $OUT/results.csv; summary: $OUT/summary.json"
