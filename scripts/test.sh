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

start_test_stack

log "vitest"
node_modules/.bin/vitest run "$@"
