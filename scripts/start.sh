#!/usr/bin/env bash
# `npm start`: install what is missing, start MariaDB, migrate, seed the demo studio, build and serve.
# Ctrl-C (SIGINT) or SIGTERM stops the app and the MariaDB this script started.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"

PORT="${PORT:-3000}"
# The build to serve; EVENHAND_OUTPUT_DIR serves another (the start script's test serves the test build).
OUTPUT="${EVENHAND_OUTPUT_DIR:-$ROOT/.output}"
DB_PORT="${DB_PORT:-3306}"
HOST="${HOST:-127.0.0.1}"

cleanup() {
  trap - EXIT INT TERM
  [ -n "$SERVER_PID" ] && log "stopping the app"
  stop_app
  stop_mail_server
  stop_mariadb
}
trap cleanup EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

ensure_node_modules
ensure_mariadb_installed
ensure_session_password
start_mariadb mariadb "$DB_PORT"
create_database evenhand evenhand evenhand

export NUXT_DB_HOST=127.0.0.1 NUXT_DB_PORT="$DB_PORT" NUXT_DB_USER=evenhand NUXT_DB_PASSWORD=evenhand NUXT_DB_DATABASE=evenhand
(cd "$ROOT" && node_modules/.bin/tsx scripts/migrate.ts && node_modules/.bin/tsx scripts/seed.ts)
ensure_build "$OUTPUT"

# With NUXT_SMTP_HOST set, mail goes to that provider; otherwise to the local mail server and /dev/mail.
if [ -z "${NUXT_SMTP_HOST:-}" ]; then
  start_mail_server "${SMTP_PORT:-2525}" "$DATA/mail"
fi
export NUXT_APP_URL="${NUXT_APP_URL:-http://$HOST:$PORT}"

log "starting the app"
HOST="$HOST" serve_app "$OUTPUT" "$PORT"

cat >&2 <<MSG

  Evenhand is running at http://$HOST:$PORT

  Demo accounts (password for all: evenhand-demo — for the demo only):
    teacher  teacher@evenhand.test
    student  student@evenhand.test

  Mail the app sends is kept on this machine: read it at http://$HOST:$PORT/dev/mail

  Press Ctrl-C to stop the app and its MariaDB.

MSG
wait "$SERVER_PID"
