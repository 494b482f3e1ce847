#!/usr/bin/env bash
# npm run worker: the pg-boss workers (screening, alerts, gauge feed) without an HTTP server.
# Locally it joins the cluster npm start runs (same database, same AUTH_SECRET); in production set
# DATABASE_URL, AUTH_SECRET, SMTP_URL, APP_URL and the PAYMENT_* settings exactly as the app processes have them.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
ensure_node_modules
export DATABASE_URL="${DATABASE_URL:-$(db_url brackline)}"
export SMTP_URL="${SMTP_URL:-smtp://127.0.0.1:${SMTP_FAKE_PORT:-2525}}"
ensure_auth_secret
exec npx tsx server/worker.ts
