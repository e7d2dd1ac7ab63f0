#!/usr/bin/env bash
# Runs bench/dataset-workers.ts against a private PostgreSQL cluster and the local object-store fake
# (ports JP_BENCH_PG_PORT, JP_BENCH_S3_PORT, JP_BENCH_SMTP_PORT), then stops them.
source "$(dirname "$0")/../scripts/lib.sh"
ensure_deps
stop_all_on_exit
PG_PORT="${JP_BENCH_PG_PORT:-54349}"
pg_start_cluster "${JP_BENCH_CLUSTER:-postgres-bench}" "$PG_PORT"
pg_recreate_db jointproof_bench
export DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/jointproof_bench"
node_modules/.bin/tsx scripts/migrate.ts
export S3_PORT="${JP_BENCH_S3_PORT:-54350}" SMTP_PORT="${JP_BENCH_SMTP_PORT:-54351}"
export JP_FAKES_DIR="$ROOT/.data/bench/fakes-$S3_PORT" MAIL_FAKE_DIR="$ROOT/.data/bench/fakes-$S3_PORT/mail"
rm -rf "$JP_FAKES_DIR"
start_fakes
node --conditions=react-server --import tsx bench/dataset-workers.ts
