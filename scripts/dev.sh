#!/usr/bin/env bash
# npm run dev: `next dev` on loopback with .env read by the same reader as npm start (Node's own
# dotenv parser, scripts/lib/env-file.mjs); variables already set win. Next's own .env loading then
# finds every variable set and changes nothing.
set -euo pipefail
# shellcheck source=lib/common.sh
source "$(dirname "${BASH_SOURCE[0]}")/lib/common.sh"
cd "$TRIBUTARY_ROOT"
require_node
load_env_file .env
exec "$TRIBUTARY_ROOT/node_modules/.bin/next" dev -H 127.0.0.1
