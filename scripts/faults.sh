#!/usr/bin/env bash
# npm run faults: the fault and scale-out tests, minutes each. The restart and crash tests make, restart and kill
# PostgreSQL clusters of their own (the shared clusters of npm start and npm test are never touched); the
# multi-process test (two app processes, two workers) makes its own database on the local test cluster.
# Each prints the figures it measured. FAULT_ROUNDS (default 5) sets how many times the
# SIGKILL-during-upload test kills PostgreSQL.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export NODE_ENV=test LOG_LEVEL="${LOG_LEVEL:-silent}" FAULT_ROUNDS="${FAULT_ROUNDS:-5}" PG_RELAXED=true
ensure_node_modules
bash scripts/pg.sh up
bash scripts/pg.sh recreate brackline_test
DATABASE_URL="$(db_url brackline_test)" npx tsx server/db/migrate.ts
export TEST_DATABASE_URL="$(db_url brackline_test)"
say "Fault tests (dedicated PostgreSQL clusters under $BRACKLINE_DATA/faults, and the multi-process test)"
npx vitest run --project faults "$@"
