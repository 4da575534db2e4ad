#!/usr/bin/env bash
# The private PostgreSQL cluster: `start` (install if missing, init, start, roles, database)
# and `stop`. Usage: scripts/db.sh start [database] | stop
. "$(dirname "$0")/lib.sh"

ensure_postgres_installed() {
  if [ -z "$(pg_bin)" ] || [ ! -x "$(pg_bin)/initdb" ]; then
    say "Installing PostgreSQL from Debian's packages"
    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >/dev/null
  fi
  [ -x "$(pg_bin)/initdb" ] || fail "PostgreSQL server binaries not found under /usr/lib/postgresql"
}

as_postgres() { runuser -u postgres -- "$@"; }

init_cluster() {
  [ -f "$PG_DATA/PG_VERSION" ] && return
  say "Creating a private PostgreSQL cluster in $PG_DIR"
  load_secrets
  mkdir -p "$PG_DIR"
  chown postgres:postgres "$PG_DIR"
  chmod 700 "$PG_DIR"
  local pwfile="$PG_DIR/superuser-password"
  printf '%s\n' "$PG_SUPERUSER_PASSWORD" >"$pwfile"
  chown postgres:postgres "$pwfile"
  chmod 600 "$pwfile"
  as_postgres "$(pg_bin)/initdb" -D "$PG_DATA" -U postgres --auth-host=scram-sha-256 --auth-local=peer \
    --pwfile="$pwfile" -E UTF8 --locale=C.UTF-8 >"$PG_DIR/initdb.log"
  rm -f "$pwfile"
}

start_cluster() {
  if as_postgres "$(pg_bin)/pg_ctl" -D "$PG_DATA" status >/dev/null 2>&1; then
    say "PostgreSQL already running on 127.0.0.1:$PG_PORT"
    return
  fi
  say "Starting PostgreSQL on 127.0.0.1:$PG_PORT"
  as_postgres "$(pg_bin)/pg_ctl" -D "$PG_DATA" -l "$PG_DIR/server.log" -w -o \
    "-c listen_addresses=127.0.0.1 -p $PG_PORT -c unix_socket_directories=$PG_DIR" start >/dev/null
}

psql_super() {
  PGPASSWORD="$PG_SUPERUSER_PASSWORD" psql -X -q -v ON_ERROR_STOP=1 -h "$PG_HOST" -p "$PG_PORT" -U postgres "$@"
}

# Roles are created here, not by migrations: the owner runs migrations, the others never own anything.
ensure_roles_and_database() {
  local database="$1"
  load_secrets
  psql_super -d postgres <<SQL
DO \$\$
BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'rhizo_owner') THEN
    CREATE ROLE rhizo_owner LOGIN NOSUPERUSER NOCREATEROLE;
  END IF;
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'rhizo_app') THEN
    CREATE ROLE rhizo_app LOGIN NOSUPERUSER NOBYPASSRLS NOCREATEDB NOCREATEROLE;
  END IF;
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'rhizo_analyst') THEN
    CREATE ROLE rhizo_analyst LOGIN NOSUPERUSER NOBYPASSRLS NOCREATEDB NOCREATEROLE;
  END IF;
  -- The job queue's own role: it reaches only the pgboss schema (db/job-queue.ts grants it).
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'rhizo_jobs') THEN
    CREATE ROLE rhizo_jobs LOGIN NOSUPERUSER NOBYPASSRLS NOCREATEDB NOCREATEROLE;
  END IF;
  -- Owns the pooled refresh (migration 0012) and nothing else; nobody signs in as it.
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'rhizo_statistics') THEN
    CREATE ROLE rhizo_statistics NOLOGIN NOSUPERUSER NOBYPASSRLS NOCREATEDB NOCREATEROLE;
  END IF;
  -- The owner hands the refresh function to rhizo_statistics, which needs membership.
  IF NOT pg_has_role('rhizo_owner', 'rhizo_statistics', 'MEMBER') THEN
    GRANT rhizo_statistics TO rhizo_owner;
  END IF;
END
\$\$;
ALTER ROLE rhizo_owner PASSWORD '$RHIZO_OWNER_PASSWORD';
ALTER ROLE rhizo_app PASSWORD '$RHIZO_APP_PASSWORD';
ALTER ROLE rhizo_analyst PASSWORD '$RHIZO_ANALYST_PASSWORD';
ALTER ROLE rhizo_jobs PASSWORD '$RHIZO_JOBS_PASSWORD';
-- The analyst's refresh groups every block of the co-op; with the default 4 MB its sorts and
-- hash tables spill to disk. Other roles keep the default.
ALTER ROLE rhizo_analyst SET work_mem = '256MB';
SQL
  if [ "$(psql_super -d postgres -tAc "SELECT 1 FROM pg_database WHERE datname = '$database'")" != "1" ]; then
    say "Creating database $database"
    psql_super -d postgres -c "CREATE DATABASE \"$database\" OWNER rhizo_owner"
  fi
  # Temporary tables for rhizo_app alone (a commit's COPY target), none for PUBLIC (so none for the
  # analyst): migrations 0016 and 0025, repeated here because a restored dump does not carry
  # database privileges.
  psql_super -d "$database" -c "REVOKE ALL ON SCHEMA public FROM PUBLIC; GRANT USAGE ON SCHEMA public TO rhizo_app, rhizo_analyst; ALTER SCHEMA public OWNER TO rhizo_owner; REVOKE TEMPORARY ON DATABASE \"$database\" FROM PUBLIC; GRANT TEMPORARY ON DATABASE \"$database\" TO rhizo_app;"
}

drop_database() {
  load_secrets
  psql_super -d postgres -c "DROP DATABASE IF EXISTS \"$1\" WITH (FORCE)"
}

stop_cluster() {
  if [ -n "$(pg_bin)" ] && [ -f "$PG_DATA/PG_VERSION" ] && as_postgres "$(pg_bin)/pg_ctl" -D "$PG_DATA" status >/dev/null 2>&1; then
    say "Stopping PostgreSQL"
    as_postgres "$(pg_bin)/pg_ctl" -D "$PG_DATA" -m fast -w stop >/dev/null
  else
    say "PostgreSQL is not running"
  fi
}

if [ "${BASH_SOURCE[0]}" = "$0" ]; then
  case "${1:-}" in
    start) ensure_postgres_installed; init_cluster; start_cluster; ensure_roles_and_database "${2:-rhizomorph}" ;;
    stop) stop_cluster ;;
    *) fail "usage: scripts/db.sh start [database] | stop" ;;
  esac
fi
