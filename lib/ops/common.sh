#!/usr/bin/env bash
# Shared by start.sh, stop.sh and test.sh: paths, the local secret, dependency install.
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
RUN_DIR="$ROOT/.data/run"
mkdir -p "$RUN_DIR"
# Next.js would otherwise ask to send usage data home from every build and server start
export NEXT_TELEMETRY_DISABLED=1
export CHALKWING_PG_PORT="${CHALKWING_PG_PORT:-54329}"
PG_HOST_PORT="127.0.0.1:$CHALKWING_PG_PORT"
export DATABASE_APP_ROLE="${DATABASE_APP_ROLE:-chalkwing_app}"

db_urls() { # db_urls NAME: exports DATABASE_URL (app role) and DATABASE_OWNER_URL (owner role) for NAME
  export DATABASE_URL="postgres://chalkwing_app:chalkwing-app-local@$PG_HOST_PORT/$1"
  export DATABASE_OWNER_URL="postgres://chalkwing_owner:chalkwing-owner-local@$PG_HOST_PORT/$1"
}

ensure_secret() { # a NEXTAUTH secret made once per checkout, kept out of git
  local f="$ROOT/.data/secret.env"
  if [ ! -f "$f" ]; then
    umask 077
    echo "NEXTAUTH_SECRET=$(node -e 'console.log(require("crypto").randomBytes(32).toString("base64url"))')" > "$f"
    echo "CHALKWING_SIGNING_SECRET=$(node -e 'console.log(require("crypto").randomBytes(32).toString("base64url"))')" >> "$f"
  fi
  set -a; . "$f"; set +a
}

ensure_node_modules() { # npm ci when node_modules is missing or the lock file changed
  local stamp="$ROOT/node_modules/.chalkwing-lock-hash"
  local want; want=$(sha256sum "$ROOT/package-lock.json" | cut -d' ' -f1)
  if [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
    echo "[setup] installing npm packages (npm ci)"
    rm -f "$stamp"
    (cd "$ROOT" && npm ci --no-audit --no-fund --loglevel=error) || { echo "[setup] npm ci failed" >&2; return 1; }
    echo "$want" > "$stamp"
  fi
}

ensure_chromium() { # the full browser (screenshots by hand, the Curve Lab bench) and its headless shell (the e2e layer)
  if [ ! -x /usr/bin/chromium ] || [ ! -x /usr/bin/chromium-headless-shell ]; then
    echo "[setup] installing Chromium and its headless shell from Debian's packages"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq && apt-get install -y -qq chromium chromium-headless-shell >/dev/null
  fi
}

ensure_poppler() { # pdftotext, which the training-record test reads the printed PDF with
  if ! command -v pdftotext >/dev/null 2>&1; then
    echo "[setup] installing poppler-utils (pdftotext) from Debian's packages"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq && apt-get install -y -qq poppler-utils >/dev/null
  fi
}

ensure_topology_packages() { # nginx (the reverse proxy) and PgBouncer, for the two-server topology (lib/ops/topology.sh)
  local have_nginx=0 have_pgbouncer=0
  { command -v nginx || [ -x /usr/sbin/nginx ]; } >/dev/null 2>&1 && have_nginx=1
  { command -v pgbouncer || [ -x /usr/sbin/pgbouncer ]; } >/dev/null 2>&1 && have_pgbouncer=1
  if [ "$have_nginx" = 0 ] || [ "$have_pgbouncer" = 0 ]; then
    echo "[setup] installing nginx-light and pgbouncer from Debian's packages"
    export DEBIAN_FRONTEND=noninteractive
    local sudo=()
    [ "$(id -u)" = 0 ] || sudo=(sudo -n)
    # Debian may start the packages' own services (nginx on port 80, PgBouncer on 6432); the
    # topology uses neither: it starts its own nginx and PgBouncer with their own configuration
    "${sudo[@]}" apt-get update -qq && "${sudo[@]}" apt-get install -y -qq nginx-light pgbouncer >/dev/null
  fi
}

tsx_run() { # server-only modules need the react-server condition outside Next
  (cd "$ROOT" && NODE_OPTIONS="--conditions=react-server ${NODE_OPTIONS:-}" node_modules/.bin/tsx "$@")
}

stop_pidfile() { # stop_pidfile NAME: stop the process recorded in .data/run/NAME.pid, and its children
  local f="$RUN_DIR/$1.pid"
  [ -f "$f" ] || return 0
  local pid; pid=$(cat "$f")
  if kill -0 "$pid" 2>/dev/null; then
    pkill -TERM -P "$pid" 2>/dev/null || true
    kill -TERM "$pid" 2>/dev/null || true
    for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
    kill -KILL "$pid" 2>/dev/null || true
  fi
  rm -f "$f"
}

wait_http() { # wait_http URL SECONDS
  local url="$1" secs="${2:-60}"
  for _ in $(seq 1 $((secs * 5))); do
    curl -fsS -o /dev/null "$url" 2>/dev/null && return 0
    sleep 0.2
  done
  echo "[setup] $url did not answer within ${secs}s" >&2
  return 1
}
