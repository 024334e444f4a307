#!/usr/bin/env bash
# Project-local PostgreSQL cluster on 127.0.0.1 (Debian's postgresql package).
# Usage: db/cluster.sh start|stop|status|psql [args]
# Idempotent: start on a running cluster is a no-op; stop on a stopped one is not an error.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PGPORT="${CHALKWING_PG_PORT:-54329}"
# CHALKWING_PG_DIR: where the cluster lives (data, socket, log); default .data/pg in the checkout.
PGDIR="${CHALKWING_PG_DIR:-$ROOT/.data/pg}"
DATA="$PGDIR/data"
SOCK="$PGDIR/socket"
LOG="$PGDIR/server.log"
OWNER_ROLE="${CHALKWING_DB_OWNER:-chalkwing_owner}"
APP_ROLE="${CHALKWING_DB_APP:-chalkwing_app}"
OWNER_PW="${CHALKWING_DB_OWNER_PASSWORD:-chalkwing-owner-local}"
APP_PW="${CHALKWING_DB_APP_PASSWORD:-chalkwing-app-local}"

find_bin() {
  local d
  d=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
  echo "$d"
}

ensure_installed() {
  BIN=$(find_bin)
  if [ -z "$BIN" ] || [ ! -x "$BIN/initdb" ]; then
    echo "[db] installing PostgreSQL from Debian's packages" >&2
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq >&2
    apt-get install -y -qq postgresql >&2
    # Debian's package may start its own cluster on 5432; we do not use it.
    BIN=$(find_bin)
  fi
  [ -x "$BIN/initdb" ] || { echo "[db] PostgreSQL binaries not found" >&2; exit 1; }
}

as_pg() { (cd / && runuser -u postgres -- "$@"); }

psql_su() { as_pg "$BIN/psql" -h "$SOCK" -p "$PGPORT" -U postgres -v ON_ERROR_STOP=1 -qAt "$@"; }

start() {
  ensure_installed
  mkdir -p "$PGDIR" "$SOCK"
  chown postgres:postgres "$PGDIR" "$SOCK"
  if [ ! -f "$DATA/PG_VERSION" ]; then
    mkdir -p "$DATA"; chown postgres:postgres "$DATA"; chmod 700 "$DATA"
    as_pg "$BIN/initdb" -D "$DATA" -U postgres -E UTF8 --locale=C.UTF-8 --auth-local=trust --auth-host=scram-sha-256 --no-sync >/dev/null
    cat >> "$DATA/postgresql.conf" <<CONF
listen_addresses = '127.0.0.1'
port = $PGPORT
unix_socket_directories = '$SOCK'
max_connections = 200
CONF
    if [ "${CHALKWING_PG_FAST:-0}" = "1" ]; then echo "fsync = off" >> "$DATA/postgresql.conf"; fi
  fi
  local tries=0
  # Ready means: our own cluster runs and answers on its own socket (a server of someone else's
  # on the same TCP port must not pass for ours).
  until as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1 && as_pg "$BIN/pg_isready" -q -h "$SOCK" -p "$PGPORT"; do
    if ! as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; then
      as_pg "$BIN/pg_ctl" -D "$DATA" -l "$LOG" -w -t 30 start >/dev/null 2>&1 || true
    fi
    tries=$((tries + 1))
    [ $tries -gt 60 ] && { echo "[db] PostgreSQL did not start; see $LOG" >&2; tail -n 20 "$LOG" >&2; exit 1; }
    sleep 0.5
  done
  psql_su <<SQL
SELECT format('CREATE ROLE %I LOGIN PASSWORD %L', '$OWNER_ROLE', '$OWNER_PW') WHERE NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '$OWNER_ROLE') \gexec
SELECT format('CREATE ROLE %I LOGIN PASSWORD %L', '$APP_ROLE', '$APP_PW') WHERE NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '$APP_ROLE') \gexec
SQL
  echo "[db] PostgreSQL listening on 127.0.0.1:$PGPORT" >&2
}

# create_db NAME [--fresh]: a database owned by the owner role; the app role may only connect.
create_db() {
  local name="$1" fresh="${2:-}"
  ensure_installed
  if [ "$fresh" = "--fresh" ]; then
    psql_su -c "DROP DATABASE IF EXISTS \"$name\" WITH (FORCE)"
  fi
  psql_su <<SQL
SELECT format('CREATE DATABASE %I OWNER %I', '$name', '$OWNER_ROLE') WHERE NOT EXISTS (SELECT 1 FROM pg_database WHERE datname = '$name') \gexec
REVOKE ALL ON DATABASE "$name" FROM PUBLIC;
GRANT CONNECT ON DATABASE "$name" TO "$APP_ROLE";
SQL
}

stop() {
  BIN=$(find_bin)
  [ -n "$BIN" ] && [ -f "$DATA/PG_VERSION" ] || { echo "[db] not running" >&2; return 0; }
  as_pg "$BIN/pg_ctl" -D "$DATA" -m fast -w -t 60 stop >/dev/null 2>&1 || echo "[db] not running" >&2
  if as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; then
    echo "[db] PostgreSQL is still running after stop; see $LOG" >&2
    return 1
  fi
  # only a stale file of a server that is gone (e.g. after kill -9) is removed here
  rm -f "$DATA/postmaster.pid"
}

status() {
  BIN=$(find_bin)
  [ -n "$BIN" ] && [ -d "$SOCK" ] && as_pg "$BIN/pg_isready" -h "$SOCK" -p "$PGPORT"
}

cmd="${1:-}"; shift || true
case "$cmd" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  create-db) start; create_db "$@" ;;
  psql) ensure_installed; psql_su "$@" ;;
  *) echo "usage: db/cluster.sh start|stop|status|create-db NAME [--fresh]|psql" >&2; exit 2 ;;
esac
