#!/usr/bin/env bash
# `npm test`: the whole suite on a fresh machine. Installs what is missing, checks lint and types,
# starts a MariaDB of its own (separate data folder and port, so it runs beside `npm start`),
# builds and serves the app against a fresh test database, then runs every vitest project.
# Extra arguments go to vitest: `npm test -- tests/api/auth.test.ts`.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"

DB_TEST_PORT="${DB_TEST_PORT:-3307}"
TEST_PORT="${TEST_PORT:-3100}"

SERVER_PID=""
cleanup() {
  trap - EXIT INT TERM
  if [ -n "$SERVER_PID" ] && kill -0 "$SERVER_PID" 2>/dev/null; then
    kill "$SERVER_PID" 2>/dev/null || true
    wait "$SERVER_PID" 2>/dev/null || true
  fi
  stop_mariadb
}
trap cleanup EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

ensure_node_modules
ensure_mariadb_installed
[ -x /usr/bin/chromium ] || apt_install chromium

cd "$ROOT"
log "lint"
node_modules/.bin/eslint .
log "typecheck"
npm run -s typecheck

start_mariadb mariadb-test "$DB_TEST_PORT"
create_database evenhand_test evenhand_test evenhand_test fresh
export NUXT_DB_HOST=127.0.0.1 NUXT_DB_PORT="$DB_TEST_PORT" NUXT_DB_USER=evenhand_test NUXT_DB_PASSWORD=evenhand_test NUXT_DB_DATABASE=evenhand_test
node_modules/.bin/tsx scripts/migrate.ts
node_modules/.bin/tsx scripts/seed.ts

ensure_build "$ROOT/.output-test" "$DATA/nuxt-test-build"
export NUXT_SESSION_PASSWORD="evenhand-test-session-password-0123456789"
HOST=127.0.0.1 PORT="$TEST_PORT" NITRO_HOST=127.0.0.1 NITRO_PORT="$TEST_PORT" node .output-test/server/index.mjs >"$DATA/test-server.log" 2>&1 &
SERVER_PID=$!
for _ in $(seq 1 150); do
  wait_http "http://127.0.0.1:$TEST_PORT/api/health" && break
  kill -0 "$SERVER_PID" 2>/dev/null || { cat "$DATA/test-server.log" >&2; die "the test server stopped during start-up"; }
  sleep 0.2
done
export EVENHAND_TEST_URL="http://127.0.0.1:$TEST_PORT"

log "vitest"
node_modules/.bin/vitest run "$@"
