#!/usr/bin/env bash
# The progress and habits routes' timings (bench/progress.ts) and the drill library route's with 500
# drills (bench/library-route.ts) against the stack `npm test` starts:
# its own MariaDB and port, a fresh seeded database, the built app. Run by `npm run bench`.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"

prepare_test_machine
start_test_stack
cd "$ROOT"
node_modules/.bin/tsx bench/progress.ts
node_modules/.bin/tsx bench/library-route.ts
