#!/usr/bin/env bash
# npm run dev: the API with the database, plus Vite's dev server proxying /api to it.
source "$(dirname "$0")/lib.sh"
bootstrap
ensure_database tractwise
export DATABASE_URL="${DATABASE_URL:-$(database_url tractwise)}"
node_modules/.bin/tsx server/scripts/prepare-db.ts
start_fakes
node_modules/.bin/tsx watch server/index.ts &
FAKE_PIDS+=($!)
trap stop_fakes EXIT
node_modules/.bin/vite
