#!/usr/bin/env bash
# npm test: installs what is missing, then runs every suite and closes with `N passed, N failed`.
#   1. vitest, projects "unit" and "integration" (its own database on the project's MariaDB)
#   2. next build (skipped when nothing the app is built from changed since the last build)
#   3. Playwright end-to-end in Debian's Chromium (playwright.config.ts starts its own server)
# Reports: .data/test-results/. Exit code non-zero when any test failed or any suite crashed.
set -uo pipefail
# shellcheck source=lib/common.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
cd "$TRIBUTARY_ROOT"

require_node
ensure_apt_packages mariadb-server chromium r-base-core r-cran-car r-cran-data.table
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

# ---- 1. vitest (unit + integration)
say "vitest: unit and integration"
"$BIN/vitest" run --reporter=default --reporter=json "--outputFile.json=$OUT/vitest.json" </dev/null
record vitest "vitest (unit + integration)" "$?" "$OUT/vitest.json"

# ---- 2. next build, when the sources changed
build_fingerprint() {
  if git rev-parse --is-inside-work-tree >/dev/null 2>&1; then
    {
      git ls-files -co --exclude-standard -- . ':!tests' ':!*.md' ':!scripts' ':!.ci' ':!playwright.config.ts' \
        | sort | while IFS= read -r f; do [[ -f "$f" ]] && stat -c '%n %s %Y' -- "$f"; done
      stat -c '%n %s %Y' node_modules/.package-lock.json 2>/dev/null
    } | sha256sum | cut -d' ' -f1
  else
    date +%s%N  # no git: always build
  fi
}
FINGERPRINT_FILE=".next/.tributary-fingerprint"
fingerprint="$(build_fingerprint)"
build_ok=1
if [[ -f .next/BUILD_ID && -f "$FINGERPRINT_FILE" && "$(cat "$FINGERPRINT_FILE")" == "$fingerprint" ]]; then
  note "next build: up to date, skipped"
else
  say "next build"
  rm -f "$FINGERPRINT_FILE"
  "$BIN/next" build </dev/null
  code=$?
  record step "next build" "$code"
  if [[ $code -eq 0 ]]; then echo "$fingerprint" > "$FINGERPRINT_FILE"; else build_ok=0; fi
fi

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
"$BIN/tsx" scripts/totals.ts "$SUITES"
