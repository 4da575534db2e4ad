#!/usr/bin/env bash
# npm run db:backup [-- <file>]: a full copy of the database (schema, policies, grants and every
# farm's rows) in pg_dump's custom format. It runs as the PostgreSQL superuser because the
# tables that hold a farm's rows force row-level security even on their owner: any other role
# would silently dump them empty. Keep backups as private as the database itself.
. "$(dirname "$0")/lib.sh"

DATABASE="${RHIZO_DB_NAME:-rhizomorph}"
export_app_env "$DATABASE" "${RHIZO_APP_PORT:-3000}" "${RHIZO_SMTP_PORT:-2525}" "${RHIZO_MAIL_WEB_PORT:-1080}"

OUTPUT="${1:-${RHIZO_BACKUP_DIR:-$ROOT/backups}/$DATABASE-$(date -u +%Y%m%dT%H%M%SZ).dump}"
mkdir -p "$(dirname "$OUTPUT")"
umask 077

say "Backing up $DATABASE to $OUTPUT"
PGPASSWORD="$PG_SUPERUSER_PASSWORD" pg_dump --host "$PG_HOST" --port "$PG_PORT" --username postgres \
  --format custom --compress 6 --no-password --file "$OUTPUT" "$DATABASE" \
  || fail "The backup failed: is PostgreSQL running? (npm run db:start)"
say "Done: $(du -h "$OUTPUT" | cut -f1) in $OUTPUT"
