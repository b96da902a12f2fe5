#!/usr/bin/env bash
# Re-create the survey inputs of examples/README.md from the seeded generator.
# The output is byte-for-byte the committed survey.jsonl and survey-small.jsonl.
set -euo pipefail
cd "$(dirname "$0")/.."
PLAIT=${PLAIT:-.venv/bin/plait}
"$PLAIT" random-plats --count 200 --bridges 4-6 --length 40-80 --seed 2026 --knot \
    --prefix survey- --out examples/survey.jsonl
# the small survey: the first 12 plats (item i does not depend on --count) and the two
# hand-typed control lines the group adds to every run
{
    head -n 12 examples/survey.jsonl
    echo '{"id": "control-4_1", "braid": [1, -2, 1, -2]}'
    echo '{"id": "control-typo", "braid": "1 -2 l -2"}'
} > examples/survey-small.jsonl
