#!/usr/bin/env bash
# Create .venv and install plait with its test extras when missing (idempotent).
set -euo pipefail
cd "$(dirname "$0")/.."
PY=${PYTHON:-python3}
if [ ! -x .venv/bin/python ]; then
    "$PY" -m venv .venv
fi
if ! .venv/bin/python -c "import plait, pytest, hypothesis, database_knotinfo, ortools, tqdm" \
        >/dev/null 2>&1 || [ pyproject.toml -nt .venv/.plait-installed ]; then
    .venv/bin/python -m pip install --quiet --upgrade pip
    .venv/bin/python -m pip install --quiet -e ".[test,cluster]"
    touch .venv/.plait-installed
fi
