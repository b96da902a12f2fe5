#!/usr/bin/env bash
# The test command of the README: set up if needed, lint, then run the test suite.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
.venv/bin/ruff check .
.venv/bin/python -m pytest -q -p no:cacheprovider "$@"
