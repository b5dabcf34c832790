#!/usr/bin/env bash
# npm run dev: API server in watch mode on :8080 and Expo's web dev server on :8081 (which proxies nothing:
# open http://127.0.0.1:8080 for the built app, or :8081 with EXPO_PUBLIC_API_BASE=http://127.0.0.1:8080).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
ensure_node_modules
ensure_database
npx tsx db/migrate.ts
npx tsx db/seed.ts
export NODE_ENV=development PORT="${PORT:-8080}"
npx tsx watch server/index.ts &
API=$!
trap 'kill $API 2>/dev/null || true' EXIT INT TERM
CI=1 EXPO_OFFLINE=1 npx expo start --web --port 8081
