#!/usr/bin/env bash
# Starts what the browser tests need: MariaDB, a fresh `tributary_e2e` database (migrated
# and seeded), the local fakes on the test ports, and the production build of the app on
# 127.0.0.1:3410. Playwright runs this as its webServer and stops it when the tests end.
set -euo pipefail
# shellcheck source=lib/common.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
cd "$TRIBUTARY_ROOT"

APP_PORT=3410
DB_NAME=tributary_e2e

# the e2e fakes keep their files apart from the demo's (the tests clear the mailbox)
export_loopback_stack "$APP_PORT" 3411 "$DB_NAME" "e2e-only-secret-not-for-production-000000" .data/e2e

say() { echo "[e2e-server] $*"; }

if (exec 3<>"/dev/tcp/127.0.0.1/${APP_PORT}") 2>/dev/null; then
  say "port ${APP_PORT} is already in use: stop whatever listens there (an earlier test server?) and run again." >&2
  exit 1
fi

bash scripts/db.sh start
# a clean database for every run: the tests create and deactivate users
bash scripts/db.sh drop-db "$DB_NAME" >/dev/null 2>&1 || true
bash scripts/db.sh create-db "$DB_NAME"
say "migrating and seeding ${DB_NAME}"
npx tsx db/migrate.ts
npx tsx db/seed.ts

if [ ! -f .next/BUILD_ID ]; then
  say "no production build found: building (about two minutes)"
  npx next build
fi

pids=()
cleanup() {
  for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done
  wait 2>/dev/null || true
}
trap cleanup EXIT
trap 'exit 143' TERM
trap 'exit 130' INT

rm -rf .data/e2e
if [ -f fakes/run.ts ]; then
  node_modules/.bin/tsx fakes/run.ts &
  pids+=($!)
else
  say "WARNING: fakes/run.ts not found; uploads and mail will not work in this run" >&2
fi

if [ -f scripts/worker.ts ]; then
  # the check worker and e-mail sender, as in the product
  node_modules/.bin/tsx scripts/worker.ts &
  pids+=($!)
fi

say "starting the app on ${APP_URL}"
node_modules/.bin/next start -H 127.0.0.1 -p "$APP_PORT" &
pids+=($!)
# returns when the app exits, or when a signal arrives (the trap then stops the fakes too)
wait "${pids[-1]}"
