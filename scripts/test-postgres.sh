#!/usr/bin/env bash
# A throwaway PostgreSQL cluster for the integration tests: initdb in a temporary folder, a server
# on 127.0.0.1 only (no Unix socket in a shared place), trust authentication for loopback.
#
#   eval "$(bash scripts/test-postgres.sh start)"   # prints export lines: MELTLEDGER_TEST_PG_URL, MELTLEDGER_TEST_PG_DIR
#   bash scripts/test-postgres.sh stop "$MELTLEDGER_TEST_PG_DIR"
#
# MELTLEDGER_TEST_PG_PORT picks the port (default: one the kernel reports free). As root the server runs as the
# `postgres` user (PostgreSQL refuses to run as root). Messages go to stderr; stdout carries only
# the export lines, so a failed start leaves MELTLEDGER_TEST_PG_URL unset and prints why.
set -u

pg_bin() {
  local d
  for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
    [ -x "$d/initdb" ] && [ -x "$d/pg_ctl" ] && { echo "$d"; return 0; }
  done
  return 1
}

as_owner() {
  if [ "$(id -u)" = "0" ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

start() {
  local bin dir port
  bin=$(pg_bin) || { echo "[postgres] no initdb/pg_ctl under /usr/lib/postgresql/*/bin (install the Debian package postgresql)" >&2; return 1; }
  dir=$(mktemp -d "${TMPDIR:-/tmp}/meltledger-pg-XXXXXX")
  port=${MELTLEDGER_TEST_PG_PORT:-$(node -e 'const s=require("net").createServer();s.listen(0,"127.0.0.1",()=>{console.log(s.address().port);s.close()})')}
  if [ "$(id -u)" = "0" ]; then chown postgres "$dir"; fi
  chmod 700 "$dir"
  if ! as_owner "$bin/initdb" -D "$dir/data" -U meltledger --auth=trust --encoding=UTF8 --locale=C.UTF-8 >"$dir/initdb.log" 2>&1; then
    echo "[postgres] initdb failed:" >&2; cat "$dir/initdb.log" >&2; return 1
  fi
  if ! as_owner "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -t 60 \
      -o "-c listen_addresses=127.0.0.1 -c port=$port -c unix_socket_directories=$dir -c fsync=off -c max_connections=200" start >&2; then
    echo "[postgres] the server did not start:" >&2; cat "$dir/server.log" >&2; return 1
  fi
  echo "export MELTLEDGER_TEST_PG_URL=postgresql://meltledger@127.0.0.1:$port/postgres"
  echo "export MELTLEDGER_TEST_PG_DIR=$dir"
}

stop() {
  local dir=${1:-} bin
  [ -n "$dir" ] && [ -d "$dir/data" ] || return 0
  bin=$(pg_bin) && as_owner "$bin/pg_ctl" -D "$dir/data" -m fast -w stop >/dev/null 2>&1
  rm -rf "$dir"
}

case "${1:-}" in
  start) start ;;
  stop) stop "${2:-}" ;;
  *) echo "usage: $0 start | stop DIR" >&2; exit 2 ;;
esac
