#!/usr/bin/env bash
# `npm test`: the same set-up as `npm start`, against a separate cluster and a fresh test
# database, then every check: type-check, lint, unit + integration tests, build, browser tests.
# Prints each runner's summary, then one closing line; exits non-zero on any failure.
source "$(dirname "$0")/lib.sh"

mkdir -p .data/test && rm -f .data/test/*.json
ensure_deps
load_secrets

stop_all_on_exit

if [ -n "${TEST_DATABASE_URL:-}" ]; then
  export DATABASE_URL="$TEST_DATABASE_URL"
  log "using TEST_DATABASE_URL from the environment"
else
  # Its own cluster and port: tests never touch the demo data of `npm start`.
  TEST_PG_PORT="${JP_TEST_PG_PORT:-54339}"
  pg_start_cluster "${JP_TEST_CLUSTER:-postgres-test}" "$TEST_PG_PORT"
  pg_recreate_db jointproof_test
  export DATABASE_URL="postgres://postgres@127.0.0.1:$TEST_PG_PORT/jointproof_test"
fi
node_modules/.bin/tsx scripts/migrate.ts

export S3_PORT="${JP_TEST_S3_PORT:-54340}"
export JP_FAKES_DIR="$ROOT/.data/test/fakes-$S3_PORT"
export SMTP_HOST=127.0.0.1 SMTP_PORT="${JP_TEST_SMTP_PORT:-54341}" MAIL_FAKE_DIR="$JP_FAKES_DIR/mail" JP_DEV_MAIL=1 MAIL_RETRY_DELAY_S=1
rm -rf "$JP_FAKES_DIR"
start_fakes
node --conditions=react-server --import tsx db/seed.ts >".data/test/seed-$S3_PORT.log"
export NODE_ENV=test

FAILED=()
step() {
  local name="$1"; shift
  log "── $name"
  if "$@"; then log "$name: ok"; else log "$name: FAILED"; FAILED+=("$name"); fi
}

# `npm test -- ARGS`: only the matching Vitest tests (unit/integration, or browser tests and
# security probes against the real server when an argument names tests/e2e or tests/security), after the same set-up.
if [ $# -gt 0 ]; then
  if printf '%s\n' "$@" | grep -qE 'e2e|tests/security'; then
    ensure_chromium
    NODE_ENV=production build_if_stale
    export JP_TEST_PORT="${JP_TEST_PORT:-3100}"
    node_modules/.bin/vitest run --config vitest.e2e.config.ts "$@"
  else
    node_modules/.bin/vitest run "$@"
  fi
  exit $?
fi

step "type-check" node_modules/.bin/tsc --noEmit --pretty false
step "lint" node_modules/.bin/eslint . --max-warnings=0
step "format" node_modules/.bin/prettier --check . --log-level warn
step "unit and integration tests" node_modules/.bin/vitest run --reporter=default --reporter=json --outputFile.json=.data/test/vitest.json

# Browser tests need the production build and Debian's Chromium.
ensure_chromium
if NODE_ENV=production build_if_stale; then
  export JP_TEST_PORT="${JP_TEST_PORT:-3100}"
  start_mail_worker .data/test/mail-worker.log
  # the mail-outage probe pauses this worker while it stops its own mail server
  export JP_SHARED_MAIL_WORKER_PID="${PIDS[-1]}"
  step "browser tests" node_modules/.bin/vitest run --config vitest.e2e.config.ts --reporter=default --reporter=json --outputFile.json=.data/test/e2e.json
else
  FAILED+=("build")
fi

node scripts/summary.mjs .data/test/vitest.json .data/test/e2e.json
if [ ${#FAILED[@]} -gt 0 ]; then
  log "FAILED: ${FAILED[*]}"
  exit 1
fi
log "all checks passed"
