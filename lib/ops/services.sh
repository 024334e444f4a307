#!/usr/bin/env bash
# Background services that run beside the web server: the local mail sink (an SMTP server on
# 127.0.0.1 that stores what it receives) and the background worker lib/mail/worker.ts (mail: producers,
# outbox → pg-boss → SMTP; the audit chain's full walks asked for on the chain page).
# start_services LOGDIR / stop_services; start_test_services RESULTS / stop_test_services.
# The functions export SMTP_HOST/SMTP_PORT/MAIL_SINK_DIR, so the web server started after them
# and the worker use the same SMTP settings. With SMTP_HOST set to a real host (not loopback),
# no sink is started and mail goes to that host.

_smtp_is_local() { case "${SMTP_HOST:-127.0.0.1}" in 127.0.0.1|localhost|::1) return 0 ;; *) return 1 ;; esac; }

_wait_port() { # _wait_port PORT SECONDS
  for _ in $(seq 1 $(($2 * 5))); do
    (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null && return 0
    sleep 0.2
  done
  echo "[services] nothing listens on 127.0.0.1:$1 after $2s" >&2
  return 1
}

_bg() { # _bg PIDFILE LOG SCRIPT: like tsx_run, in the background; the pid kept is tsx itself (exec)
  (cd "$ROOT" && NODE_OPTIONS="--conditions=react-server ${NODE_OPTIONS:-}" exec node_modules/.bin/tsx "$3") > "$2" 2>&1 &
  echo $! > "$1"
}

_start_mail() { # _start_mail PIDPREFIX LOGDIR
  local prefix="$1" logdir="$2"
  mkdir -p "$logdir"
  if _smtp_is_local; then
    export SMTP_HOST="${SMTP_HOST:-127.0.0.1}"
    mkdir -p "$MAIL_SINK_DIR"
    _bg "$RUN_DIR/$prefix-sink.pid" "$logdir/mail-sink.log" lib/mail/sink.ts
    _wait_port "$SMTP_PORT" 30 || { tail -n 20 "$logdir/mail-sink.log" >&2; return 1; }
    echo "[services] mail sink on 127.0.0.1:$SMTP_PORT, messages in $MAIL_SINK_DIR"
  fi
  _bg "$RUN_DIR/$prefix-worker.pid" "$logdir/mail-worker.log" lib/mail/worker.ts
  echo "[services] mail worker started (log: $logdir/mail-worker.log)"
}

start_services() {
  local logdir="${1:-$RUN_DIR}"
  export SMTP_PORT="${SMTP_PORT:-2525}"
  export MAIL_SINK_DIR="${MAIL_SINK_DIR:-$ROOT/.data/mail-sink}"
  _start_mail mail "$logdir"
}

stop_services() {
  stop_pidfile mail-worker
  stop_pidfile mail-sink
}

# The same services for a test run: the test SMTP port and a sink folder inside the results.
start_test_services() {
  local results="${1:?results folder}"
  export SMTP_HOST=127.0.0.1
  # test.sh's default SMTP_TEST_PORT (2625) would collide between side-by-side runs: derive
  # the port from E2E_PORT then (E2E_PORT + 20000), unless a port was chosen explicitly.
  local port="${SMTP_TEST_PORT:-2625}"
  if [ "$port" = 2625 ] && [ -n "${E2E_PORT:-}" ] && [ "${E2E_PORT}" != 3100 ]; then port=$((E2E_PORT + 20000)); fi
  export SMTP_PORT="$port"
  export MAIL_SINK_DIR="$results/mail-sink"
  export CHALKWING_MAIL_TICK_SECONDS="${CHALKWING_MAIL_TICK_SECONDS:-2}"
  export CHALKWING_MAIL_RETRY_DELAY="${CHALKWING_MAIL_RETRY_DELAY:-1}"
  _start_mail "e2e-mail-${CHALKWING_TEST_NAME:-t}" "$results"
}

stop_test_services() {
  stop_pidfile "e2e-mail-${CHALKWING_TEST_NAME:-t}-worker"
  stop_pidfile "e2e-mail-${CHALKWING_TEST_NAME:-t}-sink"
}
