#!/usr/bin/env bash
# `npm test`: the same set-up as `npm start`, then every test: unit, integration against the
# real PostgreSQL (each test file in a database of its own, never the demo database), and
# end-to-end in Debian's Chromium against a production build served on 127.0.0.1.
#   npm test                 everything
#   npm test -- unit         one project (unit | integration | e2e)
set -euo pipefail
. "$(dirname "$0")/lib.sh"
started=$(date +%s)
only="${1:-all}"

bash "$ROOT/scripts/setup.sh"
ensure_env_file
if [ "$only" = all ] || [ "$only" = e2e ]; then ensure_chromium; fi
export SIDEREA_ADMIN_DATABASE_URL="$(bash "$ROOT/scripts/db.sh" url postgres)"
export SIDEREA_TEST_TEMPLATE_DB=siderea_test_template
cd "$ROOT"
rm -rf test-results && mkdir -p test-results
status=0

run_vitest() {
  local project="$1" name="${2:-$1}"
  shift; [ $# -gt 0 ] && shift
  say "running $name tests"
  ./node_modules/.bin/vitest run --project "$project" --reporter=default --reporter=json \
    --outputFile.json="test-results/$name.json" "$@" || status=1
}

# The SMTP port of the test runs (the e2e sink; integration tests use the next port up).
export SIDEREA_TEST_SMTP_PORT="${SIDEREA_TEST_SMTP_PORT:-2526}"

if [ "$only" = all ] || [ "$only" = unit ]; then run_vitest unit; fi
if [ "$only" = all ] || [ "$only" = integration ]; then run_vitest integration; fi

if [ "$only" = all ] || [ "$only" = e2e ]; then
  bash "$ROOT/scripts/build-if-changed.sh"
  E2E_DB=siderea_e2e
  E2E_PORT="${SIDEREA_E2E_PORT:-3100}"
  psql "$SIDEREA_ADMIN_DATABASE_URL" -qtA -c "DROP DATABASE IF EXISTS $E2E_DB WITH (FORCE)" -c "CREATE DATABASE $E2E_DB OWNER siderea" >/dev/null
  export E2E_DATABASE_URL="$(bash "$ROOT/scripts/db.sh" url $E2E_DB)"
  DATABASE_URL="$E2E_DATABASE_URL" ./node_modules/.bin/sequelize-cli db:migrate >/dev/null
  DATABASE_URL="$E2E_DATABASE_URL" ./node_modules/.bin/sequelize-cli db:seed:all >/dev/null
  # A real SMTP sink for the browser tests' mail; the admin inbox page reads its folder.
  export SIDEREA_SMTP_HOST=127.0.0.1 SIDEREA_SMTP_PORT="$SIDEREA_TEST_SMTP_PORT" SIDEREA_MAIL_SINK_DIR="$ROOT/test-results/mail" SIDEREA_MAIL_INBOX=on
  unset SIDEREA_SMTP_URL
  start_smtp_sink "$SIDEREA_SMTP_PORT" "$SIDEREA_MAIL_SINK_DIR" > test-results/e2e-smtp-sink.log 2>&1
  sink=$SMTP_SINK_PID
  say "serving the build for end-to-end tests on 127.0.0.1:$E2E_PORT (SMTP sink on 127.0.0.1:$SIDEREA_SMTP_PORT)"
  DATABASE_URL="$E2E_DATABASE_URL" NEXTAUTH_URL="http://127.0.0.1:$E2E_PORT" \
    ./node_modules/.bin/next start -H 127.0.0.1 -p "$E2E_PORT" > test-results/e2e-server.log 2>&1 &
  server=$!
  DATABASE_URL="$E2E_DATABASE_URL" NEXTAUTH_URL="http://127.0.0.1:$E2E_PORT" node --import tsx --conditions=react-server lib/worker/main.ts > test-results/e2e-worker.log 2>&1 &
  worker=$!
  trap 'kill $server $worker $sink 2>/dev/null || true' EXIT
  for _ in $(seq 1 60); do
    curl -fsS "http://127.0.0.1:$E2E_PORT/api/health" >/dev/null 2>&1 && break
    sleep 0.5
  done
  export E2E_BASE_URL="http://127.0.0.1:$E2E_PORT"
  # The alerts scenario appends to the demo dataset: it runs after the other browser tests,
  # which expect the demo dataset as seeded.
  run_vitest e2e e2e --exclude tests/e2e/alerts.test.ts
  run_vitest e2e e2e-alerts tests/e2e/alerts.test.ts
  kill $server $worker $sink 2>/dev/null || true
fi

# One closing line over every project run: "N passed, N failed".
node -e '
  const fs = require("fs");
  let passed = 0, failed = 0, skipped = 0;
  for (const f of fs.readdirSync("test-results").filter((f) => f.endsWith(".json"))) {
    const r = JSON.parse(fs.readFileSync("test-results/" + f, "utf8"));
    passed += r.numPassedTests; failed += r.numFailedTests; skipped += r.numPendingTests + (r.numTodoTests || 0);
    if (r.numFailedTestSuites && !r.numFailedTests) failed += r.numFailedTestSuites;
  }
  console.log(`\ntests: ${passed} passed, ${failed} failed, ${skipped} skipped`);
' || true
say "npm test finished in $(( $(date +%s) - started )) s"
exit $status
