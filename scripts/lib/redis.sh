# redis-server under $KILN_DATA_DIR/redis on 127.0.0.1:$KILN_REDIS_PORT, append-only.
# Requires common.sh.

redis_start() {
  local dir="$KILN_DATA_DIR/redis"
  mkdir -p "$dir"
  if [ -s "$dir/redis.pid" ] && kill -0 "$(cat "$dir/redis.pid")" 2>/dev/null; then
    log "Redis already running (pid $(cat "$dir/redis.pid"))"
  else
    port_is_free "$KILN_REDIS_PORT" || die "port $KILN_REDIS_PORT is taken; set KILN_REDIS_PORT to a free port"
    # noeviction: BullMQ must never lose keys to memory pressure.
    redis-server --bind 127.0.0.1 --port "$KILN_REDIS_PORT" --dir "$dir" \
      --appendonly yes --appendfsync everysec --maxmemory-policy noeviction \
      --daemonize yes --pidfile "$dir/redis.pid" --logfile "$dir/redis.log" --protected-mode yes \
      || die "redis-server did not start; see $dir/redis.log"
    wait_for_port "$KILN_REDIS_PORT" Redis 600 || true
    port_is_free "$KILN_REDIS_PORT" && { tail -20 "$dir/redis.log" >&2; die "Redis did not start on port $KILN_REDIS_PORT; see $dir/redis.log"; }
  fi
  export REDIS_URL="${REDIS_URL:-redis://127.0.0.1:$KILN_REDIS_PORT}"
}

redis_stop() {
  local pidfile="$KILN_DATA_DIR/redis/redis.pid" pid
  [ -s "$pidfile" ] || return 0
  pid=$(cat "$pidfile")
  if kill -0 "$pid" 2>/dev/null; then
    kill "$pid"
    for _ in $(seq 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
    log "Redis stopped"
  fi
}
