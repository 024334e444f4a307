#!/usr/bin/env bash
# The README's first command: all set-up on a fresh machine, then serve the demo at
# http://127.0.0.1:3000. `npm run demo -- --reset` recreates the demo database first.
# Ctrl-C (or `npm run stop`) stops the server, its services and the database.
set -euo pipefail
. "$(dirname "${BASH_SOURCE[0]}")/common.sh"
. "$ROOT/lib/ops/services.sh"
cd "$ROOT"
RESET=0; DETACH="${CHALKWING_DETACH:-0}"
for a in "$@"; do
  case "$a" in --reset) RESET=1 ;; --detach) DETACH=1 ;; *) echo "unknown option $a" >&2; exit 2 ;; esac
done
PORT="${PORT:-3000}"

# A second start replaces the first.
stop_pidfile web; stop_services

ensure_node_modules
ensure_secret
bash db/cluster.sh start
if [ "$RESET" = 1 ]; then bash db/cluster.sh create-db chalkwing --fresh; else bash db/cluster.sh create-db chalkwing; fi
db_urls chalkwing
export NEXTAUTH_URL="http://127.0.0.1:$PORT"
export CHALKWING_MAIL_TRAY="${CHALKWING_MAIL_TRAY:-on}"
tsx_run db/cli.ts migrate
tsx_run db/cli.ts seed
echo "[start] building the production bundle"
node node_modules/next/dist/bin/next build > "$RUN_DIR/build.log" 2>&1 || { tail -n 40 "$RUN_DIR/build.log"; exit 1; }
start_services "$RUN_DIR"
NODE_ENV=production node node_modules/next/dist/bin/next start -p "$PORT" -H 127.0.0.1 > "$RUN_DIR/web.log" 2>&1 &
echo $! > "$RUN_DIR/web.pid"
wait_http "http://127.0.0.1:$PORT/api/health" 60
echo
echo "Chalkwing is running at http://127.0.0.1:$PORT  (demo accounts in README.md; logs in .data/run/)"
if [ "$DETACH" = 1 ]; then
  echo "Detached. Stop everything with: npm run stop"
  exit 0
fi
echo "Press Ctrl-C to stop."
trap 'echo; bash "$ROOT/lib/ops/stop.sh"; exit 0' INT TERM
wait "$(cat "$RUN_DIR/web.pid")" || true
bash "$ROOT/lib/ops/stop.sh"
