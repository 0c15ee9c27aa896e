#!/usr/bin/env bash
# npm test: installs what the tests need (Debian's Chromium when missing), then type check, lint,
# production build, vitest (unit, integration, API) and Playwright end-to-end in Chromium on SQLite,
# then the database and API tests on PostgreSQL (tests/postgres/run.sh installs postgresql when missing).
set -euo pipefail
cd "$(dirname "$0")/.."
export NEXT_TELEMETRY_DISABLED=1

need_apt=()
[ -x /usr/bin/chromium ] || need_apt+=(chromium)
command -v pdftoppm >/dev/null 2>&1 || need_apt+=(poppler-utils)
if [ ${#need_apt[@]} -gt 0 ]; then
  echo "== installing ${need_apt[*]} from Debian"
  SUDO=""; [ "$(id -u)" = 0 ] || SUDO="sudo"
  $SUDO apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq "${need_apt[@]}" >/dev/null
fi
[ -d node_modules/next ] || npm ci --no-audit --no-fund

mkdir -p .data/test-reports
echo "== type check"; npx tsc --noEmit
echo "== lint"; npx eslint . --max-warnings=0
echo "== production build"; npm run build
echo "== vitest (unit, integration, API)"
npx vitest run --reporter=default --reporter=json --outputFile.json=.data/test-reports/vitest.json
echo "== Playwright end-to-end in Chromium"
status=0
NODE_OPTIONS=--conditions=react-server PLAYWRIGHT_JSON_OUTPUT_NAME=.data/test-reports/playwright.json \
  npx playwright test --reporter=list,json || status=$?
echo "== PostgreSQL: the database and API tests again, on a throwaway cluster (npm run test:postgres)"
bash tests/postgres/run.sh || status=$?
r=.data/test-reports
node tests/support/summarise.mjs --vitest $r/vitest.json --playwright $r/playwright.json --vitest $r/postgres-vitest.json --vitest $r/postgres-instances.json
exit "$status"
