#!/usr/bin/env bash
# npm run start:cluster: the demo served by two app processes behind nginx on 127.0.0.1:3000
# (CLUSTER_PORT), the way a deployment with several processes or machines runs (docs/scaling.md).
# PostgreSQL, the mail catcher, the payments fake and the local S3-compatible store as npm start;
# photos always in the object store, which every process sees.
source "$(dirname "$0")/lib.sh"

ensure_packages
ensure_nginx
scripts/db.sh start
log "migrating"
node_modules/.bin/tsx scripts/migrate.ts
log "seeding demo data"
node_modules/.bin/tsx scripts/seed.ts
ensure_mail_catcher
ensure_payments_fake
export STORAGE_DRIVER=s3
ensure_s3_fake
log "building"
node_modules/.bin/vite build --logLevel warn

export HOST=${HOST:-127.0.0.1} CLUSTER_PORT=${CLUSTER_PORT:-${PORT:-3000}}
export ORIGIN=${ORIGIN:-http://$HOST:$CLUSTER_PORT}
export INTERSTICE_INSECURE_COOKIES=${INTERSTICE_INSECURE_COOKIES:-1}
export INTERSTICE_DEV_TOOLS=${INTERSTICE_DEV_TOOLS:-1}
export BODY_SIZE_LIMIT=${BODY_SIZE_LIMIT:-12M}
unset PORT
cat <<TXT

  Interstice is running at $ORIGIN (nginx, ${CLUSTER_PROCESSES:-2} app processes)
  Demo sign-in:  designer@demo.interstice.test  /  demo-password-1
  Outgoing mail: ${MAIL_CATCHER_URL:-http://127.0.0.1:2526}/ (the local mail catcher)
  Stop with Ctrl-C; 'scripts/db.sh stop' stops PostgreSQL.

TXT
exec node_modules/.bin/tsx scripts/cluster.ts
