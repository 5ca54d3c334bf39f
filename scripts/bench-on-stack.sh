#!/usr/bin/env bash
# Runs the bench files it is given, one after another, against the stack `npm test` starts: its own
# MariaDB and port, a fresh seeded database, the built app. `npm run bench` gives it the progress
# and drill library routes' timings, `npm run bench:browser` the measurements in Debian's chromium.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"

[[ $# -gt 0 ]] || die "usage: bench-on-stack.sh bench/FILE.ts…"
prepare_test_machine
start_test_stack
cd "$ROOT"
for file in "$@"; do
  node_modules/.bin/tsx "$file"
done
