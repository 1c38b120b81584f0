#!/usr/bin/env bash
# npm start: from a fresh clone to a running app with demo data on http://127.0.0.1:3000.
# `npm start -- --processes 2` (or `npm run start:cluster`) serves the same demo from N app
# processes behind nginx on that address, the way a deployment with several processes or
# machines runs (docs/scaling.md); photos are then always in the object store, which every
# process sees.
source "$(dirname "$0")/lib.sh"

PROCESSES=${CLUSTER_PROCESSES:-1}
while [ $# -gt 0 ]; do
	case "$1" in
	--processes=*) PROCESSES=${1#--processes=} ;;
	--processes) PROCESSES=${2:-}; shift ;;
	*) die "npm start: unknown option '$1' (known: --processes N)" ;;
	esac
	shift
done
case "$PROCESSES" in
'' | *[!0-9]* | 0) die "npm start: --processes must be a whole number of at least 1, not '$PROCESSES'" ;;
esac

ensure_packages
if [ "$PROCESSES" -gt 1 ]; then ensure_nginx; fi
# The app's cluster keeps PostgreSQL's durability defaults (fsync, full_page_writes and
# synchronous_commit on); scripts/db.sh prints where it lives.
scripts/db.sh start
log "migrating"
node_modules/.bin/tsx scripts/migrate.ts
log "seeding demo data"
node_modules/.bin/tsx scripts/seed.ts
ensure_mail_catcher
ensure_payments_fake
# Photos in the local S3-compatible store, as on a deployment with several processes
# (STORAGE_DRIVER=disk keeps them in .data/storage instead, with one process only).
if [ "$PROCESSES" -gt 1 ]; then export STORAGE_DRIVER=s3; fi
export STORAGE_DRIVER=${STORAGE_DRIVER:-s3}
if [ "$STORAGE_DRIVER" = s3 ]; then ensure_s3_fake; fi
log "building"
node_modules/.bin/vite build --logLevel warn

PORT=${PORT:-${CLUSTER_PORT:-3000}}
export HOST=${HOST:-127.0.0.1}
export ORIGIN=${ORIGIN:-http://$HOST:$PORT}
# Served over plain http on this machine, so the session cookie can't be marked secure here.
export INTERSTICE_INSECURE_COOKIES=${INTERSTICE_INSECURE_COOKIES:-1}
# Development tools (the no-op endpoint of bench:http); never set on a deployment, where
# NODE_ENV=production refuses it.
export INTERSTICE_DEV_TOOLS=${INTERSTICE_DEV_TOOLS:-1}
# Photos up to 10 MB (the upload limit) plus form overhead.
export BODY_SIZE_LIMIT=${BODY_SIZE_LIMIT:-12M}
if [ "$PROCESSES" -gt 1 ]; then
	SERVED="nginx in front of $PROCESSES app processes on the ports after $PORT"
else
	SERVED="one process"
fi
cat <<TXT

  Interstice is running at $ORIGIN ($SERVED)
  Demo sign-in:  designer@demo.interstice.test  /  demo-password-1   (designer)
                 owner@demo.interstice.test     /  demo-password-1   (owner: members)
                 client@demo.interstice.test    /  demo-password-1   (client)
  Outgoing mail: ${MAIL_CATCHER_URL:-http://127.0.0.1:2526}/ (the local mail catcher)
  Stop with Ctrl-C; 'scripts/db.sh stop' stops PostgreSQL. Copies: 'npm run backup'.

TXT
if [ "$PROCESSES" -gt 1 ]; then
	export CLUSTER_PORT=$PORT CLUSTER_PROCESSES=$PROCESSES
	unset PORT
	exec node_modules/.bin/tsx scripts/cluster.ts
fi
export PORT
exec node build
