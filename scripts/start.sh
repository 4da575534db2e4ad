#!/usr/bin/env bash
# npm start: everything from a fresh clone to the demo co-op on http://127.0.0.1:3000.
# A second run reuses the installed packages, the cluster, the data and the build.
. "$(dirname "$0")/lib.sh"
. "$ROOT/scripts/db.sh"

DATABASE="${RHIZO_DB_NAME:-rhizomorph}"
export_app_env "$DATABASE" "${RHIZO_APP_PORT:-3000}" "${RHIZO_SMTP_PORT:-2525}" "${RHIZO_MAIL_WEB_PORT:-1080}"

port_in_use "$APP_PORT" && fail "Port $APP_PORT is already in use (is Rhizomorph already running?). Stop it first, or choose another port with RHIZO_APP_PORT."
ensure_dependencies
ensure_postgres_installed
init_cluster
start_cluster
ensure_roles_and_database "$DATABASE"
say "Applying database migrations"
npx tsx scripts/migrate.ts
say "Loading the demo co-op if the database is empty"
# The seed cuts the first release through the data layer, whose modules are marked server-only:
# the react-server condition lets Node load them outside Next.
npx tsx --conditions=react-server db/seed.ts

MAIL_SERVER_PID=""
if port_in_use "$SMTP_PORT"; then
  say "A mail server is already listening on 127.0.0.1:$SMTP_PORT (an earlier npm start?); using it"
else
  ensure_port_free "$MAIL_WEB_PORT"
  say "Starting the local mail server (maildev): SMTP 127.0.0.1:$SMTP_PORT, inbox $MAIL_INBOX_URL"
  # Kept in the data folder, so the inbox survives a restart.
  MAIL_SERVER_PID="$(start_mail_server "$DATA_DIR/maildev.log" "$DATA_DIR/maildev")"
  wait_for_port "$SMTP_PORT" "The mail server"
  wait_for_port "$MAIL_WEB_PORT" "The mail inbox"
fi
trap '[ -n "$MAIL_SERVER_PID" ] && kill -- "-$MAIL_SERVER_PID" 2>/dev/null' EXIT

ensure_app_build

cat <<MSG

  Rhizomorph is running at http://127.0.0.1:$APP_PORT

  Demo sign-ins (password for all: alder-valley-demo)
    coordinator   coordinator@aldervalley.example
    farm manager  manager@fernbrook.example
    grower        grower@fernbrook.example
    observer      observer@extension.example

  Mail the app sends (invitations, password resets, trial notices) lands in
  the local inbox at $MAIL_INBOX_URL

  Stop with Ctrl-C; stop the database with: npm run db:stop

MSG
npx next start --hostname 127.0.0.1 --port "$APP_PORT"
