#!/usr/bin/env bash
# A throwaway PostgreSQL cluster in a folder of its own, on a free loopback port.
#   tests/postgres/cluster.sh start DIR   -> prints the admin URL (postgres://postgres@127.0.0.1:PORT/postgres)
#   tests/postgres/cluster.sh stop DIR
# Installs Debian's postgresql package when its binaries are missing. Runs the server as the `postgres` user when
# started as root (PostgreSQL refuses to run as root).
set -euo pipefail
cmd=${1:?start|stop}
dir=${2:?folder}

find_bin() {
  local d
  for d in /usr/lib/postgresql/*/bin; do [ -x "$d/initdb" ] && { echo "$d"; return 0; }; done
  command -v initdb >/dev/null 2>&1 && { dirname "$(command -v initdb)"; return 0; }
  return 1
}

as_pg() {
  if [ "$(id -u)" = 0 ]; then su postgres -s /bin/bash -c "$*"; else bash -c "$*"; fi
}

case "$cmd" in
  start)
    if ! bin=$(find_bin); then
      echo "== installing postgresql from Debian" >&2
      SUDO=""; [ "$(id -u)" = 0 ] || SUDO="sudo"
      $SUDO apt-get update -qq >&2
      DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq postgresql >/dev/null
      # Debian's package starts its own cluster on 5432; this script never uses it.
      bin=$(find_bin)
    fi
    mkdir -p "$dir"
    port=$(node -e "const s=require('net').createServer();s.listen(0,'127.0.0.1',()=>{console.log(s.address().port);s.close()})")
    if [ "$(id -u)" = 0 ]; then chown -R postgres "$dir"; fi
    as_pg "'$bin/initdb' -D '$dir/data' -A trust -U postgres -E UTF8 --locale=C.UTF-8 >'$dir/initdb.log' 2>&1" ||
      { cat "$dir/initdb.log" >&2; exit 1; }
    # fsync off: a test cluster never needs to survive a power cut; it makes every commit cheap.
    as_pg "'$bin/pg_ctl' -D '$dir/data' -o \"-p $port -k '$dir' -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=300\" -l '$dir/server.log' -w start >/dev/null" ||
      { cat "$dir/server.log" >&2; exit 1; }
    echo "$port" >"$dir/port"
    echo "postgres://postgres@127.0.0.1:$port/postgres"
    ;;
  stop)
    bin=$(find_bin)
    [ -d "$dir/data" ] && as_pg "'$bin/pg_ctl' -D '$dir/data' -m fast stop >/dev/null" || true
    ;;
  *) echo "usage: $0 start|stop DIR" >&2; exit 2 ;;
esac
