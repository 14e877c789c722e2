#!/usr/bin/env bash
# npm start: set everything up on a fresh clone, then serve the app.
source "$(dirname "$0")/lib.sh"
bootstrap
ensure_database tractwise
export DATABASE_URL="${DATABASE_URL:-$(database_url tractwise)}"
export NODE_ENV="${NODE_ENV:-production}"
export SESSION_SECRET="${SESSION_SECRET:-$(cat .data/session-secret 2>/dev/null || (head -c 32 /dev/urandom | base64 | tee .data/session-secret))}"
node_modules/.bin/tsx server/scripts/prepare-db.ts
log "building the client"
node_modules/.bin/vite build --logLevel warn
start_fakes
trap stop_fakes EXIT
trap 'exit 130' INT TERM
node --import tsx server/index.ts &
server=$!
FAKE_PIDS+=($server)
wait $server
