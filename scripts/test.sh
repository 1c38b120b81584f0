#!/usr/bin/env bash
# npm test: from a fresh clone, set up everything and run every check. Ends with one line
# "N passed, N failed" (", N skipped") and exits non-zero when anything failed.
source "$(dirname "$0")/lib.sh"
set +e
started=$(date +%s)

set -e
ensure_packages
ensure_chromium
# nginx for the cluster spec (scripts/cluster.spec.ts: nginx on CLUSTER_TEST_PORT, 3130, and the two ports after it).
ensure_nginx
# The throwaway cluster (scripts/db.sh: fsync off, port $PGPORT or 54330), never the app's data;
# photos in a folder of their own too.
export DB_CLUSTER=test PGPORT=${PGPORT:-54330}
export STORAGE_DIR=${STORAGE_DIR:-.data/storage-test}
# Photo tests run against the local S3-compatible store, in a bucket of the test run's own.
export STORAGE_DRIVER=${STORAGE_DRIVER:-s3} S3_BUCKET=${S3_BUCKET:-interstice-photos-test}
db_was_running=$(scripts/db.sh status >/dev/null 2>&1 && echo 1 || echo 0)
scripts/db.sh start
cleanup() {
	stop_started_services
	if [ "$db_was_running" = 0 ]; then scripts/db.sh stop >/dev/null 2>&1 || true; fi
}
trap cleanup EXIT
export PGDATABASE=interstice_test
export DATABASE_URL="postgres://postgres@127.0.0.1:$PGPORT/interstice_test"
scripts/db.sh drop interstice_test >/dev/null
scripts/db.sh create interstice_test >/dev/null
log "migrating and seeding the throwaway database"
node_modules/.bin/tsx scripts/migrate.ts
node_modules/.bin/tsx scripts/seed.ts
ensure_mail_catcher
ensure_payments_fake
if [ "$STORAGE_DRIVER" = s3 ]; then ensure_s3_fake; fi
node_modules/.bin/svelte-kit sync
set +e

results=.data/test-results
rm -rf "$results"
mkdir -p "$results"
steps_pass=0
steps_fail=0
step() {
	local name=$1
	shift
	log "$name"
	if "$@"; then steps_pass=$((steps_pass + 1)); echo "$name: ok" >>"$results/steps"; else steps_fail=$((steps_fail + 1)); echo "$name: FAILED" >>"$results/steps"; fi
}

step "format (prettier --check)" node_modules/.bin/prettier --check --log-level warn .
step "lint (eslint)" node_modules/.bin/eslint .
step "types (svelte-check)" node_modules/.bin/svelte-check --tsconfig ./tsconfig.json --threshold error --output human
step "build (vite)" node_modules/.bin/vite build --logLevel warn
built=$([ -f build/index.js ] && echo 1 || echo 0)

log "unit and integration tests (vitest, real PostgreSQL)"
node_modules/.bin/vitest run --reporter=default --reporter=json --outputFile.json="$results/vitest.json"
vitest_rc=$?

pw_rc=0
if [ "$built" = 1 ]; then
	log "browser tests (Playwright in Debian's Chromium)"
	PW_JSON="$results/playwright.json" node_modules/.bin/playwright test
	pw_rc=$?
else
	echo "build failed: browser tests not run" >&2
fi

node scripts/summarize.mjs "$results" "$steps_pass" "$steps_fail" "$vitest_rc" "$pw_rc" "$(( $(date +%s) - started ))"
