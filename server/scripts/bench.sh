#!/usr/bin/env bash
# npm run bench: performance figures, printed as tables. Uses its own database (tractwise_bench).
source "$(dirname "$0")/lib.sh"
bootstrap
ensure_database tractwise_bench
export BENCH_DATABASE_URL="$(database_url tractwise_bench)"
[ -f dist/client/index.html ] || node_modules/.bin/vite build --logLevel warn
for b in tests/bench/*.bench.ts; do
  log "benchmark: $b"
  node_modules/.bin/tsx "$b"
done
