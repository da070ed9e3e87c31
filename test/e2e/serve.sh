#!/usr/bin/env bash
# Serves the app for the browser tests: a fresh embedded database under var/e2e-PORT seeded
# with the demo town, a fresh build, then `npm start` on the given port.
set -euo pipefail
cd "$(dirname "$0")/../.."
port="${1:-3100}"
export NEXT_TELEMETRY_DISABLED=1 CHECKPOINT_DISABLE=1
# One folder per port, so that two test runs on one machine never share a database.
dir="var/e2e-$port"
# The default port builds into .next as usual; other ports (parallel runs) into their own folder.
if [ "$port" != "3100" ]; then export BEAMGATE_DIST_DIR=".next-e2e-$port"; fi
export BEAMGATE_DATA_DIR="$PWD/$dir/pglite"
unset DATABASE_URL
rm -rf "$dir"
mkdir -p "$dir"
npx tsx lib/db/cli/setup.ts --demo > "$dir/setup.log"
if [ -z "${BEAMGATE_E2E_SKIP_BUILD:-}" ]; then npx next build > "$dir/build.log" 2>&1 || { cat "$dir/build.log"; exit 1; }; fi
PORT="$port" exec npx tsx lib/db/cli/start.ts
