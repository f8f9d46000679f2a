#!/usr/bin/env bash
# `npm test`: installs what is missing, then type-checks, lints, checks formatting and runs
# every unit, API and browser test against a throw-away PostgreSQL cluster.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-deps.sh --test
export NODE_ENV=test
echo "== typecheck"; npm run --silent typecheck
echo "== lint"; npm run --silent lint
echo "== format"; npm run --silent format:check
echo "== tests"
exec node --import tsx scripts/test-run.ts "$@"
