#!/usr/bin/env bash
# Starts the whole of Kiln on this machine: PostgreSQL and Redis on 127.0.0.1
# (from Debian's packages, installed when missing), migrations, the demo lab,
# the local SMTP sink, the API with the web app, and the worker processes.
# Ctrl-C stops everything it started.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
source scripts/lib/common.sh
source scripts/lib/postgres.sh
source scripts/lib/redis.sh

export KILN_DATA_DIR=${KILN_DATA_DIR:-$ROOT/.data}
export PORT=${PORT:-8080}
export KILN_PG_PORT=${KILN_PG_PORT:-5433}
export KILN_REDIS_PORT=${KILN_REDIS_PORT:-6380}
export KILN_SMTP_PORT=${KILN_SMTP_PORT:-2525}
export KILN_WORKER_PROCESSES=${KILN_WORKER_PROCESSES:-2}
export KILN_PUBLIC_URL=${KILN_PUBLIC_URL:-http://127.0.0.1:$PORT}
export KILN_MAIL_SINK=${KILN_MAIL_SINK:-1}
mkdir -p "$KILN_DATA_DIR"
KILN_DATA_DIR=$(cd "$KILN_DATA_DIR" && pwd)

ensure_packages pg_ctl:postgresql psql:postgresql-client redis-server:redis-server
bash scripts/install-deps.sh
if [ "${KILN_SKIP_BUILD:-0}" != 1 ]; then
  log "building (set KILN_SKIP_BUILD=1 to reuse the last build)"
  npm run -s build >"$KILN_DATA_DIR/build.log" 2>&1 || { tail -40 "$KILN_DATA_DIR/build.log"; die "build failed; see $KILN_DATA_DIR/build.log"; }
fi

children=()
stopping=0
cleanup() {
  [ $stopping = 1 ] && return; stopping=1
  log "stopping Kiln"
  for pid in "${children[@]}"; do kill -TERM "$pid" 2>/dev/null || true; done
  for pid in "${children[@]}"; do wait "$pid" 2>/dev/null || true; done
  redis_stop
  pg_stop
}
trap cleanup EXIT
trap 'exit 130' INT TERM

pg_start
redis_start
export SMTP_URL=${SMTP_URL:-smtp://127.0.0.1:$KILN_SMTP_PORT}
if [ -z "${JWT_SECRET:-}" ]; then
  secret_file="$KILN_DATA_DIR/secrets/jwt-secret"
  [ -s "$secret_file" ] || (umask 077; head -c 48 /dev/urandom | base64 -w0 > "$secret_file")
  JWT_SECRET=$(cat "$secret_file"); export JWT_SECRET
fi

node backend/dist/cli.js migrate
node backend/dist/cli.js seed-demo

node backend/dist/mail/smtp-sink.main.js & children+=($!)
node backend/dist/main.js & children+=($!)
node worker/dist/supervisor.js & children+=($!)
wait_for_port "$PORT" "the Kiln API" 300

log "Kiln is running at $KILN_PUBLIC_URL  (API docs: $KILN_PUBLIC_URL/api/docs). Ctrl-C stops it."
# Stop everything when any part exits on its own, so nothing half-runs.
wait -n "${children[@]}" || true
log "a Kiln process exited; shutting down the rest"
