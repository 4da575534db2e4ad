#!/usr/bin/env bash
# npm run screenshots: builds and starts the app on a fresh copy of the demo co-op, then saves every
# page as every role at 390 and 1366 px into test-results/screenshots/ (role-page-width.png).
. "$(dirname "$0")/lib.sh"
. "$ROOT/scripts/db.sh"

DATABASE="${RHIZO_SCREENSHOTS_DB:-rhizomorph_screenshots}"
export_app_env "$DATABASE" "${RHIZO_SCREENSHOTS_APP_PORT:-3300}" "${RHIZO_SCREENSHOTS_SMTP_PORT:-2825}" "${RHIZO_SCREENSHOTS_MAIL_WEB_PORT:-1380}"
export NEXT_DIST_DIR="${NEXT_DIST_DIR:-.next-screenshots}"
export RHIZO_TEST_RESULTS="$ROOT/test-results"
mkdir -p "$RHIZO_TEST_RESULTS"

ensure_dependencies
ensure_postgres_installed
init_cluster
start_cluster
say "Creating a fresh copy of the demo co-op ($DATABASE)"
drop_database "$DATABASE"
ensure_roles_and_database "$DATABASE"
npx tsx scripts/migrate.ts >/dev/null
npx tsx --conditions=react-server db/seed.ts

BACKGROUND_PIDS=()
cleanup() { for pid in "${BACKGROUND_PIDS[@]}"; do kill -- "-$pid" 2>/dev/null || true; done; }
trap cleanup EXIT
ensure_port_free "$SMTP_PORT"
BACKGROUND_PIDS+=("$(start_mail_server "$RHIZO_TEST_RESULTS/screenshots-maildev.log")")
ensure_app_build
ensure_port_free "$APP_PORT"
say "Starting the app on 127.0.0.1:$APP_PORT"
setsid npx next start --hostname 127.0.0.1 --port "$APP_PORT" >"$RHIZO_TEST_RESULTS/screenshots-server.log" 2>&1 &
BACKGROUND_PIDS+=($!)
wait_for_port "$APP_PORT" "The app"
APP_URL="http://127.0.0.1:$APP_PORT" npx tsx scripts/screenshots.ts
