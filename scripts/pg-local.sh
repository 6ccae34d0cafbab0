#!/usr/bin/env bash
# Starts a throwaway PostgreSQL server on loopback for the integration suite and the bench
# (Debian's postgresql package; run as root or as a user who can run initdb).
#   scripts/pg-local.sh start   -> prints the admin URL (postgres://postgres@127.0.0.1:PORT/postgres)
#   scripts/pg-local.sh stop
# PG_DIR (default /tmp/fieldtide-pg) holds the cluster; PG_PORT (default 55432) the port.
set -euo pipefail
PG_DIR="${PG_DIR:-/tmp/fieldtide-pg}"
PG_PORT="${PG_PORT:-55432}"
BIN="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1)"
if [ -z "$BIN" ]; then echo "PostgreSQL is not installed (apt-get install -y postgresql)" >&2; exit 1; fi
as_pg() {
  if [ "$(id -u)" = "0" ]; then runuser -u postgres -- "$@"; else "$@"; fi
}
case "${1:-start}" in
  start)
    if [ ! -f "$PG_DIR/PG_VERSION" ]; then
      mkdir -p "$PG_DIR"
      [ "$(id -u)" = "0" ] && chown postgres:postgres "$PG_DIR"
      as_pg "$BIN/initdb" -D "$PG_DIR" -U postgres --auth=trust --encoding=UTF8 --locale=C.UTF-8 >/dev/null
    fi
    if ! as_pg "$BIN/pg_ctl" -D "$PG_DIR" status >/dev/null 2>&1; then
      # fsync off: a throwaway test server, durability is not what is being tested here
      as_pg "$BIN/pg_ctl" -D "$PG_DIR" -l "$PG_DIR/server.log" -w \
        -o "-p $PG_PORT -k $PG_DIR -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c max_connections=200" start >/dev/null
    fi
    echo "postgres://postgres@127.0.0.1:$PG_PORT/postgres"
    ;;
  stop)
    as_pg "$BIN/pg_ctl" -D "$PG_DIR" -m fast stop >/dev/null 2>&1 || true
    ;;
  *) echo "usage: $0 start|stop" >&2; exit 2 ;;
esac
