#!/usr/bin/env bash
# Shared set-up steps for `npm start` and `npm test`: dependencies, a private
# PostgreSQL cluster from Debian's packages, migrations, seed and build.
# Sourced by scripts/start.sh and scripts/test.sh; every function is idempotent.

set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"

log() { printf '\033[1m[jointproof]\033[0m %s\n' "$*" >&2; }
die() { printf '\033[1;31m[jointproof]\033[0m %s\n' "$*" >&2; exit 1; }

is_root() { [ "$(id -u)" = "0" ]; }

APT_UPDATED=0
apt_install() {
  is_root || die "Missing system package(s): $*. Install them with: sudo apt-get install -y $*"
  command -v apt-get >/dev/null || die "Missing system package(s): $* (and no apt-get here to install them)."
  if [ "$APT_UPDATED" = 0 ]; then
    log "apt-get update"
    DEBIAN_FRONTEND=noninteractive apt-get update -qq >/dev/null
    APT_UPDATED=1
  fi
  log "apt-get install $*"
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "$@" >/dev/null
}

# npm dependencies: install when node_modules is missing or older than the lock file.
ensure_deps() {
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    log "installing npm dependencies (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

# PostgreSQL server binaries (initdb, pg_ctl, postgres) from Debian's packages.
find_pg_bin() {
  local d
  for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
    if [ -x "$d/initdb" ] && [ -x "$d/pg_ctl" ] && [ -x "$d/postgres" ]; then echo "$d"; return 0; fi
  done
  return 1
}

ensure_pg_bin() {
  PGBIN="$(find_pg_bin || true)"
  if [ -z "$PGBIN" ]; then
    apt_install postgresql
    PGBIN="$(find_pg_bin || true)"
    [ -n "$PGBIN" ] || die "PostgreSQL was installed but no server binaries were found under /usr/lib/postgresql."
  fi
  export PGBIN
}

# Run a PostgreSQL command as the user that owns the cluster (the server refuses to run as root).
as_pg() {
  if is_root; then runuser -u postgres -- "$@"; else "$@"; fi
}

# Choose the cluster's data root. Default: .data/<name> inside the checkout. As root the
# postgres user must be able to reach it; if a parent folder is closed to that user
# (a checkout under /root, say), fall back to /var/tmp keyed by the checkout's path.
pg_data_root() {
  local name="$1" root
  if [ -n "${JP_DATA_DIR:-}" ]; then root="$JP_DATA_DIR/$name"; else root="$ROOT/.data/$name"; fi
  mkdir -p "$root"
  if is_root; then
    id postgres >/dev/null 2>&1 || die "The postgres system user is missing; reinstall Debian's postgresql package."
    chown postgres: "$root"
    if ! runuser -u postgres -- test -w "$root"; then
      local key
      key="$(printf '%s' "$ROOT" | sha1sum | cut -c1-12)"
      root="/var/tmp/jointproof-$key/$name"
      mkdir -p "$root"
      chown -R postgres: "/var/tmp/jointproof-$key"
      log "the postgres user cannot reach the checkout; cluster data lives in $root"
    fi
  fi
  echo "$root"
}

# Start (creating it first if needed) a private cluster on 127.0.0.1:<port>.
# Sets PG_ROOT for pg_stop_cluster.
pg_start_cluster() {
  local name="$1" port="$2"
  ensure_pg_bin
  PG_ROOT="$(pg_data_root "$name")"
  export PG_ROOT PG_PORT="$port"
  if [ ! -f "$PG_ROOT/pg/PG_VERSION" ]; then
    log "creating PostgreSQL cluster in $PG_ROOT"
    mkdir -p "$PG_ROOT/pg" "$PG_ROOT/run"
    is_root && chown -R postgres: "$PG_ROOT"
    chmod 700 "$PG_ROOT/pg"
    # Trust authentication is acceptable only because the cluster listens on 127.0.0.1 alone.
    as_pg "$PGBIN/initdb" -D "$PG_ROOT/pg" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >"$PG_ROOT/initdb.log" 2>&1 \
      || die "initdb failed; see $PG_ROOT/initdb.log"
  fi
  mkdir -p "$PG_ROOT/run"; is_root && chown postgres: "$PG_ROOT/run"
  if as_pg "$PGBIN/pg_ctl" -D "$PG_ROOT/pg" status >/dev/null 2>&1; then
    log "PostgreSQL already running on 127.0.0.1:$port"
    PG_STARTED_HERE=0
  else
    as_pg "$PGBIN/pg_ctl" -D "$PG_ROOT/pg" -l "$PG_ROOT/pg.log" -w -t 30 \
      -o "-c listen_addresses=127.0.0.1 -p $port -c unix_socket_directories=$PG_ROOT/run" start >/dev/null \
      || die "PostgreSQL did not start; see $PG_ROOT/pg.log"
    PG_STARTED_HERE=1
    log "PostgreSQL started on 127.0.0.1:$port"
  fi
  export PG_STARTED_HERE
}

pg_stop_cluster() {
  if [ -n "${PG_ROOT:-}" ] && [ "${PG_STARTED_HERE:-0}" = 1 ]; then
    as_pg "$PGBIN/pg_ctl" -D "$PG_ROOT/pg" -m fast -w stop >/dev/null 2>&1 && log "PostgreSQL stopped" || true
    PG_STARTED_HERE=0
  fi
}

# Create the database when missing (template0, UTF8).
pg_ensure_db() {
  local db="$1"
  local exists
  exists="$("$PGBIN/psql" -h 127.0.0.1 -p "$PG_PORT" -U postgres -tAc "SELECT 1 FROM pg_database WHERE datname = '$db'")"
  if [ "$exists" != 1 ]; then
    "$PGBIN/createdb" -h 127.0.0.1 -p "$PG_PORT" -U postgres "$db"
    log "created database $db"
  fi
}

pg_recreate_db() {
  local db="$1"
  "$PGBIN/dropdb" --if-exists --force -h 127.0.0.1 -p "$PG_PORT" -U postgres "$db"
  "$PGBIN/createdb" -h 127.0.0.1 -p "$PG_PORT" -U postgres "$db"
  log "created a fresh database $db"
}

# Build with `next build` when any source is newer than the last build.
# One build at a time per checkout: a second run (npm start beside npm test, two benches) waits for
# the first one's build and then finds it up to date, instead of failing on "another next build is
# running". The lock is this checkout's own, so runs in other clones do not wait for each other.
build_if_stale() {
  mkdir -p "$ROOT/.data"
  local lock rc=0
  exec {lock}>"$ROOT/.data/build.lock"
  flock "$lock"
  build_if_stale_unlocked || rc=$?
  exec {lock}>&-
  return $rc
}

build_if_stale_unlocked() {
  local stamp=".next/BUILD_ID"
  if [ -f "$stamp" ] && [ -z "$(find app components lib kinematics db public next.config.ts postcss.config.mjs package-lock.json tsconfig.json instrumentation.ts \
        -newer "$stamp" -type f -print -quit 2>/dev/null)" ]; then
    log "build is up to date"
    return 0
  fi
  log "building (next build)"
  NEXT_TELEMETRY_DISABLED=1 node_modules/.bin/next build >"$ROOT/.data/build.log" 2>&1 || { tail -40 "$ROOT/.data/build.log" >&2; die "next build failed; see .data/build.log"; }
  log "build done"
}

ensure_chromium() {
  if [ -n "${CHROMIUM_PATH:-}" ] && [ -x "$CHROMIUM_PATH" ]; then return 0; fi
  if ! command -v chromium >/dev/null; then apt_install chromium; fi
  CHROMIUM_PATH="$(command -v chromium)"
  export CHROMIUM_PATH
}

# Session-signing secret for local use: made once, kept under .data/ (git-ignored),
# so sessions survive a restart. Production sets NEXTAUTH_SECRET itself.
load_secrets() {
  mkdir -p "$ROOT/.data"
  if [ -z "${NEXTAUTH_SECRET:-}" ]; then
    if [ ! -s "$ROOT/.data/secret" ]; then
      node -e 'process.stdout.write(require("crypto").randomBytes(32).toString("base64url"))' >"$ROOT/.data/secret"
      chmod 600 "$ROOT/.data/secret"
    fi
    NEXTAUTH_SECRET="$(cat "$ROOT/.data/secret")"
    export NEXTAUTH_SECRET
  fi
}

# Wait until URL answers (any HTTP status below 500), up to N seconds.
wait_for_http() {
  local url="$1" n="${2:-60}" i
  for ((i = 0; i < n * 4; i++)); do
    if node -e 'fetch(process.argv[1]).then(r=>process.exit(r.status<500?0:1),()=>process.exit(1))' "$url" 2>/dev/null; then return 0; fi
    sleep 0.25
  done
  return 1
}

# The local fakes of the object-storage and mail services, in the background.
# Appends the process to PIDS; waits for its "fakes ready" line.
start_fakes() {
  mkdir -p "$JP_FAKES_DIR"
  local logf="$ROOT/.data/fakes-$S3_PORT.log"
  : >"$logf"
  node --import tsx scripts/fakes/start.ts >"$logf" 2>&1 &
  PIDS+=($!)
  wait_ready "$logf" "fakes ready" "local service fakes (S3 on 127.0.0.1:$S3_PORT, SMTP on 127.0.0.1:${SMTP_PORT:-none})"
}

# Waits up to 30 s for READY-TEXT in LOGFILE from the newest process in PIDS; dies with the log
# when it exits first or never says it. wait_ready LOGFILE READY-TEXT NAME
wait_ready() {
  local logf="$1" ready="$2" name="$3" i
  for ((i = 0; i < 120; i++)); do
    grep -q "$ready" "$logf" && { log "$name ready"; return 0; }
    kill -0 "${PIDS[-1]}" 2>/dev/null || break
    sleep 0.25
  done
  cat "$logf" >&2
  die "the $name did not start"
}

# The mail worker (lib/server/mail/run-worker.ts) in the background: it sends queued messages with
# retry. `react-server` lets `import "server-only"` load outside Next (an empty marker module).
start_mail_worker() { start_worker lib/server/mail/run-worker.ts "worker ready" "mail worker" "$1"; }

# A background worker process (a TypeScript entry run with the react-server condition): waits for
# its ready line, appends it to PIDS. start_worker ENTRY READY-TEXT NAME LOGFILE [NICE]
# NICE (default 0) lowers the process's scheduling priority (nice(1)), so that background work
# leaves the cores to the web server's request thread first.
start_worker() {
  local entry="$1" ready="$2" name="$3" logf="$4" niceness="${5:-0}"
  : >"$logf"
  nice -n "$niceness" node --conditions=react-server --import tsx "$entry" >"$logf" 2>&1 &
  PIDS+=($!)
  wait_ready "$logf" "$ready" "$name"
}

# On exit, Ctrl-C or TERM: stop the background processes in PIDS and the cluster, then log
# MESSAGE if one is given. Starts PIDS empty. stop_all_on_exit [MESSAGE]
stop_all_on_exit() {
  PIDS=()
  EXIT_MESSAGE="${1:-}"
  trap stop_all EXIT
  trap 'exit 130' INT TERM
}
stop_all() {
  trap - EXIT INT TERM
  stop_pids
  pg_stop_cluster
  if [ -n "$EXIT_MESSAGE" ]; then log "$EXIT_MESSAGE"; fi
}

# Stop the background processes in PIDS: SIGTERM, up to 5 s to exit, then SIGKILL.
stop_pids() {
  local pid i
  for pid in "${PIDS[@]}"; do kill "$pid" 2>/dev/null || true; done
  for ((i = 0; i < 20; i++)); do
    local alive=0
    for pid in "${PIDS[@]}"; do kill -0 "$pid" 2>/dev/null && alive=1; done
    [ "$alive" = 0 ] && break
    sleep 0.25
  done
  for pid in "${PIDS[@]}"; do kill -9 "$pid" 2>/dev/null || true; done
  for pid in "${PIDS[@]}"; do wait "$pid" 2>/dev/null || true; done
  PIDS=()
}

# The dataset audit workers (lib/server/datasets/run-workers.ts, DATASET_WORKERS processes) in the
# background, at nice 10 like the check pool's threads: they take audit batches from the job queue in
# PostgreSQL. Appends to PIDS.
start_dataset_workers() { start_worker lib/server/datasets/run-workers.ts "workers ready" "dataset workers" "$1" 10; }
