# Shared by scripts/start.sh and scripts/test.sh: install what is missing, run MariaDB on loopback.
# Sourced, not run. Everything lives under .data/ (git-ignored) so a clone is self-contained;
# EVENHAND_DATA puts it elsewhere (the start script's own test runs it in a scratch folder).

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
DATA="${EVENHAND_DATA:-$ROOT/.data}"
mkdir -p "$DATA"

log() { printf '\033[1;34m[evenhand]\033[0m %s\n' "$*" >&2; }
die() { printf '\033[1;31m[evenhand]\033[0m %s\n' "$*" >&2; exit 1; }

as_root() {
  if [ "$(id -u)" = 0 ]; then "$@"
  elif command -v sudo >/dev/null 2>&1; then sudo "$@"
  else die "need root to run: $*"
  fi
}

APT_UPDATED=""
apt_install() {
  if [ -z "$APT_UPDATED" ]; then
    log "apt-get update"
    as_root apt-get update -qq >/dev/null
    APT_UPDATED=1
  fi
  log "installing Debian packages: $*"
  DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq "$@" >/dev/null
}

# npm ci only when the lock file changed since the last install, so a second start is fast.
ensure_node_modules() {
  local stamp="$ROOT/node_modules/.evenhand-lock-hash" want
  want="$(sha256sum "$ROOT/package-lock.json" | cut -d' ' -f1)"
  if [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
    log "installing npm packages (npm ci)"
    (cd "$ROOT" && npm ci --no-audit --no-fund --loglevel=error)
    echo "$want" > "$stamp"
  fi
}

# A session password for sealed cookies, made once per clone and kept out of git.
ensure_session_password() {
  local file="$DATA/session-password"
  if [ -z "${NUXT_SESSION_PASSWORD:-}" ]; then
    [ -s "$file" ] || node -e "process.stdout.write(require('crypto').randomBytes(32).toString('hex'))" > "$file"
    NUXT_SESSION_PASSWORD="$(cat "$file")"
  fi
  export NUXT_SESSION_PASSWORD
}

# ensure_build OUT [BUILD_DIR]: build into OUT unless the sources are unchanged since the last build there.
ensure_build() {
  local out="$1" build_dir="${2:-}" stamp="$1/.evenhand-source-hash" want
  # A file git still lists but the work tree has lost is skipped, not fatal.
  want="$(cd "$ROOT" && git ls-files -co --exclude-standard -- app.vue pages components composables stores server shared layouts middleware plugins assets utils public nuxt.config.ts tailwind.config.ts package-lock.json \
    | sort | while read -r f; do if [ -f "$f" ]; then sha256sum "$f"; fi; done | sha256sum | cut -d' ' -f1)"
  if [ ! -f "$out/server/index.mjs" ] || [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
    log "building the app into ${out#"$ROOT"/}"
    (cd "$ROOT" && EVENHAND_OUTPUT_DIR="$out" EVENHAND_BUILD_DIR="$build_dir" node_modules/.bin/nuxi build >"$DATA/build.log" 2>&1) \
      || { tail -40 "$DATA/build.log" >&2; die "build failed (full log: $DATA/build.log)"; }
    echo "$want" > "$stamp"
  fi
}

# wait_http URL: true once the URL answers 2xx (node's fetch, since a fresh machine may lack curl).
wait_http() {
  node -e "fetch(process.argv[1]).then(r => process.exit(r.ok ? 0 : 1), () => process.exit(1))" "$1"
}

ensure_mariadb_installed() {
  command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ] || apt_install mariadb-server
  export PATH="$PATH:/usr/sbin"
}

# start_mariadb NAME PORT: a private server with its data in .data/NAME, reachable on 127.0.0.1:PORT.
start_mariadb() {
  local name="$1" port="$2" dir="$DATA/$1"
  MARIADB_SOCKET="$dir/mariadb.sock"
  MARIADB_PIDFILE="$dir/mariadb.pid"
  mkdir -p "$dir"
  if mariadb-admin --no-defaults --socket="$MARIADB_SOCKET" -uroot ping >/dev/null 2>&1; then
    log "MariaDB ($name) already running"
    MARIADB_STARTED=""
    return
  fi
  if [ ! -d "$dir/db/mysql" ]; then
    log "initialising MariaDB data folder .data/$name/db"
    mariadb-install-db --no-defaults --datadir="$dir/db" --user="$(id -un)" \
      --auth-root-authentication-method=socket --skip-test-db >"$dir/install.log" 2>&1 \
      || { cat "$dir/install.log" >&2; die "mariadb-install-db failed"; }
  fi
  log "starting MariaDB ($name) on 127.0.0.1:$port"
  mariadbd --no-defaults --datadir="$dir/db" --socket="$MARIADB_SOCKET" --pid-file="$MARIADB_PIDFILE" \
    --port="$port" --bind-address=127.0.0.1 --user="$(id -un)" --skip-name-resolve \
    --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
    --log-error="$dir/error.log" >/dev/null 2>&1 &
  MARIADB_STARTED=$!
  for _ in $(seq 1 100); do
    mariadb-admin --no-defaults --socket="$MARIADB_SOCKET" -uroot ping >/dev/null 2>&1 && return
    kill -0 "$MARIADB_STARTED" 2>/dev/null || { tail -20 "$dir/error.log" >&2; die "MariaDB did not start (is port $port taken? set DB_PORT)"; }
    sleep 0.2
  done
  die "MariaDB did not answer within 20 s"
}

stop_mariadb() {
  [ -n "${MARIADB_STARTED:-}" ] || return 0
  log "stopping MariaDB"
  # The server running now: the one started here, or the one a fault test started again in its place.
  local pid
  pid="$(cat "$MARIADB_PIDFILE" 2>/dev/null || echo "$MARIADB_STARTED")"
  mariadb-admin --no-defaults --socket="$MARIADB_SOCKET" -uroot shutdown >/dev/null 2>&1 || kill "$pid" 2>/dev/null
  # The pid file goes before the process ends, so wait on the process itself.
  for _ in $(seq 1 300); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
  MARIADB_STARTED=""
}

# create_database DB USER PASSWORD [fresh]: the app's database and its own user, over the root socket.
# The user may also create DB_scratch* databases, where a backup is restored to be checked before use.
create_database() {
  local db="$1" user="$2" pass="$3" fresh="${4:-}"
  local sql=""
  [ -n "$fresh" ] && sql="DROP DATABASE IF EXISTS \`$db\`;"
  sql="$sql CREATE DATABASE IF NOT EXISTS \`$db\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
    CREATE USER IF NOT EXISTS '$user'@'127.0.0.1' IDENTIFIED BY '$pass';
    ALTER USER '$user'@'127.0.0.1' IDENTIFIED BY '$pass';
    GRANT ALL PRIVILEGES ON \`$db\`.* TO '$user'@'127.0.0.1';
    GRANT ALL PRIVILEGES ON \`${db}_scratch%\`.* TO '$user'@'127.0.0.1';"
  mariadb --no-defaults --socket="$MARIADB_SOCKET" -uroot -e "$sql"
}

ensure_chromium() {
  [ -x /usr/bin/chromium ] || apt_install chromium
}

# serve_app OUT PORT [LOG]: the built server from OUT on 127.0.0.1:PORT, in the background; waits for /api/health.
# Without LOG the server writes to this script's own stdout and stderr (inherited, so a log file the caller
# redirected to is appended to, and a socket such as a supervisor's pipe works).
SERVER_PID=""
serve_app() {
  local out="$1" port="$2" logfile="${3:-}" host="${HOST:-127.0.0.1}"
  # Something else answering there would pass the health check below in its place.
  ! wait_http "http://$host:$port/api/health" || die "port $port is already in use: stop what runs there or choose another port (PORT / TEST_PORT)"
  if [ -n "$logfile" ]; then
    HOST="$host" PORT="$port" NITRO_HOST="$host" NITRO_PORT="$port" node "$out/server/index.mjs" >"$logfile" 2>&1 &
  else
    HOST="$host" PORT="$port" NITRO_HOST="$host" NITRO_PORT="$port" node "$out/server/index.mjs" &
  fi
  SERVER_PID=$!
  for _ in $(seq 1 150); do
    wait_http "http://$host:$port/api/health" && return
    kill -0 "$SERVER_PID" 2>/dev/null || { [ -n "$logfile" ] && [ -f "$logfile" ] && tail -30 "$logfile" >&2; die "the app stopped during start-up"; }
    sleep 0.2
  done
  die "the app did not answer on port $port within 30 s"
}

stop_app() {
  if [ -n "$SERVER_PID" ] && kill -0 "$SERVER_PID" 2>/dev/null; then
    kill "$SERVER_PID" 2>/dev/null || true
    wait "$SERVER_PID" 2>/dev/null || true
  fi
  SERVER_PID=""
}

# wait_port PORT: true once something accepts TCP connections on 127.0.0.1:PORT.
wait_port() {
  node -e "require('net').connect(+process.argv[1], '127.0.0.1').on('connect', () => process.exit(0)).on('error', () => process.exit(1))" "$1"
}

# start_mail_server PORT DIR: the local fake SMTP server (scripts/mail-server.ts) storing .eml files in DIR,
# and the runtimeConfig that points the app at it and opens /dev/mail.
MAIL_SERVER_PID=""
start_mail_server() {
  local port="$1" dir="$2"
  ! wait_port "$port" || die "port $port is already in use: stop what runs there or choose another mail port (SMTP_PORT / SMTP_TEST_PORT)"
  log "starting the local mail server on 127.0.0.1:$port (messages in ${dir#"$ROOT"/})"
  (cd "$ROOT" && exec node --import tsx scripts/mail-server.ts "$port" "$dir") &
  MAIL_SERVER_PID=$!
  for _ in $(seq 1 100); do
    wait_port "$port" && break
    kill -0 "$MAIL_SERVER_PID" 2>/dev/null || die "the local mail server stopped during start-up"
    sleep 0.1
  done
  export NUXT_SMTP_HOST=127.0.0.1 NUXT_SMTP_PORT="$port" NUXT_SMTP_USER="" NUXT_SMTP_PASSWORD="" NUXT_SMTP_SECURE=false
  export NUXT_MAIL_LOCAL=1 NUXT_MAIL_DIR="$dir" EVENHAND_MAIL_SERVER_PID="$MAIL_SERVER_PID"
}

stop_mail_server() {
  [ -n "$MAIL_SERVER_PID" ] || return 0
  kill "$MAIL_SERVER_PID" 2>/dev/null || true
  wait "$MAIL_SERVER_PID" 2>/dev/null || true
  MAIL_SERVER_PID=""
}

# The test set-up shared by `npm test` and the browser benchmark: its own MariaDB (DB_TEST_PORT, default 3307)
# with a fresh, migrated and seeded database, and the app built into .output-test served on TEST_PORT (3100).
start_test_stack() {
  local db_port="${DB_TEST_PORT:-3307}" port="${TEST_PORT:-3100}"
  start_mariadb mariadb-test "$db_port"
  create_database evenhand_test evenhand_test evenhand_test fresh
  export NUXT_DB_HOST=127.0.0.1 NUXT_DB_PORT="$db_port" NUXT_DB_USER=evenhand_test NUXT_DB_PASSWORD=evenhand_test NUXT_DB_DATABASE=evenhand_test
  (cd "$ROOT" && node_modules/.bin/tsx scripts/migrate.ts && node_modules/.bin/tsx scripts/seed.ts)
  ensure_build "$ROOT/.output-test" "$DATA/nuxt-test-build"
  export NUXT_SESSION_PASSWORD="evenhand-test-session-password-0123456789"
  rm -rf "$DATA/mail-test"
  start_mail_server "${SMTP_TEST_PORT:-2526}" "$DATA/mail-test"
  # Quick rounds and short waits after a failure, so the outage tests see retries within seconds.
  export NUXT_MAIL_POLL_MS=200 NUXT_MAIL_RETRY_BASE_MS=300 NUXT_MAIL_RETRY_MAX_MS=2000 NUXT_APP_URL="http://127.0.0.1:$port"
  HOST=127.0.0.1 serve_app "$ROOT/.output-test" "$port" "$DATA/test-server.log"
  export EVENHAND_TEST_URL="http://127.0.0.1:$port"
}

stop_test_stack() {
  trap - EXIT INT TERM
  stop_app
  stop_mail_server
  stop_mariadb
}

# What `npm test` and the browser benchmark need before the stack: packages, MariaDB, chromium,
# and traps that take the stack down however the script ends.
prepare_test_machine() {
  trap stop_test_stack EXIT
  trap 'exit 130' INT
  trap 'exit 143' TERM
  ensure_node_modules
  ensure_mariadb_installed
  ensure_chromium
}
