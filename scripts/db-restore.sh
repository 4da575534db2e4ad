#!/usr/bin/env bash
# npm run db:restore -- <file> [database]: restores a backup made by db:backup into a database
# that does not exist yet (default: $RHIZO_DB_NAME or rhizomorph). It refuses to overwrite a
# database that exists, unless RHIZO_RESTORE_REPLACE=1 (stop the app first: that drops it).
# One transaction: a restore that fails leaves an empty database, never a half-restored one.
. "$(dirname "$0")/lib.sh"
. "$ROOT/scripts/db.sh"

BACKUP="${1:-}"
[ -n "$BACKUP" ] && [ -f "$BACKUP" ] || fail "usage: npm run db:restore -- <backup file> [database]"
DATABASE="${2:-${RHIZO_DB_NAME:-rhizomorph}}"
export_app_env "$DATABASE" "${RHIZO_APP_PORT:-3000}" "${RHIZO_SMTP_PORT:-2525}" "${RHIZO_MAIL_WEB_PORT:-1080}"

exists="$(psql_super -d postgres -tAc "SELECT 1 FROM pg_database WHERE datname = '$DATABASE'")"
if [ "$exists" = "1" ]; then
  [ "${RHIZO_RESTORE_REPLACE:-}" = "1" ] || fail "Database $DATABASE already exists. Restore into a new name, or set RHIZO_RESTORE_REPLACE=1 to replace it."
  say "Dropping $DATABASE to replace it"
  drop_database "$DATABASE"
fi

# The roles live in the cluster, not in the backup: make them (and the empty database) first.
ensure_roles_and_database "$DATABASE"
say "Restoring $BACKUP into $DATABASE"
PGPASSWORD="$PG_SUPERUSER_PASSWORD" pg_restore --host "$PG_HOST" --port "$PG_PORT" --username postgres \
  --dbname "$DATABASE" --single-transaction --exit-on-error --no-password "$BACKUP" \
  || fail "The restore failed; $DATABASE holds nothing from the backup. Check the file is a db:backup dump."
say "Restored into $DATABASE"
