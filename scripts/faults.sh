#!/usr/bin/env bash
# npm run faults: fault and scale-out tests that take minutes (kept out of npm test), on the local
# cluster's test database. Each test prints the figures it measured.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export NODE_ENV=test LOG_LEVEL="${LOG_LEVEL:-silent}"
ensure_node_modules
bash scripts/pg.sh up
bash scripts/pg.sh recreate brackline_test
DATABASE_URL="$(db_url brackline_test)" npx tsx server/db/migrate.ts
export TEST_DATABASE_URL="$(db_url brackline_test)"

status=0
# Several processes, one PostgreSQL: two app processes, two workers (creates its own database).
npx vitest run --project faults tests/faults/multi-process.fault.ts || status=1
exit $status
