#!/usr/bin/env bash
# The README's second command: installs what is missing, starts PostgreSQL, builds once,
# runs every test layer (unit, integration, end-to-end), prints the time of each phase and
# ends with one line: "tests: N passed, N failed".
#   npm test                       everything
#   npm test -- --only unit        one layer (static | unit | integration | e2e), extra args go to jest
# Parallel runs on one machine: set CHALKWING_TEST_NAME (databases, build folder, port).
set -uo pipefail
. "$(dirname "${BASH_SOURCE[0]}")/common.sh"
cd "$ROOT"
ONLY=""; JEST_EXTRA=()
while [ $# -gt 0 ]; do
  case "$1" in --only) ONLY="$2"; shift 2 ;; *) JEST_EXTRA+=("$1"); shift ;; esac
done
NAME="${CHALKWING_TEST_NAME:-t}"
RESULTS="$ROOT/.data/test-results/$NAME"; rm -rf "$RESULTS"; mkdir -p "$RESULTS"
export CHALKWING_DIST_DIR="${CHALKWING_DIST_DIR:-.next-test-$NAME}"
E2E_PORT="${E2E_PORT:-3100}"
export E2E_BASE_URL="http://127.0.0.1:$E2E_PORT"
SMTP_TEST_PORT="${SMTP_TEST_PORT:-2625}"
FAILED_PHASES=()
NON_JEST=0 # failures outside jest (type check, lint, build, server start): one each
fail_phase() { FAILED_PHASES+=("$1"); NON_JEST=$((NON_JEST + 1)); }

phase_start() { PHASE="$1"; PHASE_T0=$(date +%s); echo; echo "=== phase: $PHASE"; }
phase_end() { echo "=== phase: $PHASE took $(( $(date +%s) - PHASE_T0 ))s"; }
want() { [ -z "$ONLY" ] || [ "$ONLY" = "$1" ]; }

summary() {
  [ ${#FAILED_PHASES[@]} -gt 0 ] && echo "failed phases: ${FAILED_PHASES[*]}"
  CHALKWING_NON_JEST_FAILURES="$NON_JEST" node "$ROOT/lib/ops/summarise-results.mjs" "$RESULTS" "${#FAILED_PHASES[@]}"
}
PG_WAS_RUNNING=0
cleanup() {
  stop_pidfile "e2e-web-$NAME"; stop_test_services 2>/dev/null || true
  # leave the database as we found it: stop it when this run started it
  [ "$PG_WAS_RUNNING" = 1 ] || bash "$ROOT/db/cluster.sh" stop >/dev/null 2>&1 || true
}
trap cleanup EXIT

T_ALL=$(date +%s)
phase_start "setup (npm packages, Chromium, PostgreSQL)"
ensure_node_modules || { echo "npm ci failed"; echo "tests: 0 passed, 1 failed"; exit 1; }
want e2e && ensure_chromium
want e2e && ensure_topology_packages
want integration && ensure_poppler
ensure_secret
export CHALKWING_PG_FAST=1
bash db/cluster.sh status >/dev/null 2>&1 && PG_WAS_RUNNING=1
bash db/cluster.sh start || { echo "tests: 0 passed, 1 failed"; exit 1; }
phase_end

run_jest() { # run_jest PROJECT [jest args]
  local project="$1"; shift
  node node_modules/jest/bin/jest.js --selectProjects "$project" --json --outputFile="$RESULTS/$project.json" "$@" "${JEST_EXTRA[@]}" || { FAILED_PHASES+=("$project"); [ -f "$RESULTS/$project.json" ] || NON_JEST=$((NON_JEST + 1)); }
}

if want static; then
  phase_start "static checks (TypeScript, ESLint, Prettier)"
  node node_modules/typescript/bin/tsc --noEmit -p tsconfig.json || fail_phase typescript
  node node_modules/eslint/bin/eslint.js . || fail_phase eslint
  node node_modules/prettier/bin/prettier.cjs --check --log-level warn . || { echo "formatting differs: run npm run format"; fail_phase prettier; }
  phase_end
fi

if want unit; then
  phase_start "unit tests"
  run_jest unit
  phase_end
fi

if want integration; then
  phase_start "integration tests (real PostgreSQL, real SMTP on loopback)"
  bash db/cluster.sh create-db "chalkwing_${NAME}_int" --fresh >/dev/null
  db_urls "chalkwing_${NAME}_int"
  export NEXTAUTH_SECRET NEXTAUTH_URL="http://127.0.0.1:$E2E_PORT"
  if tsx_run db/cli.ts migrate; then run_jest integration --runInBand; else fail_phase migrate; fi
  phase_end
fi

if want e2e; then
  phase_start "production build"
  bash db/cluster.sh create-db "chalkwing_${NAME}_e2e" --fresh >/dev/null
  db_urls "chalkwing_${NAME}_e2e"
  export NEXTAUTH_URL="$E2E_BASE_URL" CHALKWING_MAIL_TRAY=on
  tsx_run db/cli.ts migrate && tsx_run db/cli.ts seed || fail_phase seed
  if node node_modules/next/dist/bin/next build > "$RESULTS/build.log" 2>&1; then
    phase_end
    phase_start "end-to-end tests (headless Chromium against the production build)"
    . "$ROOT/lib/ops/services.sh"
    start_test_services "$RESULTS"
    NODE_ENV=production node node_modules/next/dist/bin/next start -p "$E2E_PORT" -H 127.0.0.1 > "$RESULTS/web.log" 2>&1 &
    echo $! > "$RUN_DIR/e2e-web-$NAME.pid"
    if wait_http "$E2E_BASE_URL/api/health" 60; then
      run_jest e2e --runInBand
    else
      tail -n 30 "$RESULTS/web.log"; fail_phase e2e-server
    fi
    stop_pidfile "e2e-web-$NAME"
    phase_end
  else
    tail -n 40 "$RESULTS/build.log"; fail_phase build; phase_end
  fi
fi

echo
echo "=== all phases took $(( $(date +%s) - T_ALL ))s"
summary
