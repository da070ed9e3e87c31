#!/usr/bin/env bash
# Serves the app for the browser tests: a fresh embedded database under var/e2e seeded
# with the demo town, a fresh build, then `npm start` on the given port.
set -euo pipefail
cd "$(dirname "$0")/../.."
port="${1:-3100}"
export NEXT_TELEMETRY_DISABLED=1 CHECKPOINT_DISABLE=1
export BEAMGATE_DATA_DIR="$PWD/var/e2e/pglite"
unset DATABASE_URL
rm -rf var/e2e
mkdir -p var/e2e
npx tsx lib/db/cli/setup.ts --demo > var/e2e/setup.log
if [ -z "${BEAMGATE_E2E_SKIP_BUILD:-}" ]; then npx next build > var/e2e/build.log 2>&1 || { cat var/e2e/build.log; exit 1; }; fi
PORT="$port" exec npx tsx lib/db/cli/start.ts
