#!/usr/bin/env bash
# npm test: installs what is missing, then runs every suite and closes with `N passed, N failed`.
#   0. lint (`npm run lint`: ESLint and `prettier --check`) and typecheck (`tsc --noEmit`), each
#      counted as one failed suite when it fails; the tests run either way
#   1. vitest, projects "unit" and "integration" (its own database on the project's MariaDB)
#   2. next build (skipped when nothing the app is built from changed since the last build)
#   3. Playwright end-to-end in Debian's Chromium (playwright.config.ts starts its own server)
# Reports: .data/test-results/. Exit code non-zero when any test failed or any suite crashed.
set -uo pipefail
# shellcheck source=lib/common.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
cd "$TRIBUTARY_ROOT"

# whatever stops the run before the totals, the last line is still the totals line
totals_printed=0
trap '(( totals_printed )) || { echo "the test run stopped before any suite finished (see above)"; echo "0 passed, 1 failed"; }' EXIT

require_node
ensure_apt_packages mariadb-server chromium r-base-core r-cran-car r-cran-data.table r-cran-leaps haproxy
ensure_node_modules
bash scripts/db.sh start || die "MariaDB did not start (see above)."

OUT="$TRIBUTARY_ROOT/.data/test-results"
mkdir -p "$OUT"
SUITES="$OUT/suites.tsv"
: > "$SUITES"
rm -f "$OUT/vitest.json" "$OUT/playwright.json"
export CI="${CI:-}"
BIN="$TRIBUTARY_ROOT/node_modules/.bin"

record() { printf '%s\t%s\t%s\t%s\n' "$1" "$2" "$3" "${4:-}" >> "$SUITES"; }

# ---- 0. lint and typecheck: recorded steps, so that their failure shows in the totals
say "lint: ESLint and Prettier (npm run lint)"
npm run --silent lint </dev/null
record step "lint (ESLint, prettier --check)" "$?"
say "typecheck (tsc --noEmit)"
"$BIN/tsc" --noEmit </dev/null
record step "typecheck (tsc --noEmit)" "$?"

# ---- 1. vitest (unit + integration)
say "vitest: unit and integration"
"$BIN/vitest" run --reporter=default --reporter=json "--outputFile.json=$OUT/vitest.json" </dev/null
record vitest "vitest (unit + integration)" "$?" "$OUT/vitest.json"

# ---- 2. next build, when the sources changed
# the build and the browser run hold the lock `npm run load` takes too: neither replaces .next
# under the other (the lock ends with this script)
exec 9>/tmp/tributary-e2e.lock
flock -w 1800 9 || warn "waited 30 minutes for /tmp/tributary-e2e.lock (a load run?); going on without it"
build_ok=1
ensure_build
code=$?
[[ $BUILD_RAN -eq 1 ]] && record step "next build" "$code"
[[ $code -eq 0 ]] || build_ok=0

# ---- 3. Playwright
if [[ ! -f playwright.config.ts ]]; then
  warn "playwright.config.ts does not exist yet: end-to-end tests skipped"
elif [[ $build_ok -eq 0 ]]; then
  record not-run "playwright (the build failed)" 1
else
  # the webServer of playwright.config.ts (scripts/e2e-server.sh) prepares tributary_e2e and the fakes
  say "Playwright: end-to-end"
  PLAYWRIGHT_JSON_OUTPUT_NAME="$OUT/playwright.json" "$BIN/playwright" test --reporter=list,json </dev/null
  record playwright "playwright (e2e)" "$?" "$OUT/playwright.json"
fi

# ---- totals: the last line is `N passed, N failed`
summary="$("$BIN/tsx" scripts/totals.ts "$SUITES" 2>&1)"
code=$?
printf '%s\n' "$summary"
if [[ "$(tail -n 1 <<<"$summary")" =~ ^[0-9]+\ passed,\ [0-9]+\ failed ]]; then
  totals_printed=1
  exit $code
fi
exit 1
