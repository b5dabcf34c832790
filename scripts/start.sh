#!/usr/bin/env bash
# npm start: prepare everything on a fresh clone (packages, database, compiled server, web
# build), then run the server (API and web app on one port) and the worker process (projection
# runs, mail, exports) from compiled JavaScript. Ctrl-C stops both.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
prepare_app built
ensure_web_build
export PORT="${PORT:-8080}"
if [[ -z "${NODE_ENV:-}" ]]; then
  if [[ -n "${SESSION_SECRET:-}" && -n "${PUBLIC_URL:-}" && "${COOKIE_SECURE:-}" == "true" ]]; then
    export NODE_ENV=production
  else
    # A local trial on this machine: production needs SESSION_SECRET, PUBLIC_URL and
    # COOKIE_SECURE=true (HTTPS) and refuses to start without them.
    export NODE_ENV=development
    log "running as a local trial (NODE_ENV=development). For a real deployment set NODE_ENV=production with SESSION_SECRET, PUBLIC_URL and COOKIE_SECURE=true — see README."
  fi
fi
cat >&2 <<MSG
keelson: demo sign-ins (demo data only; password for all: keelson-demo-2026)
  admin@fernleigh.example     scheme administrator
  trustee@fernleigh.example   trustee
  actuary@fernleigh.example   actuary (two schemes)
  comms@fernleigh.example     communications officer
  board@fernleigh.example     board reviewer
keelson: Ctrl-C stops the server and the worker; 'npm run db:stop' stops the database.
MSG

if [[ "${KEELSON_INLINE_WORKER:-}" == "true" ]]; then
  exec node build/server.js
fi
# Without job control, background children ignore Ctrl-C: the trap passes it on as SIGTERM.
KEELSON_PROCESS=worker node build/worker.js &
WORKER=$!
KEELSON_PROCESS=server node build/server.js &
SERVER=$!
stop() { trap - INT TERM; kill -TERM "$SERVER" "$WORKER" 2>/dev/null || true; wait "$SERVER" "$WORKER" 2>/dev/null || true; }
trap 'stop; exit 0' INT TERM
# If either process ends on its own, stop the other too.
set +e
wait -n "$SERVER" "$WORKER"
code=$?
stop
exit "$code"
