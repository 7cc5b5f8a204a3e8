#!/usr/bin/env bash
# `npm run bench:queue`: the queue and worker pool measured on this machine, with
# its own PostgreSQL and Redis in a throwaway folder. Prints figures and ratios.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
source scripts/lib/common.sh
source scripts/lib/postgres.sh
source scripts/lib/redis.sh
export KILN_DATA_DIR=$(mktemp -d /tmp/kiln-bench.XXXXXX)
export KILN_PG_PORT=${KILN_BENCH_PG_PORT:-55533}
export KILN_REDIS_PORT=${KILN_BENCH_REDIS_PORT:-56480}
export KILN_PG_DATABASE=kiln_bench
unset DATABASE_URL REDIS_URL
ensure_packages pg_ctl:postgresql psql:postgresql-client redis-server:redis-server
bash scripts/install-deps.sh
log "building"
npm run -s build >"$KILN_DATA_DIR/build.log" 2>&1 || { tail -40 "$KILN_DATA_DIR/build.log"; die "build failed"; }
cleanup() { redis_stop; pg_stop; rm -rf "$KILN_DATA_DIR"; }
trap cleanup EXIT
pg_start
redis_start
npx tsx scripts/bench/queue-bench.ts
