#!/usr/bin/env bash
# PostgreSQL for this clone: Debian's server, our own cluster, 127.0.0.1 only (no Unix socket, so
# no socket-path length limit and no socket folder to share).
# Usage: scripts/db.sh start|stop|status|where|create NAME|drop NAME|copy FROM TO|reset [--yes]|destroy [--yes]
#
# Two clusters per clone:
#   the app's (default): PostgreSQL's own durability settings (fsync, full_page_writes and
#     synchronous_commit on), port $PGPORT or 54329. `npm start` and `npm run dev` use it.
#   DB_CLUSTER=test: the throwaway cluster of `npm test`, port $PGPORT or 54330. Its databases are
#     recreated every run, so it trades crash safety for speed (fsync and friends off).
#
# Where it lives: in .data/ of the clone when the server's user can reach it; otherwise (root with
# the clone under a mode-700 home) in /var/lib/interstice/<folder>-<hash of the clone's path>,
# owned by the postgres user. As root the server runs as `postgres` (PostgreSQL refuses root); as
# any other user it runs as that user.
source "$(dirname "$0")/lib.sh"

CLUSTER=${DB_CLUSTER:-app}
case "$CLUSTER" in
app) PGPORT=${PGPORT:-54329}; NAME=pg ;;
test) PGPORT=${PGPORT:-54330}; NAME=pg-test ;;
*) die "db: DB_CLUSTER is '$CLUSTER'; use 'app' (the default) or 'test'" ;;
esac
DBNAME=${PGDATABASE:-interstice}
EXTERNAL_BASE=/var/lib/interstice

as_pg() { if is_root; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi; }

# The folder that holds the cluster's data folder and log.
cluster_home() {
	if ! is_root; then echo "$ROOT/.data"; return 0; fi
	if getent passwd postgres >/dev/null && (cd / && runuser -u postgres -- test -x "$ROOT/.data") 2>/dev/null; then
		echo "$ROOT/.data"
		return 0
	fi
	local base hash
	base=$(basename "$ROOT" | tr -c 'A-Za-z0-9._\n-' '-' | cut -c1-40)
	hash=$(printf '%s' "$ROOT" | sha256sum | cut -c1-12)
	echo "$EXTERNAL_BASE/$base-$hash"
}

# A fresh machine gets the server package first: it also creates the postgres user, which decides
# where the cluster can live.
case "${1:-status}" in start | create | drop | reset) find_pg_bindir >/dev/null || ensure_pg_bindir ;; esac

HOME_DIR=$(cluster_home)
DATA=$HOME_DIR/$NAME
LOG=$HOME_DIR/$NAME.log
external() { [ "$HOME_DIR" != "$ROOT/.data" ]; }

prepare_home() {
	if external; then
		mkdir -p "$EXTERNAL_BASE"
		chmod 755 "$EXTERNAL_BASE"
		mkdir -p "$HOME_DIR"
		# Which clone this folder belongs to, for whoever finds it later.
		printf '%s\n' "$ROOT" >"$HOME_DIR/clone-path"
		chown -R postgres:postgres "$HOME_DIR"
		chmod 700 "$HOME_DIR"
	fi
	if is_root; then
		touch "$LOG"
		chown postgres "$LOG"
	fi
}

ensure_cluster() {
	prepare_home
	[ -f "$DATA/PG_VERSION" ] && return 0
	mkdir -p "$DATA"
	if is_root; then chown postgres "$DATA"; fi
	chmod 700 "$DATA"
	echo "db: creating the $CLUSTER cluster in $DATA"
	as_pg "$PG_BIN/initdb" -D "$DATA" -U postgres -A trust -E UTF8 --locale=C.UTF-8 >/dev/null
}

