#!/usr/bin/env bash
# Create .venv and install plait with its test extras when missing (idempotent).
# pip's output goes to .venv/install.log and is shown only when the install fails.
set -euo pipefail
cd "$(dirname "$0")/.."
PY=${PYTHON:-python3}
if [ ! -x .venv/bin/python ]; then
    echo "setting up .venv (first run only) ..." >&2
    "$PY" -m venv .venv
fi
if ! .venv/bin/python -c "import plait, pytest, hypothesis, database_knotinfo, ortools, tqdm, dask.distributed" \
        >/dev/null 2>&1 || [ pyproject.toml -nt .venv/.plait-installed ]; then
    echo "installing plait into .venv ..." >&2
    if ! { .venv/bin/python -m pip install --upgrade pip \
           && .venv/bin/python -m pip install -e ".[test,cluster]"; } >.venv/install.log 2>&1; then
        tail -30 .venv/install.log >&2
        echo "setup failed; full log in .venv/install.log" >&2
        exit 1
    fi
    touch .venv/.plait-installed
fi
