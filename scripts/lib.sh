# Shared steps for scripts/db.sh, start.sh, dev.sh, test.sh and backup.sh: root or sudo, apt,
# PostgreSQL's binaries, waiting for a port, starting and stopping services we own.
# Every step is idempotent. Every path is quoted: a clone may live in a folder with spaces.
set -euo pipefail
ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
cd "$ROOT"
mkdir -p .data

log() { printf '\033[1;33m▸\033[0m %s\n' "$*"; }
die() { echo "$*" >&2; exit 1; }

is_root() { [ "$(id -u)" = 0 ]; }

# Package installs need root: as root directly, otherwise through sudo (which may ask once).
as_root() {
	if is_root; then "$@"
	elif command -v sudo >/dev/null; then sudo "$@"
	else die "need root for: $* (run as root, or install sudo)"; fi
}

apt_updated=0
apt_install() {
	command -v apt-get >/dev/null || die "apt-get not found: install $* with this system's package manager"
	if [ $apt_updated = 0 ]; then as_root apt-get update -qq >/dev/null; apt_updated=1; fi
	as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

ensure_packages() {
	local stamp=node_modules/.package-lock.json
	if [ ! -d node_modules ] || [ ! -f "$stamp" ] || [ package-lock.json -nt "$stamp" ]; then
		log "installing npm packages (npm ci)"
		npm ci --no-audit --no-fund --loglevel=error
	fi
}

# Debian's nginx, for npm run start:cluster and the cluster tests (run with a prefix of our own).
ensure_nginx() {
	if [ ! -x /usr/sbin/nginx ] && ! command -v nginx >/dev/null; then
		log "installing Debian's nginx"
		apt_install nginx
	fi
}

ensure_chromium() {
	if [ ! -x /usr/bin/chromium ]; then
		log "installing Debian's chromium"
		apt_install chromium
	fi
}

# PostgreSQL's server binaries (initdb, pg_ctl, pg_dump, pg_restore), found from what is installed
# rather than a fixed version: PG_BINDIR if set; the version an existing cluster was made with
# (argument 1: its data folder); pg_config --bindir; the newest /usr/lib/postgresql/*/bin.
find_pg_bindir() {
	local data=${1:-} d
	if [ -n "${PG_BINDIR:-}" ]; then echo "$PG_BINDIR"; return 0; fi
	if [ -n "$data" ] && [ -f "$data/PG_VERSION" ]; then
		d=/usr/lib/postgresql/$(cat "$data/PG_VERSION")/bin
		if [ -x "$d/initdb" ]; then echo "$d"; return 0; fi
	fi
	if command -v pg_config >/dev/null; then
		d=$(pg_config --bindir 2>/dev/null || true)
		if [ -n "$d" ] && [ -x "$d/initdb" ]; then echo "$d"; return 0; fi
	fi
	d=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
	if [ -n "$d" ] && [ -x "$d/initdb" ]; then echo "$d"; return 0; fi
	d=$(command -v initdb || true)
	if [ -n "$d" ]; then dirname "$d"; return 0; fi
	return 1
}

# Installs Debian's postgresql (the distribution's current version) when no server is installed.
ensure_pg_bindir() {
	local data=${1:-}
	if ! PG_BIN=$(find_pg_bindir "$data"); then
		log "installing Debian's postgresql"
		apt_install postgresql
		PG_BIN=$(find_pg_bindir "$data") || die "PostgreSQL's initdb not found after installing postgresql"
		# The package may start its own cluster on 5432; we do not use it.
		if command -v pg_lsclusters >/dev/null; then
			pg_lsclusters -h 2>/dev/null | while read -r ver name _; do as_root pg_ctlcluster "$ver" "$name" stop 2>/dev/null || true; done
		fi
	fi
	export PG_BIN
}

port_open() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

wait_port() {
	local port=$1 tries=${2:-100}
	for _ in $(seq "$tries"); do port_open "$port" && return 0; sleep 0.1; done
	echo "nothing is listening on 127.0.0.1:$port" >&2
	return 1
}

# Starts a background helper unless its port already answers. Usage: ensure_service NAME PORT CMD...
# Its pid goes to .data/NAME.pid so stop_service stops exactly that process and nothing else.
ensure_service() {
	local name=$1 port=$2
	shift 2
	if port_open "$port"; then return 0; fi
	log "starting $name on 127.0.0.1:$port"
	nohup "$@" >".data/$name.log" 2>&1 &
	echo $! >".data/$name.pid"
	STARTED_SERVICES="${STARTED_SERVICES:-} $name"
	wait_port "$port" 150
}

# Stops the service started by ensure_service from this clone: the pid in .data/NAME.pid, and only
# while that process still runs in this folder (a recycled pid belongs to someone else).
stop_service() {
	local name=$1 pid
	[ -f ".data/$name.pid" ] || return 0
	pid=$(cat ".data/$name.pid")
	if [ -n "$pid" ] && [ "$(readlink "/proc/$pid/cwd" 2>/dev/null || true)" = "$ROOT" ]; then
		kill "$pid" 2>/dev/null || true
	fi
	rm -f ".data/$name.pid"
}

ensure_mail_catcher() { ensure_service mail-catcher 2526 node_modules/.bin/tsx scripts/mail-catcher.ts; }
# The local S3-compatible store for photos (STORAGE_DRIVER=s3), data in .data/s3.
# S3_FAKE_PORT moves it, and the app and scripts then talk to it there (unless S3_ENDPOINT says otherwise).
ensure_s3_fake() {
	local port=${S3_FAKE_PORT:-4569}
	export S3_ENDPOINT=${S3_ENDPOINT:-http://127.0.0.1:$port}
	ensure_service s3-fake "$port" node_modules/.bin/tsx scripts/s3-fake.ts
}
ensure_payments_fake() {
	if [ -f scripts/payments-fake.ts ]; then
		ensure_service payments-fake "${PAYMENTS_API_PORT:-12111}" node_modules/.bin/tsx scripts/payments-fake.ts
	fi
}

# Stops what this run started (not what was already running), so a test run leaves nothing behind.
stop_started_services() {
	for name in ${STARTED_SERVICES:-}; do stop_service "$name"; done
}

# Debian's wrk, the load generator of npm run bench:http (a C program: it leaves the cores to the
# servers it measures).
ensure_wrk() {
	if ! command -v wrk >/dev/null; then
		log "installing Debian's wrk"
		apt_install wrk
	fi
}