have_cluster() { [ -f "$DATA/PG_VERSION" ] && PG_BIN=$(find_pg_bindir "$DATA"); }
running() { as_pg "$PG_BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; }

# Database names come from our scripts, but go through psql variables all the same.
psql_admin() { "$PG_BIN/psql" -X -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qtA "$@"; }

create_db() {
	if [ -z "$(echo "select 1 from pg_database where datname = :'n'" | psql_admin -v n="$1")" ]; then
		echo 'create database :"n"' | psql_admin -v n="$1" >/dev/null
		echo "db: created database $1"
	fi
}

where_line() {
	if external; then
		echo "db: the postgres user cannot enter $ROOT, so its $CLUSTER cluster lives in $DATA"
	else
		echo "db: $CLUSTER cluster in $DATA"
	fi
}

start() {
	ensure_pg_bindir "$DATA"
	ensure_cluster
	where_line
	if running; then
		echo "db: already running on 127.0.0.1:$PGPORT"
	else
		local opts="-c listen_addresses=127.0.0.1 -p $PGPORT -c unix_socket_directories='' -c max_connections=200"
		# Only the throwaway cluster gives up crash safety; the app's keeps PostgreSQL's defaults.
		if [ "$CLUSTER" = test ]; then opts="$opts -c fsync=off -c full_page_writes=off -c synchronous_commit=off"; fi
		if port_open "$PGPORT"; then die "db: 127.0.0.1:$PGPORT is already taken by another server; choose another PGPORT"; fi
		if ! as_pg "$PG_BIN/pg_ctl" -D "$DATA" -l "$LOG" -w -t 60 -o "$opts" start >/dev/null; then
			echo "db: PostgreSQL did not start; the end of $LOG:" >&2
			tail -n 15 "$LOG" >&2 || true
			exit 1
		fi
		echo "db: started on 127.0.0.1:$PGPORT"
	fi
	create_db "$DBNAME"
}

stop() {
	if have_cluster && running; then
		as_pg "$PG_BIN/pg_ctl" -D "$DATA" -m fast -w -t 60 stop >/dev/null
		echo "db: stopped"
	else
		echo "db: not running"
	fi
}

confirm() {
	local what=$1 yes=${2:-}
	[ "$yes" = --yes ] && return 0
	if [ -t 0 ]; then
		printf '%s\nType yes to go on: ' "$what"
		local answer
		read -r answer
		[ "$answer" = yes ] && return 0
	fi
	die "db: not confirmed (add --yes); nothing changed"
}

destroy() {
	stop
	rm -rf "$DATA" "$LOG"
	if external && [ -z "$(ls -A "$HOME_DIR" 2>/dev/null | grep -v '^clone-path$' || true)" ]; then rm -rf "$HOME_DIR"; fi
	echo "db: removed the $CLUSTER cluster ($DATA)"
}

case "${1:-status}" in
start) start ;;
stop) stop ;;
status) if have_cluster && running; then echo "db: running on 127.0.0.1:$PGPORT ($DATA)"; else echo "db: not running"; exit 3; fi ;;
where) echo "$DATA" ;;
create) start >/dev/null; create_db "$2" ;;
drop) start >/dev/null; echo 'drop database if exists :"n" with (force)' | psql_admin -v n="$2" >/dev/null; echo "db: dropped $2" ;;
copy)
	# TO made anew as a copy of FROM (PostgreSQL's template copy: nothing may be connected to FROM).
	start >/dev/null
	echo 'drop database if exists :"t" with (force)' | psql_admin -v t="$3" >/dev/null
	echo 'create database :"t" template :"f"' | psql_admin -v f="$2" -v t="$3" >/dev/null
	echo "db: copied $2 to $3"
	;;
reset)
	confirm "This deletes every database in $DATA (make a copy first with npm run backup)." "${2:-}"
	destroy
	start
	;;
destroy)
	confirm "This deletes the $CLUSTER cluster in $DATA and every database in it." "${2:-}"
	destroy
	;;
*) echo "usage: $0 start|stop|status|where|create NAME|drop NAME|copy FROM TO|reset [--yes]|destroy [--yes]" >&2; exit 2 ;;
esac
