# Shared steps for scripts/start.sh and scripts/test.sh. Every step is idempotent.
set -euo pipefail
ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
cd "$ROOT"
mkdir -p .data

log() { printf '\033[1;33m▸\033[0m %s\n' "$*"; }

as_root() { if [ "$(id -u)" = 0 ]; then "$@"; else sudo "$@"; fi; }

apt_updated=0
apt_install() {
	if [ $apt_updated = 0 ]; then as_root apt-get update -qq >/dev/null; apt_updated=1; fi
	DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq "$@" >/dev/null
}

ensure_packages() {
	local stamp=node_modules/.package-lock.json
	if [ ! -d node_modules ] || [ ! -f "$stamp" ] || [ package-lock.json -nt "$stamp" ]; then
		log "installing npm packages (npm ci)"
		npm ci --no-audit --no-fund --loglevel=error
	fi
}

ensure_chromium() {
	if [ ! -x /usr/bin/chromium ]; then
		log "installing Debian's chromium"
		apt_install chromium
	fi
}

port_open() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

wait_port() {
	local port=$1 tries=${2:-100}
	for _ in $(seq "$tries"); do port_open "$port" && return 0; sleep 0.1; done
	echo "nothing is listening on 127.0.0.1:$port" >&2
	return 1
}

# Starts a background helper unless its port already answers. Usage: ensure_service NAME PORT CMD...
ensure_service() {
	local name=$1 port=$2
	shift 2
	if port_open "$port"; then return 0; fi
	log "starting $name on 127.0.0.1:$port"
	nohup "$@" >".data/$name.log" 2>&1 &
	echo $! >".data/$name.pid"
	STARTED_SERVICES="${STARTED_SERVICES:-} $!"
	wait_port "$port" 150
}

ensure_mail_catcher() { ensure_service mail-catcher 2526 node_modules/.bin/tsx scripts/mail-catcher.ts; }
ensure_payments_fake() {
	if [ -f scripts/payments-fake.ts ]; then
		ensure_service payments-fake "${PAYMENTS_API_PORT:-12111}" node_modules/.bin/tsx scripts/payments-fake.ts
	fi
}

# Stops what this run started (not what was already running), so a test run leaves nothing behind.
stop_started_services() {
	for pid in ${STARTED_SERVICES:-}; do kill "$pid" 2>/dev/null || true; done
}
