#!/usr/bin/env bash
# The local S3-compatible object store that keeps uploaded files when
# PATINA_S3_URL names no real service (s3rver, on loopback).
#
#   bash .dev/object-store.sh start    start it detached, wait until it answers
#   bash .dev/object-store.sh stop     stop it by the pid it was started with
#   bash .dev/object-store.sh status   say whether it answers
#
# Environment: PATINA_S3_PORT (9000), PATINA_S3_DIR (<repo>/.data/s3),
# PATINA_S3_BUCKET (patina-uploads); PATINA_S3_RESET=1 empties the folder
# before starting (test runs). The pid and log sit beside the folder.
set -euo pipefail

repo=$(cd "$(dirname "$0")/.." && pwd)
port=${PATINA_S3_PORT:-9000}
dir=${PATINA_S3_DIR:-$repo/.data/s3}
bucket=${PATINA_S3_BUCKET:-patina-uploads}
pidfile=$dir.pid
logfile=$dir.log

say() { printf '[object-store] %s\n' "$*"; }

answers() { (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; }

our_pid() {
  [ -f "$pidfile" ] || return 1
  local pid
  pid=$(cat "$pidfile")
  kill -0 "$pid" 2>/dev/null && printf '%s' "$pid"
}

start() {
  if our_pid >/dev/null; then
    say "already running on 127.0.0.1:$port"
    return
  fi
  if answers; then
    # Something of an earlier run (or another checkout) listens there: it serves this run as well.
    say "port $port is taken; assuming an object store is already running there"
    return
  fi
  if [ "${PATINA_S3_RESET:-}" = "1" ]; then rm -rf "$dir"; fi
  mkdir -p "$dir"
  cd "$repo"
  # Detached from this shell (like the database), so it outlives npm's process group; the pid is node's own.
  setsid nohup node --import tsx .dev/object-store.ts --port "$port" --dir "$dir" --bucket "$bucket" \
    </dev/null >"$logfile" 2>&1 &
  echo $! >"$pidfile"
  for _ in $(seq 1 100); do
    if answers; then
      say "started on 127.0.0.1:$port (files in ${dir#$repo/})"
      return
    fi
    if ! our_pid >/dev/null; then break; fi
    sleep 0.1
  done
  cat "$logfile" >&2
  say "did not start; see $logfile"
  exit 1
}

stop() {
  local pid
  if ! pid=$(our_pid); then
    rm -f "$pidfile"
    say "not running (no live pid in ${pidfile#$repo/})"
    return
  fi
  kill "$pid"
  for _ in $(seq 1 50); do
    kill -0 "$pid" 2>/dev/null || break
    sleep 0.1
  done
  rm -f "$pidfile"
  say "stopped"
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status)
    if answers; then say "answers on 127.0.0.1:$port"; else say "not answering on 127.0.0.1:$port"; exit 1; fi
    ;;
  *)
    echo "usage: bash .dev/object-store.sh start|stop|status" >&2
    exit 2
    ;;
esac
