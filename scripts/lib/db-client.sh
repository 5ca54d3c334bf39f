# Sourced by the backup and restore scripts: how the MariaDB clients reach the database NUXT_DB_* names,
# defaulting, like knexfile.ts, to the local database `npm start` runs.
ensure_mariadb_installed
DB_HOST="${NUXT_DB_HOST:-127.0.0.1}"
DB_USER="${NUXT_DB_USER:-evenhand}"
DB_NAME="${NUXT_DB_DATABASE:-evenhand}"
# The password goes through the environment, not the command line, so `ps` does not show it.
export MYSQL_PWD="${NUXT_DB_PASSWORD:-evenhand}"
DB_ARGS=(--no-defaults --protocol=TCP --host="$DB_HOST" --port="${NUXT_DB_PORT:-${DB_PORT:-3306}}" --user="$DB_USER")
