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
# jest workers for the integration layer (each on its own database copy); 1 runs the files one by one
INT_WORKERS="${CHALKWING_INT_WORKERS:-2}"
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
  # a build still running in the background (the run was interrupted): stop it and its children
  if [ -n "${BUILD_PID:-}" ] && kill -0 "$BUILD_PID" 2>/dev/null; then pkill -TERM -P "$BUILD_PID" 2>/dev/null; kill "$BUILD_PID" 2>/dev/null; fi
  for lane in harness rest all; do
    stop_pidfile "e2e-web-$NAME-$lane"
    stop_pidfile "e2e-mail-$NAME-$lane-worker"; stop_pidfile "e2e-mail-$NAME-$lane-sink"
  done
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
  # the type check runs beside ESLint and Prettier (one CPU each); its output is shown after them
  node node_modules/typescript/bin/tsc --noEmit -p tsconfig.json > "$RESULTS/tsc.log" 2>&1 &
  TSC_PID=$!
  node node_modules/eslint/bin/eslint.js . || fail_phase eslint
  node node_modules/prettier/bin/prettier.cjs --check --log-level warn . || { echo "formatting differs: run npm run format"; fail_phase prettier; }
  wait "$TSC_PID" || fail_phase typescript
  cat "$RESULTS/tsc.log"
  # the build below need not type-check the same tree again (next.config.ts)
  export CHALKWING_TYPECHECKED=1
  phase_end
fi

# The production build (and the seeded demo database the end-to-end layer starts from) is made
# in the background while the unit and integration layers run: those wait on PostgreSQL, SMTP
# and timers for much of their time, and the build fills the idle CPU. Its own environment
# (database, mail tray) stays inside the subshell. Exit 0 built, 3 migrate/seed failed, 4 build failed.
E2E_DB="chalkwing_${NAME}_e2e"
build_app() {
  (
    db_urls "$E2E_DB"
    export NEXTAUTH_URL="$E2E_BASE_URL" CHALKWING_MAIL_TRAY=on
    { tsx_run db/cli.ts migrate && tsx_run db/cli.ts seed; } > "$RESULTS/seed.log" 2>&1 || exit 3
    node node_modules/next/dist/bin/next build > "$RESULTS/build.log" 2>&1 || exit 4
  )
}
BUILD_PID=""
if want e2e; then
  bash db/cluster.sh create-db "$E2E_DB" --fresh >/dev/null
  BUILD_T0=$(date +%s)
  echo; echo "=== production build started (beside the unit and integration tests)"
  build_app &
  BUILD_PID=$!
fi

if want unit; then
  phase_start "unit tests"
  run_jest unit
  phase_end
fi

if want integration; then
  phase_start "integration tests (real PostgreSQL, real SMTP on loopback)"
  # migrated once, then copied (as a template) for each jest worker: tests/setup/integration.ts
  # points worker N at "<database>_wN", so no two files write to one database at once
  INT_DB="chalkwing_${NAME}_int"
  bash db/cluster.sh create-db "$INT_DB" --fresh >/dev/null
  db_urls "$INT_DB"
  export NEXTAUTH_SECRET NEXTAUTH_URL="http://127.0.0.1:$E2E_PORT"
  if tsx_run db/cli.ts migrate; then
    if [ "$INT_WORKERS" -gt 1 ]; then
      for i in $(seq 1 "$INT_WORKERS"); do bash db/cluster.sh copy-db "${INT_DB}_w$i" "$INT_DB" >/dev/null || fail_phase copy-db; done
      CHALKWING_INT_DB_COPIES="$INT_WORKERS" run_jest integration --maxWorkers="$INT_WORKERS"
    else
      run_jest integration --runInBand
    fi
  else fail_phase migrate; fi
  phase_end
fi

