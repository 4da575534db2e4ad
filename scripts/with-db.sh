#!/usr/bin/env bash
# Runs a command (a benchmark) with the cluster started and a scratch database of its own.
. "$(dirname "$0")/lib.sh"
. "$ROOT/scripts/db.sh"
DATABASE="${RHIZO_BENCH_DB:-rhizomorph_bench}"
export_app_env "$DATABASE" "${RHIZO_BENCH_APP_PORT:-3200}" "${RHIZO_BENCH_SMTP_PORT:-2725}"
ensure_dependencies
ensure_postgres_installed
init_cluster
start_cluster
drop_database "$DATABASE"
ensure_roles_and_database "$DATABASE"
npx tsx scripts/migrate.ts >/dev/null
"$@"
