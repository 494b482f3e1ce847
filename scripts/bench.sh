#!/usr/bin/env bash
# npm run bench: the benchmarks, with the local cluster up for the database sections.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
ensure_node_modules
# The same PostgreSQL settings as the runs the speed issues measured their "now" with (fsync off): the bench
# measures the computation, not the disk. npm start restarts the cluster with the safe settings.
export PG_RELAXED=true
bash scripts/pg.sh up brackline_bench
# A cluster npm start left running keeps its safe settings; restart it with these (a running app rides through a
# restart, see "Production by default"; the next npm start restarts it safe again).
if [ "$("/usr/lib/postgresql/$(ls /usr/lib/postgresql | sort -n | tail -1)/bin/psql" -h 127.0.0.1 -p "$PGPORT" -U app -d postgres -tAc 'show fsync')" = "on" ]; then
  bash scripts/pg.sh restart
fi
export DATABASE_URL="$(db_url brackline_bench)"
npx tsx server/db/migrate.ts
# The client benchmarks measure the production build.
npx vite build --logLevel warn
npx tsx bench/run-bench.ts "$@"
