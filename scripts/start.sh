#!/usr/bin/env bash
# npm start: install what is missing, start PostgreSQL, migrate, load the demo data,
# start the local fakes and serve the app on one loopback port. Production by default: the client is
# React's production build and the server runs with NODE_ENV=production (npm run dev keeps the dev tools).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"
export PORT="${PORT:-3000}"
export SMTP_FAKE_PORT="${SMTP_FAKE_PORT:-2525}"
export SMTP_URL="${SMTP_URL:-smtp://127.0.0.1:$SMTP_FAKE_PORT}"
export APP_URL="${APP_URL:-http://127.0.0.1:$PORT}"
# Paid alerts plan: the local payment fake and gauge feed (server/env.ts names them).
export PAYMENT_FAKE_PORT="${PAYMENT_FAKE_PORT:-3010}"
export PAYMENT_API_URL="${PAYMENT_API_URL:-http://127.0.0.1:$PAYMENT_FAKE_PORT}"
export GAUGE_FEED_PORT="${GAUGE_FEED_PORT:-3011}"
export GAUGE_FEED_URL="${GAUGE_FEED_URL:-http://127.0.0.1:$GAUGE_FEED_PORT}"
export NODE_ENV="${NODE_ENV:-production}"

if port_in_use "$PORT"; then
  fail "Port $PORT is already in use: Brackline (or another program) is running there. Open http://127.0.0.1:$PORT, stop the other program, or choose another port: PORT=3100 npm start"
fi
if port_in_use "$SMTP_FAKE_PORT"; then
  fail "Port $SMTP_FAKE_PORT (the local e-mail fake) is in use: is Brackline already running? Stop it, or choose another port: SMTP_FAKE_PORT=2526 npm start"
fi

if [ "${START_FAKES:-true}" != "false" ]; then
  if port_in_use "$PAYMENT_FAKE_PORT"; then
    fail "Port $PAYMENT_FAKE_PORT (the local payment fake) is in use: is Brackline already running? Stop it, or choose another port: PAYMENT_FAKE_PORT=3020 npm start"
  fi
  if port_in_use "$GAUGE_FEED_PORT"; then
    fail "Port $GAUGE_FEED_PORT (the local gauge feed) is in use: is Brackline already running? Stop it, or choose another port: GAUGE_FEED_PORT=3021 npm start"
  fi
fi

ensure_node_modules
bash scripts/pg.sh up brackline
export DATABASE_URL="${DATABASE_URL:-$(db_url brackline)}"
ensure_auth_secret
npx tsx server/db/migrate.ts
npx tsx server/db/seed.ts

# Build the client when there is no build, the sources are newer than it, or it is a development
# build (React's jsxDEV in the chunks, left by an older npm start or another tool).
if [ ! -f dist/index.html ] || [ -n "$(find src shared index.html vite.config.ts tailwind.config.ts -newer dist/index.html -print -quit)" ] \
  || grep -qs jsxDEV dist/assets/*.js; then
  say "Building the client (production build)…"
  # vite build makes React's production build only when NODE_ENV is production (or unset).
  NODE_ENV=production npx vite build --logLevel warn
fi
say "Serving the production client build with NODE_ENV=$NODE_ENV (npm run dev for the development tools)"

cat <<MSG

[brackline] Demo accounts (password: brackline-demo-2026)
  grower@brackline.test      grower with held and candidate leases
  adviser@brackline.test     extension adviser
  regulator@brackline.test   shellfish authority, Fennick Coast jurisdiction
  admin@brackline.test       administrator (people, outbox, audit log)
[brackline] Ctrl-C stops the app; npm run db:stop stops PostgreSQL.
MSG
exec npx tsx server/index.ts
