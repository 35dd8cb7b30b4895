#!/usr/bin/env bash
# Brings a machine from a fresh clone to "ready": Debian packages that are
# missing, node modules, the project-local MariaDB and its migrations.
#   bash .dev/prepare.sh          what `npm start` needs
#   bash .dev/prepare.sh test     the same, plus Debian's chromium for browser tests
set -euo pipefail
cd "$(dirname "$0")/.."

step() { printf '\n\033[1m[patina] %s\033[0m\n' "$*"; }
started=$(date +%s)

if [ "${1:-}" = "test" ] && ! command -v chromium >/dev/null 2>&1; then
  step "installing Debian's chromium for the browser tests"
  sudo=""
  [ "$(id -u)" -eq 0 ] || sudo="sudo"
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends chromium >/dev/null
fi

# Reinstall when the lock file is newer than the last install.
if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  step "installing node modules (npm ci)"
  npm ci --no-audit --no-fund
fi

step "starting the project's MariaDB"
bash drizzle/local-db.sh start

step "applying migrations"
npx tsx drizzle/migrate.ts

# Uploaded files go to an S3-compatible bucket; without a real one, the local fake keeps them in .data/s3.
if [ -z "${PATINA_S3_URL:-}" ]; then
  step "starting the local object store"
  bash .dev/object-store.sh start
fi

printf '[patina] ready in %ss\n' "$(( $(date +%s) - started ))"
