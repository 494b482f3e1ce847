#!/usr/bin/env bash
# npm test: the same set-up as npm start with separate test databases, then typecheck, lint,
# unit + API + component tests, the client build and the browser tests. Non-zero on any failure.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export NODE_ENV=test LOG_LEVEL="${LOG_LEVEL:-silent}"

ensure_node_modules
ensure_apt chromium chromium
ensure_apt ogr2ogr gdal-bin
# Tests may run the shared cluster without fsync when they start it; npm start restarts it with the safe settings.
export PG_RELAXED=true
bash scripts/pg.sh up
for db in brackline_test brackline_e2e; do
  bash scripts/pg.sh recreate "$db"
  DATABASE_URL="$(db_url "$db")" npx tsx server/db/migrate.ts
done
export TEST_DATABASE_URL="$(db_url brackline_test)"
export E2E_DATABASE_URL="$(db_url brackline_e2e)"
mkdir -p "$BRACKLINE_DATA/results"
rm -f "$BRACKLINE_DATA/results/"*.json

status=0
say "Typecheck"
npx tsc --noEmit -p tsconfig.json || status=1
say "Lint"
npm run --silent lint || status=1

say "Unit, API and component tests"
npx vitest run --project node --project dom --reporter=default --reporter=json --outputFile.json="$BRACKLINE_DATA/results/unit.json" || status=1

# The fault tests that take under a minute; npm run faults runs them all (database restarts included).
say "Fault tests (a PostgreSQL cluster of their own)"
npx vitest run --project faults tests/faults/crash-during-upload.fault.ts tests/faults/pg-settings.fault.ts --reporter=default --reporter=json --outputFile.json="$BRACKLINE_DATA/results/faults.json" || status=1

say "Client build (production, as npm start serves it)"
NODE_ENV=production npx vite build --logLevel warn || status=1

say "Browser tests (Debian chromium)"
npx vitest run --project e2e --reporter=default --reporter=json --outputFile.json="$BRACKLINE_DATA/results/e2e.json" || status=1

node scripts/summarise-results.mjs "$BRACKLINE_DATA/results" || status=1
[ $status = 0 ] || say "FAILED: see the typecheck, lint or test output above"
exit $status
