# Shared helpers for scripts/start.sh and scripts/test.sh. Source it; do not run it.
# Everything here is idempotent: a second run reuses what the first one set up.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"

log() { printf '\033[1;36m[slateroom]\033[0m %s\n' "$*"; }
die() { printf '\033[1;31m[slateroom]\033[0m %s\n' "$*" >&2; exit 1; }

if [ -f "$ROOT/.env" ]; then
	set -a
	# shellcheck disable=SC1091
	. "$ROOT/.env"
	set +a
fi

APT_UPDATED=0
apt_install() {
	if [ "$(id -u)" != "0" ]; then
		die "missing system packages ($*): install them with apt-get as root, then run again"
	fi
	if [ "$APT_UPDATED" = "0" ]; then
		log "apt-get update"
		DEBIAN_FRONTEND=noninteractive apt-get update -qq >/dev/null
		APT_UPDATED=1
	fi
	log "apt-get install $*"
	DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "$@" >/dev/null
}

# npm packages: install when node_modules is missing or older than the lock file.
ensure_node_modules() {
	local stamp="$ROOT/node_modules/.slateroom-lock"
	local want
	want="$(sha256sum "$ROOT/package-lock.json" "$ROOT/package.json" | sha256sum | cut -c1-32)"
	if [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
		log "installing npm packages (npm ci)"
		npm ci --no-audit --no-fund --loglevel=error
		echo "$want" >"$stamp"
	fi
}

PG_BIN=""
ensure_postgres_binaries() {
	PG_BIN="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)"
	if [ -z "$PG_BIN" ] || [ ! -x "$PG_BIN/postgres" ]; then
		apt_install postgresql postgresql-contrib
		PG_BIN="$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -n 1)"
	fi
}

ensure_chromium() {
	if [ ! -x /usr/bin/chromium ]; then
		apt_install chromium
	fi
}

# libfaketime (Debian's faketime packages) for npm run test:clock, which runs the suite under a
# fixed studio clock.
FAKETIME_LIB=""
ensure_faketime() {
	FAKETIME_LIB="$(ls /usr/lib/*/faketime/libfaketime.so.1 2>/dev/null | head -n 1 || true)"
	if [ -z "$FAKETIME_LIB" ]; then
		apt_install faketime libfaketime
		FAKETIME_LIB="$(ls /usr/lib/*/faketime/libfaketime.so.1 | head -n 1)"
	fi
}

# Run a PostgreSQL server binary as the right user: PostgreSQL refuses to run as root.
as_pg() {
	if [ "$(id -u)" = "0" ]; then
		runuser -u postgres -- "$@"
	else
		"$@"
	fi
}

# A folder for the cluster that the postgres user can reach. A checkout under a folder the
# postgres user cannot pass (such as /root) gets its cluster under /tmp instead.
pg_data_dir() {
	local name="$1"
	local inside="$ROOT/.data/$name"
	if [ "$(id -u)" != "0" ]; then
		echo "$inside"
		return
	fi
	mkdir -p "$ROOT/.data"
	if runuser -u postgres -- test -x "$ROOT/.data" 2>/dev/null && runuser -u postgres -- test -w "$ROOT/.data" 2>/dev/null; then
		echo "$inside"
	else
		echo "/tmp/slateroom-$(echo "$ROOT" | sha256sum | cut -c1-12)/$name"
	fi
}

# pg_start NAME PORT: create (first time) and start a throwaway cluster on 127.0.0.1:PORT.
pg_start() {
	local name="$1" port="$2"
	PGDATA_DIR="$(pg_data_dir "$name")"
	local parent
	parent="$(dirname "$PGDATA_DIR")"
	mkdir -p "$parent"
	if [ "$(id -u)" = "0" ]; then
		chown postgres "$parent" 2>/dev/null || true
		chmod 755 "$parent" 2>/dev/null || true
	fi
	if [ ! -f "$PGDATA_DIR/PG_VERSION" ]; then
		log "creating PostgreSQL cluster in $PGDATA_DIR"
		mkdir -p "$PGDATA_DIR"
		[ "$(id -u)" = "0" ] && chown postgres "$PGDATA_DIR"
		chmod 700 "$PGDATA_DIR"
		local pwfile
		pwfile="$(mktemp)"
		echo "slateroom" >"$pwfile"
		chmod 644 "$pwfile"
		as_pg "$PG_BIN/initdb" -D "$PGDATA_DIR" -U slateroom --pwfile="$pwfile" -A scram-sha-256 -E UTF8 --locale=C.UTF-8 >/dev/null
		rm -f "$pwfile"
	fi
	if as_pg "$PG_BIN/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; then
		log "PostgreSQL already running ($PGDATA_DIR)"
	else
		log "starting PostgreSQL on 127.0.0.1:$port"
		as_pg "$PG_BIN/pg_ctl" -D "$PGDATA_DIR" -l "$PGDATA_DIR/server.log" -w -t 60 \
			-o "-c listen_addresses=127.0.0.1 -p $port -k $PGDATA_DIR -c fsync=off -c full_page_writes=off" start >/dev/null ||
			{ tail -n 20 "$PGDATA_DIR/server.log" >&2; die "PostgreSQL did not start"; }
	fi
}

pg_stop() {
	local dir="$1"
	if [ -n "$dir" ] && [ -f "$dir/PG_VERSION" ]; then
		as_pg "$PG_BIN/pg_ctl" -D "$dir" -m fast -w stop >/dev/null 2>&1 || true
	fi
}

# pg_create_db PORT NAME
pg_create_db() {
	local port="$1" db="$2"
	if ! PGPASSWORD=slateroom psql -h 127.0.0.1 -p "$port" -U slateroom -d postgres -tAc "select 1 from pg_database where datname='$db'" | grep -q 1; then
		log "creating database $db"
		PGPASSWORD=slateroom psql -h 127.0.0.1 -p "$port" -U slateroom -d postgres -qc "create database \"$db\"" >/dev/null
	fi
}

# Start a background service and remember its pid for stop_services.
SERVICE_PIDS=()
SERVICES_KILLED=0
start_service() {
	local name="$1"
	shift
	log "starting $name"
	"$@" >"$LOG_DIR/$name.log" 2>&1 &
	SERVICE_PIDS+=("$!")
}

stop_services() {
	local pid i alive
	for pid in "${SERVICE_PIDS[@]:-}"; do
		[ -n "$pid" ] && kill "$pid" 2>/dev/null || true
	done
	# Give each service up to 10 s to finish what it is doing, then stop it for good: a service
	# that hangs on shutdown must never keep a test run (or CI) waiting.
	for ((i = 0; i < 50; i++)); do
		alive=0
		for pid in "${SERVICE_PIDS[@]:-}"; do
			[ -n "$pid" ] && kill -0 "$pid" 2>/dev/null && alive=1
		done
		[ "$alive" = "0" ] && break
		sleep 0.2
	done
	for pid in "${SERVICE_PIDS[@]:-}"; do
		if [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null; then
			log "process $pid did not stop within 10 s of SIGTERM; killing it"
			SERVICES_KILLED=$((SERVICES_KILLED + 1))
			kill -9 "$pid" 2>/dev/null || true
		fi
		[ -n "$pid" ] && wait "$pid" 2>/dev/null || true
	done
	SERVICE_PIDS=()
}

# wait_http URL [SECONDS]
wait_http() {
	local url="$1" secs="${2:-60}" i
	for ((i = 0; i < secs * 5; i++)); do
		if node -e "fetch(process.argv[1]).then(r=>process.exit(r.status<500?0:1)).catch(()=>process.exit(1))" "$url" 2>/dev/null; then
			return 0
		fi
		sleep 0.2
	done
	die "$url did not answer within ${secs}s (see $LOG_DIR)"
}

wait_port() {
	local port="$1" secs="${2:-30}" i
	for ((i = 0; i < secs * 5; i++)); do
		if node -e "const s=require('net').connect(+process.argv[1],'127.0.0.1');s.on('connect',()=>process.exit(0));s.on('error',()=>process.exit(1))" "$port" 2>/dev/null; then
			return 0
		fi
		sleep 0.2
	done
	die "nothing listens on 127.0.0.1:$port after ${secs}s (see $LOG_DIR)"
}
