#!/usr/bin/env bash
# npm test: sets everything up against a fresh test database, then runs the unit,
# integration and browser tests. Exit code 0 only if all passed.
# `bash scripts/test.sh unit integration` runs only the phases named; e2e includes the
# multi-process tests (tests/processes), which need the same build. `static` (the type check and
# the linter) runs first and stops the run when either fails: nothing else is worth the wait then.
. "$(dirname "$0")/lib.sh"
. "$ROOT/scripts/db.sh"

PHASES=("$@")
[ ${#PHASES[@]} -eq 0 ] && PHASES=(static unit integration e2e)
wants() { [[ " ${PHASES[*]} " == *" $1 "* ]]; }

DATABASE="${RHIZO_TEST_DB:-rhizomorph_test}"
export_app_env "$DATABASE" "${RHIZO_TEST_APP_PORT:-3100}" "${RHIZO_TEST_SMTP_PORT:-2625}" "${RHIZO_TEST_MAIL_WEB_PORT:-1180}"
export NEXT_DIST_DIR="${NEXT_DIST_DIR:-.next-test}"
export RHIZO_TEST_RESULTS="$ROOT/test-results"
mkdir -p "$RHIZO_TEST_RESULTS"
# A phase that does not run this time must not be reported from an earlier run's file.
rm -f "$RHIZO_TEST_RESULTS"/vitest-*.json

ensure_dependencies
if wants integration && ! command -v pdftotext >/dev/null; then
  say "Installing poppler-utils from Debian's packages (the tests read a PDF's text with pdftotext)"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq poppler-utils >/dev/null
fi
if wants e2e && [ ! -x /usr/bin/chromium ]; then
  say "Installing Chromium from Debian's packages"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
fi

if wants static; then
  say "Type-checking (tsc --noEmit)"
  npx tsc --noEmit || { echo "The type check failed; no tests run."; exit 1; }
  say "Linting (eslint, no warnings allowed)"
  npx eslint --max-warnings 0 . || { echo "The linter found problems; no tests run."; exit 1; }
fi

BACKGROUND_PIDS=()
# Background servers run in sessions of their own, so stopping one stops its children too.
cleanup() { for pid in "${BACKGROUND_PIDS[@]}"; do kill -- "-$pid" 2>/dev/null || true; done; }
trap cleanup EXIT

# Each phase that needs the database gets a fresh one, so what one phase's tests wrote
# (uploads, withdrawals, new farms) cannot change what the next phase sees.
fresh_database() {
  say "Creating a fresh test database ($DATABASE)"
  drop_database "$DATABASE"
  ensure_roles_and_database "$DATABASE"
  say "Applying database migrations"
  npx tsx scripts/migrate.ts
  say "Loading the demo co-op"
  # react-server: the seed calls the data layer, whose modules are marked server-only.
  npx tsx --conditions=react-server db/seed.ts
}

if wants integration || wants e2e; then
  ensure_postgres_installed
  init_cluster
  start_cluster
  say "Starting the local mail server (maildev): SMTP 127.0.0.1:$SMTP_PORT, inbox $MAIL_INBOX_URL"
  ensure_port_free "$SMTP_PORT"
  ensure_port_free "$MAIL_WEB_PORT"
  BACKGROUND_PIDS+=("$(start_mail_server "$RHIZO_TEST_RESULTS/maildev.log")")
  wait_for_port "$SMTP_PORT" "The mail server"
  wait_for_port "$MAIL_WEB_PORT" "The mail inbox"
fi

STATUS=0
run_project() {
  say "Running $1 tests"
  # RHIZO_VITEST_ARGS narrows a run to some files, e.g. "tests/integration/season-logs".
  # shellcheck disable=SC2086
  npx vitest run --project "$1" --passWithNoTests --reporter=default --reporter=json --outputFile="$RHIZO_TEST_RESULTS/vitest-$1.json" ${RHIZO_VITEST_ARGS:-} || STATUS=1
}

wants unit && run_project unit
if wants integration; then
  fresh_database
  run_project integration
fi

if wants e2e; then
  say "Building the app for the browser tests"
  if npm run build >"$RHIZO_TEST_RESULTS/next-build.log" 2>&1; then
    fresh_database
    # Before the browser tests' server starts: these start, kill and restart app processes of
    # their own, on copies of the fresh database.
    run_project processes
    say "Starting the app on 127.0.0.1:$APP_PORT"
    ensure_port_free "$APP_PORT"
    setsid npx next start --hostname 127.0.0.1 --port "$APP_PORT" >"$RHIZO_TEST_RESULTS/next-server.log" 2>&1 &
    BACKGROUND_PIDS+=($!)
    wait_for_port "$APP_PORT" "The app"
    run_project e2e
  else
    tail -n 40 "$RHIZO_TEST_RESULTS/next-build.log"
    echo "The app did not build; browser tests not run."
    STATUS=1
  fi
fi

REPORTS=()
for phase in "${PHASES[@]}"; do [ "$phase" != static ] && REPORTS+=("$phase"); done
wants e2e && REPORTS+=(processes)
node scripts/test-summary.mjs "$RHIZO_TEST_RESULTS" "${REPORTS[@]}" || STATUS=1
exit "$STATUS"
