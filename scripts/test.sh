#!/usr/bin/env bash
# `npm test`: the whole suite on a fresh machine. Installs what is missing, checks lint and types,
# starts a MariaDB of its own (separate data folder and port, so it runs beside `npm start`),
# builds and serves the app against a fresh test database, then runs every vitest project.
# Extra arguments go to vitest: `npm test -- tests/api/auth.test.ts`.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"

prepare_test_machine

cd "$ROOT"
log "lint"
node_modules/.bin/eslint .
log "typecheck"
npm run -s typecheck

# Every test comes from 127.0.0.1 and many play as one demo student: the per-address and per-student limits
# are raised so tests do not trip over each other; tests/api/limits.test.ts fills the shared counters itself.
export NUXT_LIMITS_SIGN_IN_FAILURES_PER_IP=1000 NUXT_LIMITS_SIGN_UPS_PER_IP_PER_HOUR=1000 NUXT_LIMITS_ATTEMPTS_PER_STUDENT_PER_MINUTE=1000 NUXT_LIMITS_FORGOT_PER_IP_PER_HOUR=1000
start_test_stack

log "vitest"
node_modules/.bin/vitest run "$@"
