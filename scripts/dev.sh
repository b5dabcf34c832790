#!/usr/bin/env bash
# npm run dev: the API server in watch mode on :8080 and Expo's web dev server on :8081
# (open http://127.0.0.1:8081; metro.config.js passes /api/* through to :8080).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
prepare_app
# One process in watch mode: the workers run inside the server here.
export NODE_ENV=development PORT="${PORT:-8080}" KEELSON_INLINE_WORKER=true
npx tsx watch server/index.ts &
API=$!
trap 'kill $API 2>/dev/null || true' EXIT INT TERM
CI=1 EXPO_OFFLINE=1 npx expo start --web --port 8081
