#!/usr/bin/env bash
# Shared bootstrap for `npm start`, `npm test` and `npm run dev`: everything a fresh clone needs,
# using only Debian's packages and the npm registry. Each step is skipped when already done.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
cd "$ROOT"

PGBIN="${PGBIN:-/usr/lib/postgresql/15/bin}"
PG_DATA="${PG_DATA:-$ROOT/.data/pg}"
PG_PORT="${PG_PORT:-54329}"
PG_SHARE="/usr/share/postgresql/15"

log() { printf '\033[1;36m[tractwise]\033[0m %s\n' "$*"; }

apt_updated=0
apt_install() {
  if [ "$(id -u)" != 0 ]; then
    echo "Missing Debian packages ($*): run as root or install them: apt-get install -y $*" >&2
    exit 1
  fi
  if [ "$apt_updated" = 0 ]; then
    log "apt-get update"
    apt-get update -qq
    apt_updated=1
  fi
  log "apt-get install $*"
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

ensure_postgres() {
  local need=()
  [ -x "$PGBIN/pg_ctl" ] || need+=(postgresql)
  [ -f "$PG_SHARE/extension/postgis.control" ] || need+=(postgresql-15-postgis-3)
  if [ ${#need[@]} -gt 0 ]; then apt_install "${need[@]}"; fi
}

ensure_chromium() {
  [ -x /usr/bin/chromium ] || apt_install chromium
}

ensure_node_modules() {
  # Reinstall when node_modules is missing or older than the lock file.
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    log "npm ci"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

# Runs a PostgreSQL binary as the postgres user when we are root (initdb refuses root).
as_pg() {
  if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

pg_running() { as_pg "$PGBIN/pg_ctl" -D "$PG_DATA" status >/dev/null 2>&1; }

start_postgres() {
  if [ ! -f "$PG_DATA/PG_VERSION" ]; then
    log "initialising a PostgreSQL cluster in $PG_DATA"
    mkdir -p "$PG_DATA"
    if [ "$(id -u)" = 0 ]; then
      chown postgres:postgres "$PG_DATA"
      # postgres must be able to walk down to the data folder.
      local d="$PG_DATA"
      while d="$(dirname "$d")" && [ "$d" != / ]; do chmod o+x "$d" 2>/dev/null || true; done
    fi
    chmod 700 "$PG_DATA"
    as_pg "$PGBIN/initdb" -D "$PG_DATA" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
  fi
  if ! pg_running; then
    log "starting PostgreSQL on 127.0.0.1:$PG_PORT"
    as_pg "$PGBIN/pg_ctl" -D "$PG_DATA" -l "$PG_DATA/server.log" -w -t 30 \
      -o "-c listen_addresses=127.0.0.1 -p $PG_PORT -k $PG_DATA" start >/dev/null
  fi
}

stop_postgres() {
  if [ -f "$PG_DATA/PG_VERSION" ] && pg_running; then
    as_pg "$PGBIN/pg_ctl" -D "$PG_DATA" -m fast -w stop >/dev/null
    log "PostgreSQL stopped"
  else
    log "PostgreSQL is not running"
  fi
}

ensure_database() {
  local name="$1"
  if ! psql -h 127.0.0.1 -p "$PG_PORT" -U postgres -tAc "select 1 from pg_database where datname = '$name'" | grep -q 1; then
    log "creating database $name"
    psql -h 127.0.0.1 -p "$PG_PORT" -U postgres -qc "create database \"$name\"" >/dev/null
  fi
}

database_url() { echo "postgres://postgres@127.0.0.1:$PG_PORT/$1"; }

bootstrap() {
  ensure_postgres
  ensure_node_modules
  start_postgres
}

# The local fakes of hosted services (street-range geocoder, SMTP), each its own process on
# loopback. Skipped when the operator points the app at a real service. Their pids go to FAKE_PIDS.
FAKE_PIDS=()
start_fakes() {
  mkdir -p .data/logs
  if [ -z "${GEOCODER_URL:-}" ]; then
    GEOCODER_FAKE_PORT="${GEOCODER_FAKE_PORT:-3101}" node --import tsx server/fakes/geocoder.ts >.data/logs/geocoder-fake.log 2>&1 &
    FAKE_PIDS+=($!)
    export GEOCODER_URL="http://127.0.0.1:${GEOCODER_FAKE_PORT:-3101}/geocode"
  fi
  if [ -z "${SMTP_URL:-}" ]; then
    SMTP_FAKE_PORT="${SMTP_FAKE_PORT:-2525}" SMTP_FAKE_HTTP_PORT="${SMTP_FAKE_HTTP_PORT:-2526}" node --import tsx server/fakes/smtp.ts >.data/logs/smtp-fake.log 2>&1 &
    FAKE_PIDS+=($!)
    export SMTP_URL="smtp://127.0.0.1:${SMTP_FAKE_PORT:-2525}"
  fi
  if [ -z "${S3_ENDPOINT:-}" ] && [ -f server/fakes/s3.ts ]; then
    # Objects persist in .data/s3 between runs, like the database.
    S3_FAKE_PORT="${S3_FAKE_PORT:-4569}" node --import tsx server/fakes/s3.ts >.data/logs/s3-fake.log 2>&1 &
    FAKE_PIDS+=($!)
    export S3_ENDPOINT="http://127.0.0.1:${S3_FAKE_PORT:-4569}"
    # The server makes its bucket at start: let the store listen first.
    wait_for_port "${S3_FAKE_PORT:-4569}" || log "the S3 fake is not listening yet (see .data/logs/s3-fake.log)"
  fi
  [ ${#FAKE_PIDS[@]} -eq 0 ] || log "local fakes running (logs in .data/logs): geocoder ${GEOCODER_URL}, mail ${SMTP_URL}, files ${S3_ENDPOINT:-none}"
}
# Waits up to ~15 s for something to listen on a loopback port.
wait_for_port() {
  local i
  for i in $(seq 1 75); do
    if (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; then return 0; fi
    sleep 0.2
  done
  return 1
}
stop_fakes() { [ ${#FAKE_PIDS[@]} -eq 0 ] || kill "${FAKE_PIDS[@]}" 2>/dev/null || true; }
