# Shared by the start, test and database scripts: where things live and how to reach them.
# Sourced, not run. Every value can be overridden from the environment so that several
# checkouts (or several people on one machine) can run side by side.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"

say() { printf '\033[1;32m▸\033[0m %s\n' "$*"; }
# Runs a slow step after saying what it is and roughly how long it takes, then says how long it took.
timed() {
  local what="$1" started=$SECONDS
  shift
  say "$what"
  "$@" || return
  say "  done in $((SECONDS - started)) s"
}
fail() { printf '\033[1;31m✗ %s\033[0m\n' "$*" >&2; exit 1; }

PG_PORT="${RHIZO_PG_PORT:-54329}"
PG_HOST=127.0.0.1

# The cluster must sit where the postgres system user can reach it. A clone under a
# folder that user cannot enter (such as /root) falls back to /var/tmp.
pick_data_dir() {
  if [ -n "${RHIZO_DATA_DIR:-}" ]; then echo "$RHIZO_DATA_DIR"; return; fi
  if id postgres >/dev/null 2>&1 && ! runuser -u postgres -- test -x "$ROOT" 2>/dev/null; then
    echo "/var/tmp/rhizomorph-$(printf '%s' "$ROOT" | sha256sum | cut -c1-12)"
  else
    echo "$ROOT/.data"
  fi
}
DATA_DIR="$(pick_data_dir)"
PG_DIR="$DATA_DIR/pg"
PG_DATA="$PG_DIR/data"
SECRETS_FILE="$DATA_DIR/secrets.env"

pg_bin() {
  local version
  version="$(ls /usr/lib/postgresql 2>/dev/null | sort -V | tail -n 1)"
  [ -n "$version" ] && echo "/usr/lib/postgresql/$version/bin"
}

# Passwords and the sign-in secret are made once per checkout and kept out of git. A secret
# added by a later version (RHIZO_JOBS_PASSWORD) is appended to an existing file.
load_secrets() {
  mkdir -p "$DATA_DIR"
  local name previous_umask
  previous_umask="$(umask)"
  umask 077
  touch "$SECRETS_FILE"
  for name in PG_SUPERUSER_PASSWORD RHIZO_OWNER_PASSWORD RHIZO_APP_PASSWORD RHIZO_ANALYST_PASSWORD RHIZO_JOBS_PASSWORD; do
    grep -q "^$name=" "$SECRETS_FILE" || echo "$name=$(openssl rand -hex 16)" >>"$SECRETS_FILE"
  done
  grep -q "^AUTH_SECRET=" "$SECRETS_FILE" || echo "AUTH_SECRET=$(openssl rand -base64 32)" >>"$SECRETS_FILE"
  umask "$previous_umask"
  set -a
  # shellcheck disable=SC1090
  . "$SECRETS_FILE"
  set +a
}

# Exports the connection strings and settings the app, the migrations and the tests read.
# The mail ports are maildev's (scripts/mail-server.sh): SMTP for the app, the web inbox for people and tests.
export_app_env() {
  local database="$1" app_port="$2" smtp_port="$3" mail_web_port="${4:-1080}"
  load_secrets
  export RHIZO_DATABASE="$database"
  export DATABASE_URL="postgres://rhizo_app:$RHIZO_APP_PASSWORD@$PG_HOST:$PG_PORT/$database"
  export ANALYST_DATABASE_URL="postgres://rhizo_analyst:$RHIZO_ANALYST_PASSWORD@$PG_HOST:$PG_PORT/$database"
  export JOBS_DATABASE_URL="postgres://rhizo_jobs:$RHIZO_JOBS_PASSWORD@$PG_HOST:$PG_PORT/$database"
  export OWNER_DATABASE_URL="postgres://rhizo_owner:$RHIZO_OWNER_PASSWORD@$PG_HOST:$PG_PORT/$database"
  export SUPERUSER_DATABASE_URL="postgres://postgres:$PG_SUPERUSER_PASSWORD@$PG_HOST:$PG_PORT/postgres"
  export APP_PORT="$app_port"
  export APP_URL="http://127.0.0.1:$app_port"
  export AUTH_TRUST_HOST=true
  export SMTP_HOST=127.0.0.1
  export SMTP_PORT="$smtp_port"
  export MAIL_WEB_PORT="$mail_web_port"
  export MAIL_INBOX_URL="http://127.0.0.1:$mail_web_port"
  export MAIL_FROM="Rhizomorph <no-reply@rhizomorph.invalid>"
  export NEXT_TELEMETRY_DISABLED=1
}

# npm ci only when package-lock.json changed since the last install.
ensure_dependencies() {
  local stamp="node_modules/.rhizomorph-lock-hash" want
  want="$(sha256sum package-lock.json | cut -c1-64)"
  if [ -f "$stamp" ] && [ "$(cat "$stamp")" = "$want" ]; then
    say "Dependencies already installed"
  else
    timed "Installing dependencies (npm ci, about a minute the first time)" npm ci --no-audit --no-fund --loglevel=error
    echo "$want" >"$stamp"
  fi
}

wait_for_port() {
  local port="$1" what="$2" tries=0
  until port_in_use "$port"; do
    tries=$((tries + 1))
    [ "$tries" -gt 300 ] && fail "$what did not start on port $port"
    sleep 0.2
  done
}

port_in_use() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

ensure_port_free() {
  port_in_use "$1" && fail "Port $1 is already in use: stop whatever is listening there (an earlier run?) and try again"
  return 0
}

# maildev (a dev dependency) stands in for the co-op's mail service: it accepts the app's SMTP on
# loopback and shows what arrived in its web inbox and REST API (GET /email), which the tests read.
# Both ports stay on 127.0.0.1. Prints the process id; the caller stops it.
start_mail_server() {
  local log_file="$1" mail_directory="${2:-}"
  local args=(--smtp "$SMTP_PORT" --web "$MAIL_WEB_PORT" --ip 127.0.0.1 --web-ip 127.0.0.1)
  [ -n "$mail_directory" ] && mkdir -p "$mail_directory" && args+=(--mail-directory "$mail_directory")
  setsid node_modules/.bin/maildev "${args[@]}" >"$log_file" 2>&1 &
  echo $!
}

# Builds the app into $NEXT_DIST_DIR (default .next) unless a build newer than every source is there.
ensure_app_build() {
  local dist_dir="${NEXT_DIST_DIR:-.next}"
  # public/sw.js is written from the build (npm run build), so it is always newer than BUILD_ID.
  if [ -f "$dist_dir/BUILD_ID" ] && [ -f public/sw.js ] && [ -z "$(find app components lib db auth.ts auth.config.ts proxy.ts next.config.ts serwist.config.js package-lock.json public \
    -newer "$dist_dir/BUILD_ID" -not -path 'db/migrations/*' -not -path 'public/sw.js*' -print -quit 2>/dev/null)" ]; then
    say "The app build is up to date"
  else
    timed "Building the app (next build and the service worker, two to four minutes on two cores)" npm run build
  fi
}
