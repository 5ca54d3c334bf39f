#!/usr/bin/env bash
# `npm run bench:browser`: the practice page's key-highlight latency and JavaScript size, measured
# in Debian's chromium against the same stack `npm test` starts (own MariaDB, fresh seeded database).
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"

prepare_test_machine
start_test_stack
cd "$ROOT"
node_modules/.bin/tsx bench/latency.ts
node_modules/.bin/tsx bench/settings-latency.ts
