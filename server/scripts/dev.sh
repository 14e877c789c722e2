#!/usr/bin/env bash
# npm run dev: the API with the database, plus Vite's dev server proxying /api to it.
source "$(dirname "$0")/lib.sh"
bootstrap
ensure_database tractwise
export DATABASE_URL="${DATABASE_URL:-$(database_url tractwise)}"
node_modules/.bin/tsx server/scripts/prepare-db.ts
node_modules/.bin/tsx watch server/index.ts &
api=$!
trap 'kill $api 2>/dev/null' EXIT
node_modules/.bin/vite
