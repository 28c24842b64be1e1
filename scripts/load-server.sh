#!/usr/bin/env bash
# The private stack of `npm run load` (scripts/load.ts starts it and stops it with SIGTERM):
# MariaDB (started when not running), a fresh `tributary_load` database (migrated, seeded, and
# the load accounts of scripts/load/setup.ts), the fakes on 3421–3423, the production build of
# the app on 127.0.0.1:3420 and one worker, as `npm start` runs them. Prints
# "[load-server] ready" when everything answers; on exit stops what it started and drops the
# database. Logs: .data/load/logs/.
#
# It holds /tmp/tributary-e2e.lock (the lock taken around `next build` and Playwright) for the
# whole run, so no build replaces .next under the running app and no browser run competes with
# the measurement.
set -uo pipefail
# shellcheck source=lib/common.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
cd "$TRIBUTARY_ROOT"

APP_PORT=3420
DB_NAME=tributary_load
LOAD_DIR="$TRIBUTARY_ROOT/.data/load"
LOG_DIR="$LOAD_DIR/logs"
ACCOUNTS="${LOAD_ACCOUNTS_FILE:-$LOAD_DIR/accounts.json}"
LOCK="${LOAD_LOCK_FILE:-/tmp/tributary-e2e.lock}"
BIN="$TRIBUTARY_ROOT/node_modules/.bin"

export_loopback_stack "$APP_PORT" 3421 "$DB_NAME" "load-only-secret-not-for-production-00000" "$LOAD_DIR"
export MAX_UPLOAD_MB="${MAX_UPLOAD_MB:-200}"

say() { echo "[load-server] $*"; }
fail() { echo "[load-server] error: $*" >&2; exit 1; }

for p in "$APP_PORT" 3421 3422 3423; do
  port_open "$p" && fail "port $p is already in use: stop whatever listens there (an earlier load run?) and run again."
done

groups=()
db_owned=0
db_created=0
cleanup() {
  trap '' INT TERM
  local g i
  for g in "${groups[@]}"; do kill -TERM -- "-$g" 2>/dev/null; done
  for ((i = 0; i < 100; i++)); do
    local any=0
    for g in "${groups[@]}"; do kill -0 -- "-$g" 2>/dev/null && any=1; done
    (( any == 0 )) && break
    sleep 0.1
  done
  for g in "${groups[@]}"; do kill -KILL -- "-$g" 2>/dev/null; done
  (( db_created )) && bash scripts/db.sh drop-db "$DB_NAME" >/dev/null 2>&1 && say "dropped database $DB_NAME"
  (( db_owned )) && bash scripts/db.sh stop
  rm -rf "$LOAD_DIR/uploads" "$LOAD_DIR/mail" "$ACCOUNTS"
  say "stopped"
}
trap cleanup EXIT
trap 'exit 143' TERM
trap 'exit 130' INT

mkdir -p "$LOG_DIR"
exec 9>"$LOCK"
if ! flock -n 9; then
  say "waiting for $LOCK (a next build or a browser test run holds it)"
  flock -w "${LOAD_LOCK_WAIT:-900}" 9 || fail "$LOCK stayed locked for ${LOAD_LOCK_WAIT:-900} s; run again when the build or test run is over."
fi

# start NAME CMD...: own process group, output to the log; the lock descriptor is not inherited
start_part() {
  local name="$1"; shift
  : > "$LOG_DIR/$name.log"
  setsid "$@" >>"$LOG_DIR/$name.log" 2>&1 </dev/null 9>&- &
  groups+=("$!")
}

bash scripts/db.sh status >/dev/null 2>&1 || db_owned=1
# (fd 9 closed: a mariadbd started here must not hold the lock)
bash scripts/db.sh start >/dev/null 9>&- || fail "MariaDB did not start (bash scripts/db.sh start)."
bash scripts/db.sh drop-db "$DB_NAME" >/dev/null 2>&1 || true
bash scripts/db.sh create-db "$DB_NAME" >/dev/null || fail "could not create database $DB_NAME."
db_created=1
"$BIN/tsx" db/migrate.ts >"$LOG_DIR/setup.log" 2>&1 || { cat "$LOG_DIR/setup.log" >&2; fail "migrations failed."; }
"$BIN/tsx" db/seed.ts >>"$LOG_DIR/setup.log" 2>&1 || { cat "$LOG_DIR/setup.log" >&2; fail "the seed failed."; }
"$BIN/tsx" --conditions=react-server scripts/load/setup.ts "$ACCOUNTS" "$@" >>"$LOG_DIR/setup.log" 2>&1 \
  || { cat "$LOG_DIR/setup.log" >&2; fail "the load accounts could not be made."; }
say "database $DB_NAME migrated, seeded, load accounts made"

ensure_build 9>&- || fail "next build failed (see above)."

rm -rf "$LOAD_DIR/uploads" "$LOAD_DIR/mail"
start_part fakes "$BIN/tsx" fakes/run.ts
for ((i = 0; i < 120; i++)); do
  grep -q "fakes ready" "$LOG_DIR/fakes.log" 2>/dev/null && break
  kill -0 "${groups[-1]}" 2>/dev/null || { tail -n 20 "$LOG_DIR/fakes.log" >&2; fail "the fakes stopped during start-up."; }
  sleep 0.5
done
grep -q "fakes ready" "$LOG_DIR/fakes.log" || fail "the fakes did not report ready within 60 s ($LOG_DIR/fakes.log)."

NODE_OPTIONS="${NODE_OPTIONS:-} --import $TRIBUTARY_ROOT/scripts/load/loop-monitor.mjs" start_part app "$BIN/next" start -H 127.0.0.1 -p "$APP_PORT"
for ((i = 0; i < 240; i++)); do
  port_open "$APP_PORT" && break
  kill -0 "${groups[-1]}" 2>/dev/null || { tail -n 30 "$LOG_DIR/app.log" >&2; fail "the app stopped during start-up."; }
  sleep 0.5
done
port_open "$APP_PORT" || fail "the app did not listen on port $APP_PORT within 2 minutes ($LOG_DIR/app.log)."

# one worker, as npm start runs it
start_part worker "$BIN/tsx" scripts/worker.ts

say "ready $APP_URL accounts=$ACCOUNTS"
while :; do
  wait -n "${groups[@]}"
  for g in "${groups[@]}"; do
    kill -0 "$g" 2>/dev/null || fail "a part of the stack stopped (process group $g); logs in $LOG_DIR"
  done
done
