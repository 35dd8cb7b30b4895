#!/usr/bin/env bash
# `npm test`: prepare (with chromium), then every tier of tests, stopping at the first red one.
set -euo pipefail
cd "$(dirname "$0")/.."
bash .dev/prepare.sh test

timed() {
  local name=$1
  shift
  local t0
  t0=$(date +%s)
  printf '\n\033[1m[patina] %s\033[0m\n' "$name"
  "$@"
  printf '[patina] %s took %ss\n' "$name" "$(( $(date +%s) - t0 ))"
}

timed "typecheck" npm run --silent typecheck
timed "lint (eslint)" npm run --silent lint
timed "import cycles (madge)" npm run --silent cycles
timed "unit tests" npx vitest run --project unit
timed "integration tests (MariaDB)" npx vitest run --project integration
timed "production build" npx react-router build
timed "fault tests (database outage, overload)" npx vitest run --project fault
timed "cluster fault test (three Galera nodes, HAProxy, two instances)" npx vitest run --project cluster
timed "browser tests (chromium)" npx vitest run --project browser
