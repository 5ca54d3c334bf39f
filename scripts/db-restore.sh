#!/usr/bin/env bash
# `npm run db:restore -- FILE [DATABASE]`: loads a dump made by `npm run db:backup` (.sql.gz or .sql) into DATABASE
# (default: the one NUXT_DB_* names), creating it if it does not exist. Tables in the dump replace those of the same name.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"
source "$(dirname "$0")/lib/db-client.sh"

file="${1:-}"
target="${2:-$DB_NAME}"
[ -n "$file" ] || die "usage: npm run db:restore -- FILE [DATABASE]"
[ -f "$file" ] || die "no such backup file: $file"
[[ "$target" =~ ^[A-Za-z0-9_]{1,64}$ ]] || die "database name must be 1-64 letters, digits or underscores: $target"

case "$file" in
  *.gz) reader=(gzip -dc "$file") ;;
  *) reader=(cat "$file") ;;
esac
mariadb "${DB_ARGS[@]}" -e "CREATE DATABASE IF NOT EXISTS \`$target\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci" \
  || die "cannot create database $target (does $DB_USER have the rights?)"
"${reader[@]}" | mariadb "${DB_ARGS[@]}" --default-character-set=utf8mb4 "$target" || die "restore into $target failed"
log "restored $file into $target"
