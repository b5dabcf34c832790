#!/usr/bin/env bash
# npm test: prepare (packages, PostgreSQL, Chromium, web build), then typecheck,
# lint, and vitest (unit, API against the real database, browser tests).
set -uo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
set -e
ensure_node_modules
ensure_database
ensure_chromium
set +e
mkdir -p test-artifacts
passed=0; failed=0
check() { # name, command...
  local name="$1"; shift
  log "$name..."
  if "$@"; then passed=$((passed+1)); log "$name passed"; else failed=$((failed+1)); log "$name FAILED"; fi
}
check typecheck npx tsc --noEmit -p .
check lint npx eslint .
ensure_web_build || { failed=$((failed+1)); }
npx vitest run --reporter=default --reporter=json --outputFile.json=test-artifacts/vitest.json "$@"
vitest_rc=$?
read -r vp vf < <(node -e '
  try { const r = require("./test-artifacts/vitest.json"); console.log(r.numPassedTests, r.numFailedTests + (r.numRuntimeErrorTestSuites ?? 0) + r.testResults.filter(t => t.status === "failed" && t.assertionResults.length === 0).length); }
  catch { console.log(0, 1); }')
passed=$((passed+vp)); failed=$((failed+vf))
if (( vitest_rc != 0 && vf == 0 )); then failed=$((failed+1)); fi
echo
echo "Summary (typecheck, lint and vitest tests): $passed passed, $failed failed"
echo "$passed passed, $failed failed"
(( failed == 0 ))
