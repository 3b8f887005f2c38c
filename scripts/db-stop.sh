#!/usr/bin/env bash
# Stops this checkout's MariaDB by its pid file and waits until the process is gone.
set -euo pipefail
source "$(dirname "$0")/env.sh"
if [ ! -f "$DB_PID_FILE" ]; then
	log "no MariaDB pid file for port $DB_PORT: nothing to stop"
	exit 0
fi
pid="$(cat "$DB_PID_FILE")"
if kill -0 "$pid" 2>/dev/null; then
	kill -TERM "$pid"
	for _ in $(seq 1 60); do kill -0 "$pid" 2>/dev/null || break; sleep 0.5; done
	kill -0 "$pid" 2>/dev/null && { kill -KILL "$pid"; log "MariaDB did not stop in 30 s: killed"; }
fi
rm -f "$DB_PID_FILE"
log "MariaDB on port $DB_PORT stopped"
