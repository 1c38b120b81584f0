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
# Photo tests run against the local S3-compatible store, in a bucket of this clone's own: a store
# already listening on the port (npm start's, or another clone's test run) is used as it is, and the
# storage specs delete every orphan in their bucket, so two clones must never share one.
clone_tag=$(printf %s "$ROOT" | sha256sum | cut -c1-10)
export STORAGE_DRIVER=${STORAGE_DRIVER:-s3} S3_BUCKET=${S3_BUCKET:-interstice-photos-test-$clone_tag}
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
# The browser tests' database: a copy of the seeded one (instant, nothing is connected to it yet).
export PGDATABASE_BROWSER=interstice_browser_test S3_BUCKET_BROWSER=${S3_BUCKET}-browser
scripts/db.sh copy interstice_test "$PGDATABASE_BROWSER" >/dev/null
ensure_mail_catcher
ensure_payments_fake
if [ "$STORAGE_DRIVER" = s3 ]; then
	ensure_s3_fake
	node_modules/.bin/tsx scripts/s3-bucket.ts
	S3_BUCKET=$S3_BUCKET_BROWSER node_modules/.bin/tsx scripts/s3-bucket.ts
fi
node_modules/.bin/svelte-kit sync
set +e

results=.data/test-results
rm -rf "$results"
mkdir -p "$results"
steps_pass=0
steps_fail=0
# Records one finished step: its name, ok or FAILED, and how long it took.
record() {
	local name=$1 rc=$2 took=$3
	if [ "$rc" = 0 ]; then steps_pass=$((steps_pass + 1)); else steps_fail=$((steps_fail + 1)); fi
	echo "$name: $([ "$rc" = 0 ] && echo ok || echo FAILED) ($took s)" >>"$results/steps"
}
step() {
	local name=$1 t0=$SECONDS
	shift
	log "$name"
	"$@"
	record "$name" $? $((SECONDS - t0))
}

# The read-only checks side by side (none of them writes .svelte-kit); each one's output is shown
# whole when it ends, not interleaved.
static_checks() {
	local names=("format (prettier --check)" "lint (eslint)" "types (svelte-check)")
	local cmds=("node_modules/.bin/prettier --check --log-level warn ."
		"node_modules/.bin/eslint ."
		"node_modules/.bin/svelte-check --tsconfig ./tsconfig.json --threshold error --output human")
	local pids=() i t0=$SECONDS
	log "${names[*]} (side by side)"
	for i in 0 1 2; do
		${cmds[$i]} >"$results/static-$i.log" 2>&1 &
		pids+=($!)
	done
	for i in 0 1 2; do
		wait "${pids[$i]}"
		local rc=$?
		if [ -s "$results/static-$i.log" ]; then
			echo "── ${names[$i]}"
			cat "$results/static-$i.log"
		fi
		record "${names[$i]}" $rc $((SECONDS - t0))
	done
}

static_checks
step "build (vite)" node_modules/.bin/vite build --logLevel warn
built=$([ -f build/index.js ] && echo 1 || echo 0)

# The tests in two lines side by side (vite.config.ts has the two groups):
#   services: the specs that use PostgreSQL, the built app, mail, payments, the photo store;
#   engine, then the browser: the pure specs, then Playwright against a database and photo bucket
#   of its own (a copy of the seeded test database), so neither line can see the other's rows.
# Each vitest gets its own SvelteKit output folder, so neither rewrites files the other reads.
log "tests: services specs beside engine specs then browser tests (output of the services line at the end)"
t_tests=$SECONDS
KIT_OUT_DIR=.data/kit-services node_modules/.bin/vitest run --project services \
	--reporter=default --reporter=json --outputFile.json="$results/vitest-services.json" \
	>"$results/vitest-services.log" 2>&1 &
services_pid=$!

log "engine specs (vitest)"
t0=$SECONDS
KIT_OUT_DIR=.data/kit-engine node_modules/.bin/vitest run --project engine \
	--reporter=default --reporter=json --outputFile.json="$results/vitest-engine.json"
engine_rc=$?
echo "engine specs: $((SECONDS - t0)) s" >>"$results/timings"

pw_rc=0
if [ "$built" = 1 ]; then
	log "browser tests (Playwright in Debian's Chromium, database $PGDATABASE_BROWSER)"
	t0=$SECONDS
	DATABASE_URL="postgres://postgres@127.0.0.1:$PGPORT/$PGDATABASE_BROWSER" \
		S3_BUCKET="$S3_BUCKET_BROWSER" STORAGE_DIR="$STORAGE_DIR-browser" \
		PW_JSON="$results/playwright.json" node_modules/.bin/playwright test
	pw_rc=$?
	echo "browser tests: $((SECONDS - t0)) s" >>"$results/timings"
else
	echo "build failed: browser tests not run" >&2
fi

wait "$services_pid"
services_rc=$?
echo "── services specs (vitest)"
cat "$results/vitest-services.log"
echo "tests, both lines: $((SECONDS - t_tests)) s" >>"$results/timings"
vitest_rc=$((engine_rc || services_rc))

node scripts/summarize.mjs "$results" "$steps_pass" "$steps_fail" "$vitest_rc" "$pw_rc" "$(( $(date +%s) - started ))"
