#!/usr/bin/env bash
# `npm start`: set everything up on this machine and serve Jointproof on http://127.0.0.1:3000.
# Idempotent: a second run keeps every saved row. Ctrl-C stops the server, the fakes and the cluster.
source "$(dirname "$0")/lib.sh"

APP_PORT="${PORT:-3000}"
mkdir -p .data

ensure_deps
load_secrets

stop_all_on_exit "stopped"

if [ -z "${DATABASE_URL:-}" ]; then
  pg_start_cluster postgres 54329
  pg_ensure_db jointproof
  export DATABASE_URL="postgres://postgres@127.0.0.1:54329/jointproof"
else
  log "using DATABASE_URL from the environment"
fi

node_modules/.bin/tsx scripts/migrate.ts

export S3_PORT="${S3_PORT:-54330}" JP_FAKES_DIR="${JP_FAKES_DIR:-$ROOT/.data/fakes}"
# Mail goes to the local SMTP fake unless SMTP_HOST names a real server; /dev/mail lists it.
if [ -z "${SMTP_HOST:-}" ]; then
  export SMTP_HOST=127.0.0.1 SMTP_PORT="${SMTP_PORT:-54331}" MAIL_FAKE_DIR="$JP_FAKES_DIR/mail" JP_DEV_MAIL=1
fi
start_fakes

# The seed stores the demo recording through the S3 API, so it runs once the fakes are up.
node --conditions=react-server --import tsx db/seed.ts | tee .data/signins.txt

build_if_stale

export NODE_ENV=production APP_URL="${APP_URL:-http://127.0.0.1:$APP_PORT}" NEXTAUTH_URL="${NEXTAUTH_URL:-http://127.0.0.1:$APP_PORT}"
node_modules/.bin/next start -H 127.0.0.1 -p "$APP_PORT" >.data/server.log 2>&1 &
SERVER_PID=$!
PIDS+=("$SERVER_PID")
start_mail_worker .data/mail-worker.log
start_dataset_workers .data/dataset-workers.log
wait_for_http "http://127.0.0.1:$APP_PORT/api/health" 60 || { tail -30 .data/server.log >&2; die "the web server did not come up; see .data/server.log"; }

log "Jointproof is running at http://127.0.0.1:$APP_PORT  (Ctrl-C stops it)"
if grep -q ' / ' .data/signins.txt 2>/dev/null; then
  log "demo sign-ins (e-mail / password):"
  grep ' / ' .data/signins.txt >&2
fi
log "server log: .data/server.log"
wait "$SERVER_PID"
