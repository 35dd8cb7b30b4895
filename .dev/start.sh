#!/usr/bin/env bash
# `npm start`: prepare, seed the demo company on first run, build and serve.
set -euo pipefail
cd "$(dirname "$0")/.."
bash .dev/prepare.sh
printf '\n\033[1m[patina] demo data\033[0m\n'
npx tsx drizzle/seed/run.ts --if-empty
printf '\n\033[1m[patina] building\033[0m\n'
npx react-router build >/dev/null
port=${PORT:-3000}
printf '\n\033[1m[patina] Patina is at http://localhost:%s\033[0m (Ctrl+C stops it; the database keeps running: npm run db:stop)\n' "$port"
export NODE_ENV=production PORT="$port" PATINA_URL="${PATINA_URL:-http://localhost:$port}"
exec node node_modules/@react-router/serve/bin.js build/server/index.js
