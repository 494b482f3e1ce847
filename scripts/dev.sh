#!/usr/bin/env bash
# npm run dev: the API in watch mode on PORT (3000) and the Vite dev server on 5173 proxying to it.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export PORT="${PORT:-3000}" SMTP_FAKE_PORT="${SMTP_FAKE_PORT:-2525}" NODE_ENV=development SERVE_CLIENT=false
export SMTP_URL="${SMTP_URL:-smtp://127.0.0.1:$SMTP_FAKE_PORT}" APP_URL="${APP_URL:-http://127.0.0.1:5173}"
ensure_node_modules
bash scripts/pg.sh up brackline
export DATABASE_URL="${DATABASE_URL:-$(db_url brackline)}"
ensure_auth_secret
npx tsx server/db/migrate.ts
npx tsx server/db/seed.ts
npx tsx watch server/index.ts &
API_PID=$!
trap 'kill $API_PID 2>/dev/null' EXIT INT TERM
npx vite
