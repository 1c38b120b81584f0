#!/usr/bin/env bash
# PostgreSQL for development and tests: Debian's server, a cluster in .data/pg, 127.0.0.1 only.
# Usage: scripts/db.sh start|stop|status|reset|create NAME|drop NAME
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT=$(pwd)
PGPORT=${PGPORT:-54329}
PGVER=${PGVER:-15}
BIN=/usr/lib/postgresql/$PGVER/bin
DATA=$ROOT/.data/pg
SOCK=$ROOT/.data/pg-sock
DBNAME=${PGDATABASE:-interstice}
LOG=$ROOT/.data/pg.log

as_pg() {
	if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

ensure_binaries() {
	[ -x "$BIN/initdb" ] && return 0
	echo "db: installing Debian's postgresql-$PGVER"
	if [ "$(id -u)" != 0 ]; then echo "db: need root to apt-get install postgresql-$PGVER" >&2; exit 1; fi
	export DEBIAN_FRONTEND=noninteractive
	apt-get update -qq >/dev/null
	apt-get install -y -qq "postgresql-$PGVER" >/dev/null
	# Debian's package starts its own cluster on 5432; we do not use it.
	(pg_ctlcluster "$PGVER" main stop 2>/dev/null || true)
}

ensure_cluster() {
	mkdir -p "$ROOT/.data" "$SOCK"
	if [ "$(id -u)" = 0 ]; then chown postgres "$SOCK"; touch "$LOG"; chown postgres "$LOG"; fi
	[ -f "$DATA/PG_VERSION" ] && return 0
	mkdir -p "$DATA"
	[ "$(id -u)" = 0 ] && chown postgres "$DATA"
	chmod 700 "$DATA"
	as_pg "$BIN/initdb" -D "$DATA" -U postgres -A trust -E UTF8 --locale=C.UTF-8 >/dev/null
}

running() { as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; }

psql_admin() { as_pg psql -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qtA "$@"; }

create_db() {
	local name=$1
	if [ -z "$(psql_admin -c "select 1 from pg_database where datname='$name'")" ]; then
		psql_admin -c "create database \"$name\"" >/dev/null
		echo "db: created database $name"
	fi
}

start() {
	ensure_binaries
	ensure_cluster
	if running; then
		echo "db: already running on 127.0.0.1:$PGPORT"
	else
		as_pg "$BIN/pg_ctl" -D "$DATA" -l "$LOG" -w -t 30 \
			-o "-c listen_addresses=127.0.0.1 -p $PGPORT -c unix_socket_directories=$SOCK -c fsync=off -c max_connections=200" start >/dev/null
		echo "db: started on 127.0.0.1:$PGPORT"
	fi
	create_db "$DBNAME"
}

case "${1:-status}" in
start) start ;;
stop) if [ -f "$DATA/PG_VERSION" ] && running; then as_pg "$BIN/pg_ctl" -D "$DATA" -m fast -w stop >/dev/null; echo "db: stopped"; else echo "db: not running"; fi ;;
status) if [ -f "$DATA/PG_VERSION" ] && running; then echo "db: running on 127.0.0.1:$PGPORT"; else echo "db: not running"; exit 3; fi ;;
reset) "$0" stop || true; rm -rf "$DATA"; "$0" start ;;
create) start >/dev/null; create_db "$2" ;;
drop) start >/dev/null; psql_admin -c "drop database if exists \"$2\" with (force)" >/dev/null; echo "db: dropped $2" ;;
*) echo "usage: $0 start|stop|status|reset|create NAME|drop NAME" >&2; exit 2 ;;
esac
