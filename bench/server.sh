#!/usr/bin/env bash
# Runs bench/server-bench.ts against the production build (built when stale) served by `next start`
# on a private PostgreSQL cluster and the local fakes (ports JP_BENCH_PG_PORT, JP_BENCH_S3_PORT,
# JP_BENCH_SMTP_PORT, JP_BENCH_PORT), then stops them all. Called by bench/run.ts.
source "$(dirname "$0")/../scripts/lib.sh"
ensure_deps
load_secrets
ensure_chromium
stop_all_on_exit
PG_PORT="${JP_BENCH_PG_PORT:-54349}"
pg_start_cluster "${JP_BENCH_CLUSTER:-postgres-bench}" "$PG_PORT"
pg_recreate_db jointproof_bench
export DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/jointproof_bench"
node_modules/.bin/tsx scripts/migrate.ts
export S3_PORT="${JP_BENCH_S3_PORT:-54350}" SMTP_HOST=127.0.0.1 SMTP_PORT="${JP_BENCH_SMTP_PORT:-54351}"
export JP_FAKES_DIR="$ROOT/.data/bench/fakes-$S3_PORT" MAIL_FAKE_DIR="$ROOT/.data/bench/fakes-$S3_PORT/mail"
rm -rf "$JP_FAKES_DIR"
start_fakes
NODE_ENV=production build_if_stale
PORT="${JP_BENCH_PORT:-3190}"
export JP_BENCH_BASE_URL="http://127.0.0.1:$PORT"
mkdir -p "$ROOT/.data/bench"
NODE_ENV=production APP_URL="$JP_BENCH_BASE_URL" NEXTAUTH_URL="$JP_BENCH_BASE_URL" \
  node_modules/.bin/next start -H 127.0.0.1 -p "$PORT" >"$ROOT/.data/bench/server.log" 2>&1 &
PIDS+=($!)
wait_for_http "$JP_BENCH_BASE_URL/api/health" 60 || { cat "$ROOT/.data/bench/server.log" >&2; die "the server did not start"; }
node --conditions=react-server --import tsx bench/server-bench.ts
