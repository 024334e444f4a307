#!/usr/bin/env bash
# Project-local PostgreSQL cluster on 127.0.0.1 (Debian's postgresql package).
# Usage: db/cluster.sh start|stop|status|where|destroy|create-db NAME [--fresh]|copy-db NAME FROM|psql [args]
# Idempotent: start on a running cluster is a no-op; stop on a stopped one is not an error.
#
# Where the cluster lives (data, socket, log):
# - run as root, the server runs as the `postgres` user, who may not be able to enter the checkout
#   (root's home is 0700 on Debian). The cluster then lives in /var/lib/chalkwing/<folder>-<hash>,
#   named from the checkout's absolute path, so two checkouts never share a cluster;
# - run as an ordinary user, the server runs as that user, in .data/pg inside the checkout
#   (PostgreSQL is installed with sudo when missing);
# - CHALKWING_PG_DIR overrides both.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PGPORT="${CHALKWING_PG_PORT:-54329}"
if [ "$(id -u)" = 0 ]; then
  AS_ROOT=1
  PG_OS_USER=postgres
  CHECKOUT_TAG="$(printf %s "${ROOT##*/}" | tr -c 'A-Za-z0-9_.-' '_' | cut -c1-40)-$(printf '%s' "$ROOT" | sha256sum | cut -c1-12)"
  DEFAULT_PGDIR="/var/lib/chalkwing/$CHECKOUT_TAG"
else
  AS_ROOT=0
  PG_OS_USER="$(id -un)"
  DEFAULT_PGDIR="$ROOT/.data/pg"
fi
PGDIR="${CHALKWING_PG_DIR:-$DEFAULT_PGDIR}"
DATA="$PGDIR/data"
SOCK="$PGDIR/socket"
LOG="$PGDIR/server.log"
OWNER_ROLE="${CHALKWING_DB_OWNER:-chalkwing_owner}"
APP_ROLE="${CHALKWING_DB_APP:-chalkwing_app}"
OWNER_PW="${CHALKWING_DB_OWNER_PASSWORD:-chalkwing-owner-local}"
APP_PW="${CHALKWING_DB_APP_PASSWORD:-chalkwing-app-local}"

# fail SENTENCE: one plain sentence saying what went wrong and what to do, then exit 1.
fail() { echo "[db] $*" >&2; exit 1; }

find_bin() {
  local d
  d=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
  echo "$d"
}

ensure_installed() {
  BIN=$(find_bin)
  if [ -z "$BIN" ] || [ ! -x "$BIN/initdb" ]; then
    echo "[db] installing PostgreSQL from Debian's packages" >&2
    local sudo=()
    if [ "$AS_ROOT" = 0 ]; then
      command -v sudo >/dev/null 2>&1 || fail "PostgreSQL is not installed and this user cannot install it: run 'apt-get install postgresql' as root once, then try again."
      sudo=(sudo -n)
    fi
    export DEBIAN_FRONTEND=noninteractive
    "${sudo[@]}" apt-get update -qq >&2 && "${sudo[@]}" apt-get install -y -qq postgresql >&2 ||
      fail "Installing PostgreSQL with apt-get failed (see above): install the 'postgresql' package by hand, then try again."
    # Debian's package may start its own cluster on 5432; we do not use it.
    BIN=$(find_bin)
  fi
  [ -x "$BIN/initdb" ] || fail "PostgreSQL's programs are not in /usr/lib/postgresql/*/bin: install Debian's 'postgresql' package, then try again."
}

# as_pg CMD…: run a PostgreSQL program as the cluster's OS user, from a folder that user may enter.
as_pg() {
  if [ "$AS_ROOT" = 1 ]; then (cd / && runuser -u postgres -- "$@"); else (cd / && "$@"); fi
}

psql_su() { as_pg "$BIN/psql" -h "$SOCK" -p "$PGPORT" -U postgres -v ON_ERROR_STOP=1 -qAt "$@"; }

# make_dirs: the cluster's folders, owned by the server's user, each folder above reachable by it.
make_dirs() {
  if [ "$AS_ROOT" = 1 ] && [ -z "${CHALKWING_PG_DIR:-}" ]; then
    mkdir -p /var/lib/chalkwing && chmod 755 /var/lib/chalkwing
  fi
  mkdir -p "$PGDIR" "$SOCK" 2>/dev/null || fail "Cannot create the database folder $PGDIR: set CHALKWING_PG_DIR to a folder you may write, then try again."
  if [ "$AS_ROOT" = 1 ]; then chown postgres:postgres "$PGDIR" "$SOCK"; fi
  if ! as_pg test -x "$PGDIR" -a -w "$PGDIR"; then
    fail "The database folder $PGDIR is not reachable by the '$PG_OS_USER' user that runs PostgreSQL (a folder above it is closed to that user): set CHALKWING_PG_DIR to a folder that user may enter, then try again."
  fi
}

# explain_start_failure: why the server did not start, in one sentence, from its log.
explain_start_failure() {
  # only this start's lines of the log count
  local recent; recent=$(tail -c "+${LOG_FROM:-1}" "$LOG" 2>/dev/null || true)
  if grep -qiE "could not bind|address already in use" <<<"$recent"; then
    fail "PostgreSQL could not listen on 127.0.0.1:$PGPORT because another program (perhaps another checkout's database) uses that port: stop it (npm run stop in that checkout) or set CHALKWING_PG_PORT to a free port, then try again."
  fi
  if grep -qiE "permission denied" <<<"$recent"; then
    fail "PostgreSQL was refused access to its folder $PGDIR: make sure the '$PG_OS_USER' user may enter it, or set CHALKWING_PG_DIR to another folder, then try again (log: $LOG)."
  fi
  echo "[db] PostgreSQL did not start; the last lines of its log ($LOG):" >&2
  tail -n 10 "$LOG" >&2 2>/dev/null || true
  fail "PostgreSQL did not start: read the log lines above, fix what they name, then try again."
}

start() {
  ensure_installed
  make_dirs
  if [ ! -f "$DATA/PG_VERSION" ]; then
    mkdir -p "$DATA"
    if [ "$AS_ROOT" = 1 ]; then chown postgres:postgres "$DATA"; fi
    chmod 700 "$DATA"
    local out
    if ! out=$(as_pg "$BIN/initdb" -D "$DATA" -U postgres -E UTF8 --locale=C.UTF-8 --auth-local=trust --auth-host=scram-sha-256 --no-sync 2>&1); then
      echo "$out" | tail -n 3 | sed 's/^/[db]   initdb: /' >&2
      fail "PostgreSQL could not create its data folder $DATA: make sure the '$PG_OS_USER' user may enter and write it, or set CHALKWING_PG_DIR to a folder it may, then try again."
    fi
    cat >> "$DATA/postgresql.conf" <<CONF
listen_addresses = '127.0.0.1'
port = $PGPORT
unix_socket_directories = '$SOCK'
max_connections = 200
CONF
    if [ "${CHALKWING_PG_FAST:-0}" = "1" ]; then echo "fsync = off" >> "$DATA/postgresql.conf"; fi
  fi
  # a port chosen after the cluster was made (CHALKWING_PG_PORT) applies from the next start: the last line wins
  if [ "$(grep -E '^port = ' "$DATA/postgresql.conf" | tail -n 1 | awk '{print $3}')" != "$PGPORT" ] &&
    ! as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; then
    echo "port = $PGPORT" >> "$DATA/postgresql.conf"
  fi
  LOG_FROM=$(($(stat -c %s "$LOG" 2>/dev/null || echo 0) + 1))
  local tries=0
  # Ready means: our own cluster runs and answers on its own socket (a server of someone else's
  # on the same TCP port must not pass for ours).
  until as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1 && as_pg "$BIN/pg_isready" -q -h "$SOCK" -p "$PGPORT"; do
    if ! as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; then
      as_pg "$BIN/pg_ctl" -D "$DATA" -l "$LOG" -w -t 30 start >/dev/null 2>&1 || true
      # a server that exited at once will not come up by waiting
      if ! as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1 && [ $tries -ge 2 ]; then explain_start_failure; fi
    fi
    tries=$((tries + 1))
    [ $tries -gt 60 ] && explain_start_failure
    sleep 0.5
  done
  psql_su <<SQL
SELECT format('CREATE ROLE %I LOGIN PASSWORD %L', '$OWNER_ROLE', '$OWNER_PW') WHERE NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '$OWNER_ROLE') \gexec
SELECT format('CREATE ROLE %I LOGIN PASSWORD %L', '$APP_ROLE', '$APP_PW') WHERE NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '$APP_ROLE') \gexec
SQL
  echo "[db] PostgreSQL listening on 127.0.0.1:$PGPORT (data in $DATA)" >&2
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

