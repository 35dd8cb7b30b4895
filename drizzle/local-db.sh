#!/usr/bin/env bash
# Project-local MariaDB for Patina: its own data folder, port and socket, so it
# never touches a MariaDB that belongs to the machine.
#
#   bash drizzle/local-db.sh start    install if missing, initialise, start, create databases
#   bash drizzle/local-db.sh stop     stop the project's server
#   bash drizzle/local-db.sh status   say whether it answers
#   bash drizzle/local-db.sh recreate NAME   drop and create an empty scratch database
#
# Environment: PATINA_DB_PORT (33061), PATINA_DB_DIR (<repo>/.data/mariadb),
# PATINA_DB_NAMES (databases to create, default "patina patina_test").
set -euo pipefail

repo=$(cd "$(dirname "$0")/.." && pwd)
port=${PATINA_DB_PORT:-33061}
base=${PATINA_DB_DIR:-$repo/.data/mariadb}
datadir=$base/data
# A unix socket path must stay under 108 characters; fall back to /tmp when the
# checkout lives deep in the file system.
socket=$base/mariadb.sock
if [ ${#socket} -gt 100 ]; then
  socket=/tmp/patina-mariadb-$(printf '%s' "$base" | cksum | cut -d' ' -f1).sock
fi
pidfile=$base/mariadb.pid
logfile=$base/mariadb.log
db_user=${PATINA_DB_USER:-patina}
db_password=${PATINA_DB_PASSWORD:-patina-local}
db_names=${PATINA_DB_NAMES:-patina patina_test}

say() { printf '[local-db] %s\n' "$*"; }

client() { mariadb --no-defaults --socket="$socket" -uroot "$@"; }

answers() { client -e 'SELECT 1' >/dev/null 2>&1; }

install_packages() {
  if command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ]; then
    return
  fi
  say "installing MariaDB server from Debian's packages"
  local sudo=""
  [ "$(id -u)" -eq 0 ] || sudo="sudo"
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends \
    mariadb-server-core mariadb-client-core >/dev/null
}

server_bin() { command -v mariadbd 2>/dev/null || echo /usr/sbin/mariadbd; }

initialise() {
  [ -d "$datadir/mysql" ] && return
  say "initialising a data folder in ${datadir#$repo/}"
  mkdir -p "$datadir"
  local as_root=()
  [ "$(id -u)" -eq 0 ] && as_root=(--user=root)
  mariadb-install-db --no-defaults "${as_root[@]}" --datadir="$datadir" \
    --auth-root-authentication-method=socket --skip-test-db >"$base/install.log" 2>&1 || {
      cat "$base/install.log" >&2
      exit 1
    }
}

start_server() {
  if answers; then
    say "already running on 127.0.0.1:$port"
    return
  fi
  local as_root=()
  [ "$(id -u)" -eq 0 ] && as_root=(--user=root)
  # No daemon mode: detach it from this shell so it outlives npm's process group.
  setsid nohup "$(server_bin)" --no-defaults "${as_root[@]}" \
    --datadir="$datadir" --socket="$socket" --pid-file="$pidfile" \
    --port="$port" --bind-address=127.0.0.1 --skip-name-resolve \
    --log-error="$logfile" --character-set-server=utf8mb4 \
    --collation-server=utf8mb4_unicode_ci --default-time-zone=+00:00 \
    --local-infile=1 --max-allowed-packet=256M --innodb-buffer-pool-size=512M \
    </dev/null >/dev/null 2>&1 &
  for _ in $(seq 1 150); do
    if answers; then
      say "started on 127.0.0.1:$port"
      return
    fi
    sleep 0.2
  done
  say "MariaDB did not answer within 30 s; its log:" >&2
  tail -n 30 "$logfile" >&2 || true
  exit 1
}

create_databases() {
  local sql=""
  for name in $db_names; do
    sql+="CREATE DATABASE IF NOT EXISTS \`$name\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;"
  done
  sql+="CREATE USER IF NOT EXISTS '$db_user'@'127.0.0.1' IDENTIFIED BY '$db_password';"
  sql+="ALTER USER '$db_user'@'127.0.0.1' IDENTIFIED BY '$db_password';"
  for name in $db_names; do
    sql+="GRANT ALL PRIVILEGES ON \`$name\`.* TO '$db_user'@'127.0.0.1';"
  done
  # Integration tests create and drop scratch databases of their own.
  sql+="GRANT ALL PRIVILEGES ON \`patina\\_scratch\\_%\`.* TO '$db_user'@'127.0.0.1';"
  sql+="FLUSH PRIVILEGES;"
  client -e "$sql"
}

stop_server() {
  if [ ! -f "$pidfile" ]; then
    say "not running"
    return
  fi
  local pid
  pid=$(cat "$pidfile")
  if kill "$pid" 2>/dev/null; then
    for _ in $(seq 1 100); do
      kill -0 "$pid" 2>/dev/null || break
      sleep 0.1
    done
  fi
  rm -f "$pidfile"
  say "stopped"
}

case "${1:-start}" in
  start)
    mkdir -p "$base"
    install_packages
    initialise
    start_server
    create_databases
    ;;
  stop) stop_server ;;
  recreate)
    name=${2:-}
    case "$name" in
      patina_scratch_*) ;;
      *) echo "recreate takes a scratch database name (patina_scratch_...)" >&2; exit 2 ;;
    esac
    client -e "DROP DATABASE IF EXISTS \`$name\`; CREATE DATABASE \`$name\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;"
    say "created an empty $name"
    ;;
  status)
    if answers; then say "running on 127.0.0.1:$port"; else say "not running"; exit 1; fi
    ;;
  *)
    echo "usage: $0 start|stop|status" >&2
    exit 2
    ;;
esac
