#!/usr/bin/env bash
# The run command of the README: set up if needed, then run the demo.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
.venv/bin/plait show --braid "1 -2 1 -2"
