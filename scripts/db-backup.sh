#!/usr/bin/env bash
# `npm run db:backup [-- FILE]`: a gzip-compressed SQL dump of the database named by NUXT_DB_* (by default the
# database `npm start` runs on 127.0.0.1:${DB_PORT:-3306}); prints the file's path on standard output.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"
source "$(dirname "$0")/lib/db-client.sh"

file="${1:-$DATA/backups/$(date -u +%Y%m%dT%H%M%SZ)-$DB_NAME.sql.gz}"
mkdir -p "$(dirname "$file")"
# A consistent snapshot without table locks (InnoDB), so a running app keeps storing attempts meanwhile.
# pipefail makes a failed dump fail the script; the partial file is then removed.
if ! mariadb-dump "${DB_ARGS[@]}" --single-transaction --quick --routines --triggers --no-tablespaces \
  --default-character-set=utf8mb4 "$DB_NAME" | gzip -c > "$file.partial"; then
  rm -f "$file.partial"
  die "backup of $DB_NAME failed"
fi
mv "$file.partial" "$file"
log "backed up $DB_NAME ($(du -h "$file" | cut -f1))"
echo "$file"
