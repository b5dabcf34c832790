#!/usr/bin/env bash
# Private PostgreSQL cluster for Keelson: a git-ignored data folder in the
# project, listening on 127.0.0.1 only, on a non-default port.
#   scripts/db.sh start   create (first time) and start the cluster, create the database
#   scripts/db.sh stop    stop it
#   scripts/db.sh status  say whether it runs
#   scripts/db.sh url     print the DATABASE_URL it serves
# Environment: KEELSON_PG_PORT (default 54329), KEELSON_PG_DIR (default .pgdata),
#              KEELSON_DB_NAME (default keelson).
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PORT="${KEELSON_PG_PORT:-54329}"
DATA="${KEELSON_PG_DIR:-$ROOT/.pgdata}"
DB="${KEELSON_DB_NAME:-keelson}"
PGUSER_NAME=keelson

find_bin() {
  local d
  for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
    if [[ -x "$d/pg_ctl" ]]; then echo "$d"; return 0; fi
  done
  if command -v pg_ctl >/dev/null 2>&1; then dirname "$(command -v pg_ctl)"; return 0; fi
  return 1
}

ensure_postgres() {
  if PGBIN="$(find_bin)"; then return 0; fi
  if [[ "$(id -u)" == "0" ]] && command -v apt-get >/dev/null 2>&1; then
    echo "keelson: PostgreSQL not found; installing Debian's postgresql package..." >&2
    apt-get update -qq >/dev/null
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends postgresql >/dev/null
    # Debian's package starts its own cluster on 5432; Keelson does not use it.
    (command -v pg_ctlcluster >/dev/null && for c in $(ls /etc/postgresql 2>/dev/null); do pg_ctlcluster "$c" main stop 2>/dev/null || true; done) || true
    PGBIN="$(find_bin)" || { echo "keelson: PostgreSQL install failed" >&2; exit 1; }
  else
    echo "keelson: PostgreSQL 15+ is required. Install it (Debian/Ubuntu: sudo apt-get install postgresql)" >&2
    echo "         or set DATABASE_URL to an existing database." >&2
    exit 1
  fi
}

# PostgreSQL refuses to run as root: run its tools as the postgres user then.
as_pg() {
  if [[ "$(id -u)" == "0" ]]; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi
}

is_running() {
  [[ -f "$DATA/postmaster.pid" ]] && as_pg "$PGBIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1
}

port_busy() {
  (exec 3<>"/dev/tcp/127.0.0.1/$PORT") 2>/dev/null && return 0 || return 1
}

url() { echo "postgres://$PGUSER_NAME@127.0.0.1:$PORT/$DB"; }

# As root, PostgreSQL runs as the postgres user, which must be able to reach the data folder.
# A checkout under a private home folder (e.g. /root) is not reachable: the cluster then lives in
# /var/lib/keelson-pg/<checkout hash>, and .pgdata in the project is a link to it.
place_data() {
  [[ "$(id -u)" == "0" && -z "${KEELSON_PG_DIR:-}" ]] || return 0
  if [[ -L "$DATA" ]]; then DATA="$(readlink -f "$DATA")"; return 0; fi
  if [[ -d "$DATA" ]] || runuser -u postgres -- test -x "$ROOT"; then return 0; fi
  local outside="/var/lib/keelson-pg/$(echo -n "$ROOT" | sha1sum | cut -c1-12)"
  mkdir -p "$outside" && chown postgres:postgres "$outside" && chmod 700 "$outside"
  ln -sfn "$outside" "$DATA"
  echo "keelson: the postgres user cannot reach $ROOT; the cluster lives in $outside (linked from .pgdata)" >&2
  DATA="$outside"
}

start() {
  ensure_postgres
  place_data
  if [[ ! -f "$DATA/PG_VERSION" ]]; then
    mkdir -p "$DATA"
    if [[ "$(id -u)" == "0" ]]; then chown postgres:postgres "$DATA"; fi
    chmod 700 "$DATA"
    # trust on loopback only: a private development cluster with no stored secret.
    as_pg "$PGBIN/initdb" -D "$DATA" -U "$PGUSER_NAME" --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
    {
      echo "listen_addresses = '127.0.0.1'"
      echo "port = $PORT"
      echo "unix_socket_directories = '$DATA'"
      echo "max_connections = 200"
      echo "shared_buffers = 128MB"
      echo "fsync = ${KEELSON_PG_FSYNC:-on}"
    } | as_pg tee -a "$DATA/postgresql.conf" >/dev/null
  fi
  if is_running; then
    :
  else
    rm -f "$DATA/postmaster.pid" 2>/dev/null || true
    if port_busy; then
      echo "keelson: port $PORT on 127.0.0.1 is already in use by another program." >&2
      echo "         Stop it, or choose another port with KEELSON_PG_PORT=<port>." >&2
      exit 1
    fi
    as_pg "$PGBIN/pg_ctl" -D "$DATA" -l "$DATA/server.log" -w -t 30 -o "-p $PORT -h 127.0.0.1 -k $DATA" start >/dev/null
  fi
  if ! as_pg "$PGBIN/psql" -h 127.0.0.1 -p "$PORT" -U "$PGUSER_NAME" -d postgres -tAc "select 1 from pg_database where datname='$DB'" | grep -q 1; then
    as_pg "$PGBIN/createdb" -h 127.0.0.1 -p "$PORT" -U "$PGUSER_NAME" "$DB"
  fi
}

stop() {
  PGBIN="$(find_bin)" || { echo "keelson: PostgreSQL not installed; nothing to stop" >&2; return 0; }
  if [[ -L "$DATA" ]]; then DATA="$(readlink -f "$DATA")"; fi
  if is_running; then as_pg "$PGBIN/pg_ctl" -D "$DATA" -m fast -w stop >/dev/null; echo "keelson: database stopped"; else echo "keelson: database not running"; fi
}

case "${1:-}" in
  start) start; echo "keelson: database ready at $(url)" >&2 ;;
  stop) stop ;;
  status) PGBIN="$(find_bin)" && { [[ -L "$DATA" ]] && DATA="$(readlink -f "$DATA")"; true; } && is_running && echo running || echo stopped ;;
  url) url ;;
  *) echo "usage: scripts/db.sh start|stop|status|url" >&2; exit 64 ;;
esac
