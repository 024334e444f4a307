#!/usr/bin/env bash
# npm run bench: the calculation bench (lib/aero/bench/run.ts) and the scale bench
# (lib/ops/bench-scale.sh). CHALKWING_BENCH_PARTS chooses ("aero", "scale"; default both).
# Exits non-zero when the calculation bench fails its targets or a part cannot run; the scale
# targets are reported, not enforced.
set -uo pipefail
. "$(dirname "${BASH_SOURCE[0]}")/common.sh"
cd "$ROOT"
ensure_node_modules || exit 1
rc=0
for part in ${CHALKWING_BENCH_PARTS:-aero scale}; do
  case "$part" in
    aero) node_modules/.bin/tsx lib/aero/bench/run.ts || rc=1 ;;
    scale) bash lib/ops/bench-scale.sh || rc=1 ;;
    *) echo "[bench] unknown part '$part' (aero, scale)" >&2; rc=2 ;;
  esac
done
exit $rc
