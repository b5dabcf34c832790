#!/usr/bin/env bash
# npm start: prepare everything on a fresh clone, then serve API and web app on one port.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
prepare_app
ensure_web_build
export NODE_ENV="${NODE_ENV:-production}"
export PORT="${PORT:-8080}"
cat >&2 <<MSG
keelson: demo sign-ins (demo data only; password for all: keelson-demo-2026)
  admin@fernleigh.example     scheme administrator
  trustee@fernleigh.example   trustee
  actuary@fernleigh.example   actuary (two schemes)
  comms@fernleigh.example     communications officer
  board@fernleigh.example     board reviewer
keelson: Ctrl-C stops the server; 'npm run db:stop' stops the database.
MSG
exec node --import tsx server/index.ts
