#!/usr/bin/env bash
# npm run test:postgres: the database tests on PostgreSQL. Starts a throwaway cluster (tests/postgres/cluster.sh,
# which installs Debian's postgresql when missing), then on it:
#   1. the unit tests that use a database (each file gets a fresh database; tests/unit/db runs the migrations up,
#      down and up),
#   2. the API suite against the production build (a fresh database for the run),
#   3. two app instances and two snapshot workers over one database (tests/postgres/two-instances.test.ts),
# stops the cluster and ends with "N passed, N failed". Builds the app first when there is no build.
set -uo pipefail
cd "$(dirname "$0")/../.."
export NEXT_TELEMETRY_DISABLED=1
started=$(date +%s)

tmp=$(mktemp -d "${TMPDIR:-/tmp}/stochos-pg-XXXXXX")
cleanup() {
  tests/postgres/cluster.sh stop "$tmp"
  rm -rf "$tmp"
}
trap cleanup EXIT

echo "== PostgreSQL: starting a throwaway cluster"
if ! admin=$(tests/postgres/cluster.sh start "$tmp"); then
  echo "could not start PostgreSQL"
  echo "0 passed, 1 failed"
  exit 1
fi
echo "   $admin"
export STOCHOS_TEST_PG_URL="$admin"

if [ ! -f .next/BUILD_ID ]; then
  echo "== production build"
  npm run build || { echo "0 passed, 1 failed"; exit 1; }
fi

reports=.data/test-reports
mkdir -p "$reports"
rm -f "$reports"/postgres-*.json
status=0

# Unit test files that open a database (useFreshDb), found rather than listed so new ones join on their own.
mapfile -t db_units < <(grep -rl --include='*.test.ts' 'useFreshDb' tests/unit | sort)

echo "== PostgreSQL: database unit tests (${#db_units[@]} files) and the API suite"
npx vitest run --project unit --project api "${db_units[@]}" tests/integration/api/ \
  --reporter=default --reporter=json --outputFile.json="$reports/postgres-vitest.json" || status=$?

echo "== PostgreSQL: two app instances and two snapshot workers over one database"
npx vitest run --project postgres tests/postgres/ \
  --reporter=default --reporter=json --outputFile.json="$reports/postgres-instances.json" || status=$?

echo "== PostgreSQL: done in $(($(date +%s) - started)) s"
node tests/support/summarise.mjs --vitest "$reports/postgres-vitest.json" --vitest "$reports/postgres-instances.json"
exit "$status"
