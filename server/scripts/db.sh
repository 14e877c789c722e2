#!/usr/bin/env bash
# npm run db:start / db:stop — the project's own PostgreSQL cluster on loopback.
source "$(dirname "$0")/lib.sh"
case "${1:-}" in
  start) ensure_postgres; start_postgres; ensure_database tractwise; log "PostgreSQL on $(database_url tractwise)" ;;
  stop) stop_postgres ;;
  *) echo "usage: db.sh start|stop" >&2; exit 2 ;;
esac
