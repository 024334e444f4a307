#!/usr/bin/env bash
# Stops the web server, its services and the project's PostgreSQL cluster. Safe to run twice.
set -uo pipefail
. "$(dirname "${BASH_SOURCE[0]}")/common.sh"
. "$ROOT/lib/ops/services.sh"
stop_pidfile web
stop_pidfile e2e-web
stop_services
bash "$ROOT/db/cluster.sh" stop
echo "[stop] Chalkwing stopped"
