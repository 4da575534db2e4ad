#!/usr/bin/env bash
# npm start: everything from a fresh clone to the demo co-op on http://127.0.0.1:3000.
# A second run reuses the installed packages, the cluster, the data and the build.
. "$(dirname "$0")/lib.sh"
. "$ROOT/scripts/db.sh"

DATABASE="${RHIZO_DB_NAME:-rhizomorph}"
export_app_env "$DATABASE" "${RHIZO_APP_PORT:-3000}" "${RHIZO_SMTP_PORT:-2525}"

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

start_mail_catcher() {
  if port_in_use "$SMTP_PORT"; then
    say "Mail catcher already listening on 127.0.0.1:$SMTP_PORT"
    return
  fi
  say "Starting the local mail catcher on 127.0.0.1:$SMTP_PORT"
  setsid npx tsx scripts/mail-catcher.ts >"$DATA_DIR/mail-catcher.log" 2>&1 &
  MAIL_CATCHER_PID=$!
  wait_for_port "$SMTP_PORT" "The mail catcher"
}
MAIL_CATCHER_PID=""
start_mail_catcher
trap '[ -n "$MAIL_CATCHER_PID" ] && kill -- "-$MAIL_CATCHER_PID" 2>/dev/null' EXIT

ensure_app_build

cat <<MSG

  Rhizomorph is running at http://127.0.0.1:$APP_PORT

  Demo sign-ins (password for all: alder-valley-demo)
    coordinator   coordinator@aldervalley.example
    farm manager  manager@fernbrook.example
    grower        grower@fernbrook.example
    observer      observer@extension.example

  Stop with Ctrl-C; stop the database with: npm run db:stop

MSG
npx next start --hostname 127.0.0.1 --port "$APP_PORT"
