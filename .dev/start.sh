#!/usr/bin/env bash
# `npm start`: prepare, seed the demo company on first run, build and serve.
set -euo pipefail
cd "$(dirname "$0")/.."
bash .dev/prepare.sh
printf '\n\033[1m[patina] demo data\033[0m\n'
npx tsx drizzle/seed/run.ts --if-empty
printf '\n\033[1m[patina] building\033[0m\n'
npx react-router build >/dev/null
# A local SMTP sink stands in for the company's mail provider; what it receives
# is kept in .data/mail and shown to owners at /mailbox.
mkdir -p .data/mail
if [ -z "${PATINA_SMTP_URL:-}" ]; then
  npx tsx .dev/mail-sink-cli.ts --port 2525 --store .data/mail >.data/mail-sink.log 2>&1 &
  sink_pid=$!
  trap 'kill $sink_pid 2>/dev/null || true' EXIT
fi
if [ -z "${PATINA_S3_URL:-}" ]; then
  export PATINA_S3_URL="http://127.0.0.1:${PATINA_S3_PORT:-9000}"
fi
port=${PORT:-3000}
printf '\n\033[1m[patina] Patina is at http://localhost:%s\033[0m (Ctrl+C stops it; the database and the object store keep running: npm run db:stop, npm run s3:stop)\n' "$port"
export NODE_ENV=production PORT="$port" PATINA_URL="${PATINA_URL:-http://localhost:$port}"
node server.mjs build/server/index.js
