#!/usr/bin/env bash
# npm start: installs what is missing, then starts MariaDB, the demo database (migrated and
# seeded), the local fakes, the production build of the app and the worker; prints the URL and
# the demo sign-ins; Ctrl-C stops everything it started. Logs: .data/logs/.
set -uo pipefail
# shellcheck source=lib/common.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
cd "$TRIBUTARY_ROOT"

RUN_DIR="$TRIBUTARY_ROOT/.data/run"
LOG_DIR="$TRIBUTARY_ROOT/.data/logs"
PIDS_FILE="$RUN_DIR/start.pids"
BIN="$TRIBUTARY_ROOT/node_modules/.bin"
mkdir -p "$RUN_DIR" "$LOG_DIR"

require_node
ensure_apt_packages mariadb-server
ensure_node_modules

if [[ ! -f .env ]]; then
  cp .env.example .env
  say "created .env from .env.example (demo settings)"
fi
load_env_file .env
export NODE_ENV=production

app_port=3400
[[ "${APP_URL:-}" =~ ^https?://[^/:]+:([0-9]+) ]] && app_port="${BASH_REMATCH[1]}"
db_name="${DATABASE_URL##*/}"
db_name="${db_name%%\?*}"

# ---- processes of an earlier run that was killed hard (their group ids, in our checkout only)
group_alive() { kill -0 -- "-$1" 2>/dev/null; }
stop_groups() {
  local g i
  for g in "$@"; do group_alive "$g" && kill -TERM -- "-$g" 2>/dev/null; done
  # 15 s: a worker given TERM may take its grace period (10 s) to hand its job back
  for ((i = 0; i < 150; i++)); do
    local any=0
    for g in "$@"; do group_alive "$g" && any=1; done
    (( any == 0 )) && return 0
    sleep 0.1
  done
  for g in "$@"; do group_alive "$g" && kill -KILL -- "-$g" 2>/dev/null; done
  return 0
}
# MariaDB is stopped at the end only when this run (or a hard-killed earlier one) started it,
# so a server that tests or another tool were using is left as it was found
db_owned=0
db_touched=0
if [[ -f "$PIDS_FILE" ]]; then
  stale=()
  while read -r name pgid; do
    [[ "$name" == mariadb && "$pgid" == owned ]] && db_owned=1
    [[ "$pgid" =~ ^[0-9]+$ ]] || continue
    # only a process started here: same checkout as working directory
    if group_alive "$pgid" && [[ "$(readlink "/proc/$pgid/cwd" 2>/dev/null)" == "$TRIBUTARY_ROOT" ]]; then
      note "stopping $name left from an earlier run (process group $pgid)"
      stale+=("$pgid")
    fi
  done < "$PIDS_FILE"
  (( ${#stale[@]} )) && stop_groups "${stale[@]}"
  rm -f "$PIDS_FILE"
fi

if port_open "$app_port"; then
  die "port $app_port is already in use by another program; stop it (or change APP_URL and NEXTAUTH_URL in .env)."
fi

# ---- stop everything on Ctrl-C, on TERM, and when any part exits
groups=()
names=()
tailer=""
cleaned=0
cleanup() {
  (( cleaned )) && return
  cleaned=1
  trap '' INT TERM
  echo
  say "stopping Tributary"
  (( ${#groups[@]} )) && stop_groups "${groups[@]}"
  [[ -n "$tailer" ]] && kill "$tailer" 2>/dev/null
  rm -f "$PIDS_FILE"
  if (( db_owned )); then
    bash scripts/db.sh stop
  elif (( db_touched )); then
    note "MariaDB was already running before npm start: left running (bash scripts/db.sh stop stops it)"
  fi
}
trap cleanup EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

# start NAME LOGFILE CMD...: own process group (setsid), output to the log file
start_part() {
  local name="$1" log="$2"
  shift 2
  : > "$log"
  setsid "$@" >>"$log" 2>&1 </dev/null &
  groups+=("$!")
  names+=("$name")
  echo "$name $!" >> "$PIDS_FILE"
}

# ---- database
db_touched=1
bash scripts/db.sh status >/dev/null 2>&1 || db_owned=1
(( db_owned )) && echo "mariadb owned" >> "$PIDS_FILE"
bash scripts/db.sh start || die "MariaDB did not start (see above)."
bash scripts/db.sh create-db "$db_name" || die "could not create database $db_name."
"$BIN/tsx" db/migrate.ts || die "migrations failed (see above)."
"$BIN/tsx" db/seed.ts || die "the demo seed failed (see above)."

# ---- fakes of the upload service and of SMTP
if [[ -f fakes/run.ts ]]; then
  say "starting the local fakes (upload service, SMTP and mailbox)"
  start_part fakes "$LOG_DIR/fakes.log" "$BIN/tsx" fakes/run.ts
  fakes_pid="${groups[-1]}"
  for ((i = 0; i < 120; i++)); do
    grep -q "fakes ready" "$LOG_DIR/fakes.log" 2>/dev/null && break
    if ! kill -0 "$fakes_pid" 2>/dev/null; then
      tail -n 20 "$LOG_DIR/fakes.log" >&2
      die "the fakes stopped during start-up (log above, $LOG_DIR/fakes.log)."
    fi
    sleep 0.5
  done
  grep -q "fakes ready" "$LOG_DIR/fakes.log" || die "the fakes did not report ready within 60 s ($LOG_DIR/fakes.log)."
  note "$(grep -m1 "fakes ready" "$LOG_DIR/fakes.log")"
else
  warn "fakes/run.ts is missing: uploads and e-mail will not work in this run."
fi

# ---- the app, built for production
ensure_build || die "next build failed (see above)."
say "starting the app on http://127.0.0.1:$app_port"
start_part app "$LOG_DIR/app.log" "$BIN/next" start -H 127.0.0.1 -p "$app_port"
app_pid="${groups[-1]}"
for ((i = 0; i < 240; i++)); do
  port_open "$app_port" && break
  if ! kill -0 "$app_pid" 2>/dev/null; then
    tail -n 30 "$LOG_DIR/app.log" >&2
    die "the app stopped during start-up (log above, $LOG_DIR/app.log)."
  fi
  sleep 0.5
done
port_open "$app_port" || die "the app did not listen on port $app_port within 2 minutes ($LOG_DIR/app.log)."

# ---- the worker (check queue and e-mail outbox)
if [[ -f scripts/worker.ts ]]; then
  say "starting the worker"
  start_part worker "$LOG_DIR/worker.log" "$BIN/tsx" scripts/worker.ts
else
  warn "scripts/worker.ts is missing: uploaded batches will not be checked in this run."
fi

# ---- the demo batch files, sent through the upload service and the check queue (once; idempotent)
if [[ -f scripts/demo-batches.ts ]]; then
  "$BIN/tsx" scripts/demo-batches.ts || warn "the demo batches could not be sent (see above); the app runs without them."
fi

url="${APP_URL:-http://127.0.0.1:$app_port}"
echo
say "Tributary is running: $url"
[[ -n "${MAILBOX_URL:-}" ]] && note "demo mailbox (every e-mail sent): ${MAILBOX_URL}/messages"
echo
"$BIN/tsx" scripts/lib/sign-ins.ts
echo
note "logs: $LOG_DIR/{app,worker,fakes,mariadb}.log — press Ctrl-C to stop everything"
echo

# show the parts' logs as they come; stop when any part exits
tail --pid=$$ -n 0 -F "$LOG_DIR/app.log" "$LOG_DIR/worker.log" "$LOG_DIR/fakes.log" 2>/dev/null &
tailer=$!
while :; do
  wait -n "${groups[@]}"
  for idx in "${!groups[@]}"; do
    if ! kill -0 "${groups[$idx]}" 2>/dev/null; then
      warn "${names[$idx]} stopped (log: $LOG_DIR/${names[$idx]}.log); stopping the rest"
      exit 1
    fi
  done
done
