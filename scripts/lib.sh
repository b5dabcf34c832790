#!/usr/bin/env bash
# Shared preparation for npm start / npm test / npm run dev.
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"

log() { echo "keelson: $*" >&2; }

ensure_node_modules() {
  local major
  major="$(node -p 'process.versions.node.split(".")[0]')"
  if (( major < 20 )); then log "Node.js 20 or later is required (found $(node -v))."; exit 1; fi
  if [[ ! -d node_modules ]] || [[ package-lock.json -nt node_modules/.package-lock.json ]]; then
    log "installing npm packages (npm ci)..."
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

# Uses DATABASE_URL when set; otherwise starts the private cluster and exports its URL.
ensure_database() {
  if [[ -n "${DATABASE_URL:-}" ]]; then
    log "using DATABASE_URL (no private cluster started)"
  else
    bash scripts/db.sh start
    DATABASE_URL="$(bash scripts/db.sh url)"
    export DATABASE_URL
  fi
}

web_build_stale() {
  [[ ! -f dist/index.html ]] && return 0
  [[ -n "$(find app components hooks constants assets simulation app.json package-lock.json -newer dist/index.html -type f 2>/dev/null | head -1)" ]]
}

ensure_web_build() {
  if web_build_stale; then
    log "building the web app (expo export)..."
    rm -rf dist
    CI=1 EXPO_OFFLINE=1 npx expo export --platform web >/tmp/keelson-expo-export.log 2>&1 || { cat /tmp/keelson-expo-export.log >&2; log "web build failed"; exit 1; }
  fi
}

ensure_chromium() {
  if [[ -x /usr/bin/chromium ]]; then return 0; fi
  if [[ "$(id -u)" == "0" ]] && command -v apt-get >/dev/null 2>&1; then
    log "installing Debian's Chromium for browser tests..."
    apt-get update -qq >/dev/null
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends chromium >/dev/null
  else
    log "Chromium is required for browser tests: sudo apt-get install chromium"
    exit 1
  fi
}

server_build_stale() {
  [[ ! -f build/.stamp ]] && return 0
  [[ -n "$(find server db simulation constants scripts/build-server.ts package-lock.json -newer build/.stamp -type f 2>/dev/null | head -1)" ]]
}

# The compiled server and worker (build/, git-ignored): rebuilt when a source file is newer.
ensure_server_build() {
  if server_build_stale; then
    log "building the server (esbuild)..."
    npx tsx scripts/build-server.ts >&2 || { log "server build failed"; exit 1; }
  fi
}

# Packages, database, migrations and (when empty) the demo scheme: what start and dev both need.
# `npm start` runs them from the compiled build; `npm run dev` through tsx.
prepare_app() {
  ensure_node_modules
  ensure_database
  if [[ "${1:-}" == "built" ]]; then
    ensure_server_build
    node build/migrate.js
    node build/seed.js
  else
    npx tsx db/migrate.ts
    npx tsx db/seed.ts
  fi
}
