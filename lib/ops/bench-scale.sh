#!/usr/bin/env bash
# The scale part of `npm run bench`: for each size, a fresh database of its own
# (chalkwing_bench_scale_<N>: migrations, demo seed, then `db/cli.ts scale` adding N students in
# N/25 cohorts), a production server of its own on loopback, and lib/bench/scale-run.ts loading
# every signed-in page and API that lists or summarises with autocannon beside /api/health.
# lib/bench/scale-report.ts then prints the tables and the targets.
#   CHALKWING_BENCH_STUDENTS  sizes, smallest first (default "100 10000")
#   CHALKWING_BENCH_SECONDS   autocannon duration per endpoint (default 10)
#   CHALKWING_BENCH_CONNECTIONS  (default 32, the target's figure)
#   CHALKWING_BENCH_PORT      the server's port (default 3291)
#   CHALKWING_BENCH_REUSE_BUILD=1  keep an existing build in .next-test-bench-scale
# Leaves git status clean: the build goes to .next-test-bench-scale, figures to .data/bench/scale.
set -uo pipefail
. "$(dirname "${BASH_SOURCE[0]}")/common.sh"
cd "$ROOT"
SIZES="${CHALKWING_BENCH_STUDENTS:-100 10000}"
PORT="${CHALKWING_BENCH_PORT:-3291}"
OUT="$ROOT/.data/bench/scale"
rm -rf "$OUT"; mkdir -p "$OUT"
export CHALKWING_DIST_DIR=.next-test-bench-scale
export NEXTAUTH_URL="http://127.0.0.1:$PORT"
PIDNAME="bench-scale-web-$PORT"
ensure_node_modules || exit 1
ensure_secret
trap 'stop_pidfile "$PIDNAME"' EXIT
bash db/cluster.sh start >/dev/null || { echo "[scale] PostgreSQL did not start" >&2; exit 1; }
echo "[scale] node $(node --version), $(nproc) CPUs, $(awk '/MemTotal/ {printf "%.0f GB", $2/1048576}' /proc/meminfo), $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | sed 's/^ *//')"

T0=$(date +%s)
if [ "${CHALKWING_BENCH_REUSE_BUILD:-0}" = 1 ] && [ -f "$CHALKWING_DIST_DIR/BUILD_ID" ]; then
  echo "[scale] reusing the build in $CHALKWING_DIST_DIR"
else
  echo "[scale] building the production bundle into $CHALKWING_DIST_DIR"
  db_urls chalkwing_bench_scale_build
  node node_modules/next/dist/bin/next build > "$OUT/build.log" 2>&1 || { tail -n 40 "$OUT/build.log"; exit 1; }
  echo "[scale] build took $(( $(date +%s) - T0 ))s"
fi

FILES=()
for N in $SIZES; do
  DB="chalkwing_bench_scale_$N"
  echo "[scale] $N students: database $DB (migrate, seed, scale)"
  T1=$(date +%s)
  bash db/cluster.sh create-db "$DB" --fresh >/dev/null || { echo "[scale] could not create $DB" >&2; continue; }
  db_urls "$DB"
  if ! { tsx_run db/cli.ts migrate >/dev/null && tsx_run db/cli.ts seed >/dev/null && tsx_run db/cli.ts scale --students "$N"; } > "$OUT/data-$N.log" 2>&1; then
    tail -n 20 "$OUT/data-$N.log"; echo "[scale] $N students: the data could not be made, size skipped" >&2; continue
  fi
  echo "[scale] $N students: data made in $(( $(date +%s) - T1 ))s"
  STUDENT_ID=$(psql "$DATABASE_URL" -Atc "SELECT id FROM people WHERE email = 'student@chalkwing.test'")
  NODE_ENV=production node node_modules/next/dist/bin/next start -p "$PORT" -H 127.0.0.1 > "$OUT/web-$N.log" 2>&1 &
  echo $! > "$RUN_DIR/$PIDNAME.pid"
  if wait_http "$NEXTAUTH_URL/api/health" 90; then
    BENCH_URL="$NEXTAUTH_URL" BENCH_OUT="$OUT/scale-$N.json" BENCH_STUDENTS="$N" BENCH_STUDENT_ID="$STUDENT_ID" \
      node_modules/.bin/tsx lib/bench/scale-run.ts && FILES+=("$OUT/scale-$N.json")
  else
    tail -n 20 "$OUT/web-$N.log"
  fi
  stop_pidfile "$PIDNAME"
done

[ ${#FILES[@]} -gt 0 ] || { echo "[scale] no size was measured" >&2; exit 1; }
node_modules/.bin/tsx lib/bench/scale-report.ts "${FILES[@]}" | tee "$OUT/report.md"
echo "[scale] took $(( $(date +%s) - T0 ))s; figures in $OUT"
