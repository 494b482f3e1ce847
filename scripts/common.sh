#!/usr/bin/env bash
# Shared set-up for npm start, npm test and npm run dev. Sourced, not run.
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
export PGPORT="${PGPORT:-54329}"
export BRACKLINE_DATA="${BRACKLINE_DATA:-$ROOT/.data}"
IS_ROOT=0; [ "$(id -u)" = 0 ] && IS_ROOT=1

say() { printf '[brackline] %s\n' "$*"; }
fail() { printf '[brackline] ERROR: %s\n' "$*" >&2; exit 1; }

# npm dependencies: `npm ci` when node_modules is missing or older than the lock.
ensure_node_modules() {
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    say "Installing npm dependencies (npm ci)…"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

# A Debian package, installed with apt-get when missing (root), else the exact command to run.
ensure_apt() {
  local bin="$1" pkg="$2"
  if ! command -v "$bin" >/dev/null 2>&1; then
    if [ $IS_ROOT = 1 ]; then
      say "Installing $pkg from Debian's packages…"
      apt-get update -qq >/dev/null
      DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$pkg" >/dev/null
    else
      fail "$pkg is missing. Install it with: sudo apt-get install -y $pkg"
    fi
  fi
}

# A random AUTH_SECRET kept in the git-ignored data folder, so sessions survive restarts.
ensure_auth_secret() {
  mkdir -p "$BRACKLINE_DATA"
  if [ -z "${AUTH_SECRET:-}" ]; then
    [ -f "$BRACKLINE_DATA/auth-secret" ] || node -e "process.stdout.write(require('crypto').randomBytes(32).toString('hex'))" > "$BRACKLINE_DATA/auth-secret"
    AUTH_SECRET="$(cat "$BRACKLINE_DATA/auth-secret")"
    export AUTH_SECRET
  fi
}

port_in_use() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

db_url() { printf 'postgres://app@127.0.0.1:%s/%s' "$PGPORT" "$1"; }
