#!/usr/bin/env bash
# npm run faults: the fault tests, each on a PostgreSQL cluster of its own (made, restarted and killed by
# the test; the shared clusters of npm start and npm test are never touched). Prints the measured figures:
# seconds to recover after each restart and the requests failed during it. FAULT_ROUNDS (default 5)
# sets how many times the SIGKILL-during-upload test kills PostgreSQL.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export NODE_ENV=test LOG_LEVEL="${LOG_LEVEL:-silent}" FAULT_ROUNDS="${FAULT_ROUNDS:-5}"
ensure_node_modules
say "Fault tests (dedicated PostgreSQL clusters under $BRACKLINE_DATA/faults)"
npx vitest run --project faults "$@"