# e2e_lane LANE PORT DATABASE: one lane of the end-to-end layer with its own database, mail sink,
# mail worker and `next start` on PORT (all from the one production build), running jest in band.
# CHALKWING_E2E_LANE tells jest.config.ts which files are the lane's. Exit 0 passed, 1 tests
# failed (results written), 2 the lane could not run.
e2e_lane() {
  local lane="$1" port="$2" db="$3" dir="$RESULTS/lane-$1"
  mkdir -p "$dir"
  (
    export E2E_PORT="$port" E2E_BASE_URL="http://127.0.0.1:$port" NEXTAUTH_URL="http://127.0.0.1:$port"
    export CHALKWING_TEST_NAME="$NAME-$lane" SMTP_TEST_PORT=$((port + 20000)) CHALKWING_E2E_LANE="$lane"
    db_urls "$db"
    . "$ROOT/lib/ops/services.sh"
    start_test_services "$dir" || exit 2
    NODE_ENV=production node node_modules/next/dist/bin/next start -p "$port" -H 127.0.0.1 > "$dir/web.log" 2>&1 &
    echo $! > "$RUN_DIR/e2e-web-$NAME-$lane.pid"
    rc=0
    if wait_http "$E2E_BASE_URL/api/health" 90; then
      node node_modules/jest/bin/jest.js --selectProjects e2e --runInBand --passWithNoTests --json --outputFile="$RESULTS/e2e-$lane.json" \
        "${JEST_EXTRA[@]}" || rc=1
      [ -f "$RESULTS/e2e-$lane.json" ] || rc=2
    else
      tail -n 30 "$dir/web.log"; rc=2
    fi
    stop_pidfile "e2e-web-$NAME-$lane"; stop_test_services
    exit "$rc"
  )
}

if want e2e; then
  phase_start "production build (what remained of it after the unit and integration tests)"
  wait "$BUILD_PID"; BUILD_RC=$?
  echo "the build took $(( $(date +%s) - BUILD_T0 ))s from its start"
  [ "$BUILD_RC" = 3 ] && { cat "$RESULTS/seed.log"; fail_phase seed; }
  db_urls "$E2E_DB"
  export NEXTAUTH_URL="$E2E_BASE_URL" CHALKWING_MAIL_TRAY=on
  if [ "$BUILD_RC" = 0 ]; then
    phase_end
    phase_start "end-to-end tests (headless Chromium against the production build)"
    # A whole run splits the layer in two lanes side by side, each with a copy of the seeded
    # demo database: "harness" (the authorisation harness, which fingerprints every table, and
    # the accessibility crawl) and "rest". A run with jest arguments (one file, a pattern) is one
    # lane unless CHALKWING_E2E_LANES says otherwise.
    LANES="${CHALKWING_E2E_LANES:-$([ ${#JEST_EXTRA[@]} -eq 0 ] && echo 2 || echo 1)}"
    if [ "$LANES" -gt 1 ]; then
      bash db/cluster.sh copy-db "${E2E_DB}_rest" "$E2E_DB" >/dev/null || fail_phase copy-db
      e2e_lane harness "$E2E_PORT" "$E2E_DB" > "$RESULTS/lane-harness.log" 2>&1 &
      LANE_A=$!
      e2e_lane rest $((E2E_PORT + 1)) "${E2E_DB}_rest" > "$RESULTS/lane-rest.log" 2>&1 &
      LANE_B=$!
      wait "$LANE_A"; RC_A=$?
      wait "$LANE_B"; RC_B=$?
      for lane in harness rest; do echo "--- lane $lane"; cat "$RESULTS/lane-$lane.log"; done
      RCS=("$RC_A" "$RC_B")
    else
      e2e_lane all "$E2E_PORT" "$E2E_DB"; RCS=("$?")
    fi
    for rc in "${RCS[@]}"; do
      case "$rc" in 0) ;; 1) FAILED_PHASES+=(e2e) ;; *) fail_phase e2e-lane ;; esac
    done
    phase_end
  else
    [ "$BUILD_RC" = 4 ] && { tail -n 40 "$RESULTS/build.log"; fail_phase build; }
    phase_end
  fi
fi

echo
echo "=== all phases took $(( $(date +%s) - T_ALL ))s"
summary
