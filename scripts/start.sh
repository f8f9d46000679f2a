#!/usr/bin/env bash
# `npm start`: install what is missing, then run everything (scripts/start.ts).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-deps.sh
exec node --import tsx scripts/start.ts
