#!/usr/bin/env bash
# A project-local PostgreSQL + PostGIS cluster on loopback (stack.md §5).
#   scripts/pg.sh up     install what is missing, init the cluster, start it, create the databases
#   scripts/pg.sh stop   stop the cluster
#   scripts/pg.sh restart  restart it (fast shutdown), as a minor upgrade or a failover does
# Settings: PGPORT (default 54329), BRACKLINE_DATA (default <project>/.data).
# PostgreSQL's own defaults for fsync, full_page_writes and synchronous_commit are kept: a power cut
# must not lose or corrupt committed data. PG_RELAXED=true (npm test alone sets it) starts the cluster
# without them for speed; a later `up` without it (npm start, npm run dev) restarts such a cluster
# with the safe settings, so the app never runs on a relaxed cluster.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PGPORT="${PGPORT:-54329}"
DATA_ROOT="${BRACKLINE_DATA:-$ROOT/.data}"
PGDATA="$DATA_ROOT/pg"
IS_ROOT=0; [ "$(id -u)" = 0 ] && IS_ROOT=1

say() { printf '[brackline] %s\n' "$*"; }
fail() { printf '[brackline] ERROR: %s\n' "$*" >&2; exit 1; }

pg_version() { ls /usr/lib/postgresql 2>/dev/null | sort -n | tail -1; }

ensure_packages() {
  local v; v="$(pg_version)"
  local need=()
  [ -n "$v" ] && [ -x "/usr/lib/postgresql/$v/bin/initdb" ] || need+=(postgresql)
  if [ -n "$v" ]; then
    [ -f "/usr/share/postgresql/$v/extension/postgis.control" ] || need+=("postgresql-$v-postgis-3")
  fi
  if [ ${#need[@]} -gt 0 ]; then
    if [ $IS_ROOT = 1 ]; then
      say "Installing ${need[*]} from Debian's packages…"
      apt-get update -qq >/dev/null
      DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${need[@]}" >/dev/null
      v="$(pg_version)"
      if [ ! -f "/usr/share/postgresql/$v/extension/postgis.control" ]; then
        DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "postgresql-$v-postgis-3" >/dev/null
      fi
    else
      fail "PostgreSQL/PostGIS are missing. Install them with: sudo apt-get install -y ${need[*]} (then run this command again)"
    fi
  fi
}

runas() { if [ $IS_ROOT = 1 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }

port_in_use() { (exec 3<>"/dev/tcp/127.0.0.1/$PGPORT") 2>/dev/null; }

# Server options: loopback only, a socket in the data folder, and the durability settings.
server_opts() {
  local opts="-c listen_addresses=127.0.0.1 -p $PGPORT -k $PGDATA -c max_connections=200 -c jit=off"
  if [ "${PG_RELAXED:-false}" = "true" ]; then
    opts="$opts -c fsync=off -c synchronous_commit=off -c full_page_writes=off"
  fi
  printf '%s' "$opts"
}

running_fsync() { "$PGBIN/psql" -h 127.0.0.1 -p "$PGPORT" -U app -d postgres -tAc "show fsync" 2>/dev/null || true; }

up() {
  ensure_packages
  local v; v="$(pg_version)"; PGBIN="/usr/lib/postgresql/$v/bin"
  mkdir -p "$DATA_ROOT"
  if [ $IS_ROOT = 1 ]; then
    # postgres must be able to reach the data folder through every parent directory.
    if ! runuser -u postgres -- test -x "$DATA_ROOT"; then
      fail "The postgres user cannot reach $DATA_ROOT (a parent folder is not traversable). Set BRACKLINE_DATA to a folder it can reach, e.g. BRACKLINE_DATA=/var/tmp/brackline"
    fi
  fi
  if [ ! -f "$PGDATA/PG_VERSION" ]; then
    say "Creating the local PostgreSQL cluster in $PGDATA"
    mkdir -p "$PGDATA"; [ $IS_ROOT = 1 ] && chown postgres:postgres "$PGDATA"; chmod 700 "$PGDATA"
    runas "$PGBIN/initdb" -D "$PGDATA" -U app --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
  fi
  if runas "$PGBIN/pg_ctl" -D "$PGDATA" status >/dev/null 2>&1; then
    if [ "${PG_RELAXED:-false}" != "true" ] && [ "$(running_fsync)" = "off" ]; then
      say "PostgreSQL is running with the test settings (fsync off); restarting it with the safe settings"
      runas "$PGBIN/pg_ctl" -D "$PGDATA" -l "$PGDATA/server.log" -m fast -w -t 60 restart -o "$(server_opts)" >/dev/null \
        || fail "PostgreSQL did not restart; see $PGDATA/server.log"
    else
      say "PostgreSQL already running (port $PGPORT)"
    fi
  else
    if port_in_use; then
      fail "Port $PGPORT on 127.0.0.1 is already in use by another program. Choose another port with PGPORT, e.g. PGPORT=54339 npm start"
    fi
    runas "$PGBIN/pg_ctl" -D "$PGDATA" -l "$PGDATA/server.log" -w -t 60 start \
      -o "$(server_opts)" >/dev/null \
      || fail "PostgreSQL did not start; see $PGDATA/server.log"
    say "PostgreSQL started on 127.0.0.1:$PGPORT"
  fi
  for db in "$@"; do
    if ! "$PGBIN/psql" -h 127.0.0.1 -p "$PGPORT" -U app -d postgres -tAc "select 1 from pg_database where datname='$db'" | grep -q 1; then
      "$PGBIN/createdb" -h 127.0.0.1 -p "$PGPORT" -U app "$db"
      say "Created database $db"
    fi
  done
}

stop() {
  local v; v="$(pg_version)"; PGBIN="/usr/lib/postgresql/$v/bin"
  if [ -f "$PGDATA/PG_VERSION" ] && runas "$PGBIN/pg_ctl" -D "$PGDATA" status >/dev/null 2>&1; then
    runas "$PGBIN/pg_ctl" -D "$PGDATA" -m fast -w stop >/dev/null && say "PostgreSQL stopped"
  else
    say "PostgreSQL is not running"
  fi
}

recreate() {
  local v; v="$(pg_version)"; PGBIN="/usr/lib/postgresql/$v/bin"
  local db="$1"
  "$PGBIN/dropdb" -h 127.0.0.1 -p "$PGPORT" -U app --if-exists --force "$db"
  "$PGBIN/createdb" -h 127.0.0.1 -p "$PGPORT" -U app "$db"
  # Test databases only: commits need not wait for the disk (a crash may lose the last few, never corrupts).
  if [ "${PG_RELAXED:-false}" = "true" ]; then
    "$PGBIN/psql" -h 127.0.0.1 -p "$PGPORT" -U app -d postgres -qc "ALTER DATABASE \"$db\" SET synchronous_commit = off" >/dev/null
  fi
}

restart() {
  local v; v="$(pg_version)"; PGBIN="/usr/lib/postgresql/$v/bin"
  runas "$PGBIN/pg_ctl" -D "$PGDATA" -l "$PGDATA/server.log" -m fast -w -t 60 restart -o "$(server_opts)" >/dev/null \
    || fail "PostgreSQL did not restart; see $PGDATA/server.log"
  say "PostgreSQL restarted on 127.0.0.1:$PGPORT"
}

cmd="${1:-up}"; shift || true
case "$cmd" in
  up) up "$@" ;;
  stop) stop ;;
  restart) restart ;;
  recreate) recreate "$@" ;;
  *) fail "usage: scripts/pg.sh up [db…] | stop | restart | recreate db" ;;
esac
