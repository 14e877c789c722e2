#!/usr/bin/env bash
# npm test: the same bootstrap as npm start, into separate test databases, then every suite:
# unit (vitest), API integration against the real PostgreSQL, and browser tests in Debian's Chromium.
source "$(dirname "$0")/lib.sh"
bootstrap
ensure_chromium
ensure_database tractwise_test
ensure_database tractwise_e2e
mkdir -p .data/test-results tests/artifacts
rm -f .data/test-results/*.json

log "building the client"
node_modules/.bin/vite build --logLevel warn

status=0
run_suite() {
  local project="$1" db="$2"
  log "suite: $project"
  TEST_DATABASE_URL="$(database_url "$db")" node_modules/.bin/vitest run --project "$project" \
    --reporter=default --reporter=json --outputFile.json=".data/test-results/$project.json" || status=1
}
run_suite unit tractwise_test
run_suite integration tractwise_test
run_suite e2e tractwise_e2e

# One closing line in the plain "N passed, N failed" form, summed over the suites.
node -e '
  const fs = require("fs");
  let passed = 0, failed = 0, skipped = 0;
  for (const p of ["unit", "integration", "e2e"]) {
    const f = ".data/test-results/" + p + ".json";
    if (!fs.existsSync(f)) { failed++; console.log(p + ": no results (the suite did not run)"); continue; }
    const r = JSON.parse(fs.readFileSync(f, "utf8"));
    passed += r.numPassedTests; // A file that fails to load has no failed tests of its own: count it once.
    failed += r.numFailedTests > 0 ? r.numFailedTests : (r.numFailedTestSuites || 0); skipped += r.numPendingTests + (r.numTodoTests || 0);
    console.log(p + ": " + r.numPassedTests + " passed, " + r.numFailedTests + " failed");
  }
  console.log(passed + " passed, " + failed + " failed, " + skipped + " skipped");
  if (failed > 0) process.exitCode = 1;
' || status=1
exit $status