# copy-db NAME FROM: NAME becomes a fresh copy of database FROM (schema, data and privileges), made
# from it as a template, which is much faster than migrating again. Nothing may be connected to FROM.
copy_db() {
  local name="$1" from="$2"
  ensure_installed
  psql_su -c "DROP DATABASE IF EXISTS \"$name\" WITH (FORCE)"
  psql_su -c "CREATE DATABASE \"$name\" TEMPLATE \"$from\" OWNER \"$OWNER_ROLE\""
  psql_su <<SQL
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

# stop-immediate: a crash as PostgreSQL sees one (no checkpoint; the next start replays the WAL).
# For fault tests on a throwaway cluster only.
stop_immediate() {
  BIN=$(find_bin)
  [ -n "$BIN" ] && [ -f "$DATA/PG_VERSION" ] || { echo "[db] not running" >&2; return 0; }
  as_pg "$BIN/pg_ctl" -D "$DATA" -m immediate -w -t 60 stop >/dev/null 2>&1 || echo "[db] not running" >&2
}

status() {
  BIN=$(find_bin)
  [ -n "$BIN" ] && [ -d "$SOCK" ] && as_pg "$BIN/pg_isready" -h "$SOCK" -p "$PGPORT"
}

# destroy: stop the cluster and remove its folder (every database in it is lost).
destroy() {
  stop
  rm -rf "$PGDIR"
  echo "[db] removed $PGDIR" >&2
}

cmd="${1:-}"; shift || true
case "$cmd" in
  start) start ;;
  stop) stop ;;
  stop-immediate) stop_immediate ;;
  status) status ;;
  where) echo "$PGDIR" ;;
  destroy) destroy ;;
  create-db) start; create_db "$@" ;;
  copy-db) start; copy_db "$@" ;;
  psql) ensure_installed; psql_su "$@" ;;
  *) echo "usage: db/cluster.sh start|stop|stop-immediate|status|where|destroy|create-db NAME [--fresh]|copy-db NAME FROM|psql" >&2; exit 2 ;;
esac
