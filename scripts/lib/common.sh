# Shared helpers for Kiln's start and test scripts. Source it; do not run it.
# Everything listens on 127.0.0.1 only; data lives under $KILN_DATA_DIR.

kiln_root() { cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd; }
log() { printf '[kiln] %s\n' "$*" >&2; }
die() { printf '[kiln] error: %s\n' "$*" >&2; exit 1; }

# Installs Debian packages for the commands that are missing (apt-get update once).
# Usage: ensure_packages cmd:package [cmd:package ...]
ensure_packages() {
  local missing=() pair cmd pkg
  for pair in "$@"; do
    cmd=${pair%%:*}; pkg=${pair#*:}
    if ! command -v "$cmd" >/dev/null 2>&1 && ! pg_bin_dir_has "$cmd"; then missing+=("$pkg"); fi
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  if [ "$(id -u)" != 0 ]; then
    die "missing system packages: ${missing[*]}. Install them (sudo apt-get install -y ${missing[*]}) and run again."
  fi
  log "installing Debian packages: ${missing[*]}"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq >/dev/null || die "apt-get update failed"
  apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null || die "apt-get install ${missing[*]} failed"
}

# PostgreSQL's server binaries live outside PATH on Debian.
pg_bin_dir() {
  local dir
  for dir in /usr/lib/postgresql/15/bin /usr/lib/postgresql/*/bin; do
    [ -x "$dir/pg_ctl" ] && { echo "$dir"; return 0; }
  done
  return 1
}
pg_bin_dir_has() { local d; d=$(pg_bin_dir) && [ -x "$d/$1" ]; }

# Runs a command as the unprivileged owner of the PostgreSQL cluster
# (initdb refuses to run as root).
as_pg_user() {
  if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

# Waits until a TCP port on 127.0.0.1 accepts connections.
wait_for_port() {
  local port=$1 what=$2 tries=${3:-100}
  while ! (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; do
    tries=$((tries - 1)); [ $tries -le 0 ] && { log "$what did not start on port $port"; return 1; }
    sleep 0.1
  done
}

port_is_free() { ! (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }
