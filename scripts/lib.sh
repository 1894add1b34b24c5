# Shared set-up for scripts/start.sh and scripts/test.sh. Source it; do not run it.
# Installs what is missing, runs a private PostgreSQL cluster, keeps track of what it started.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
STARTED_PIDS=()
PG_STARTED=""

log() { printf '\033[1;36m[traywise]\033[0m %s\n' "$*"; }

as_root() { [ "$(id -u)" = "0" ]; }
sudo_if_needed() { if as_root; then "$@"; else sudo "$@"; fi; }

APT_UPDATED=""
apt_install() {
	# apt_install <check-command> <package>...
	local check="$1"; shift
	if eval "$check" >/dev/null 2>&1; then return 0; fi
	log "installing $* with apt-get"
	if [ -z "$APT_UPDATED" ]; then sudo_if_needed apt-get update -qq; APT_UPDATED=1; fi
	sudo_if_needed env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

ensure_postgres() {
	apt_install "ls /usr/lib/postgresql/*/bin/initdb" postgresql
	PGBIN="$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -1)"
}

ensure_node_modules() {
	if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
		log "npm ci"
		npm ci --no-audit --no-fund
	fi
}

# Where the cluster lives. As root, the postgres user must reach the folder; when a parent of the
# project is closed to it, fall back to a folder under /var/tmp named after the project path.
pg_data_dir() {
	local name="$1" dir="$ROOT/.data/$name"
	if as_root && ! runuser -u postgres -- test -x "$ROOT" 2>/dev/null; then
		dir="/var/tmp/traywise-$(printf '%s' "$ROOT" | sha1sum | cut -c1-10)/$name"
	fi
	printf '%s' "$dir"
}

pg_run() { # run a PostgreSQL binary as the right user
	if as_root; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi
}

# pg_up <name> <port>: initialise (once) and start a private cluster on 127.0.0.1:<port>
pg_up() {
	local name="$1" port="$2"
	ensure_postgres
	PGDATA="$(pg_data_dir "$name")"
	PGSOCK="/tmp/traywise-pg-$port"
	mkdir -p "$PGDATA" "$PGSOCK"
	if as_root; then chown postgres:postgres "$PGDATA" "$PGSOCK"; chmod 700 "$PGDATA"; chmod 755 "$(dirname "$PGDATA")"; fi
	if [ ! -f "$PGDATA/PG_VERSION" ]; then
		log "creating PostgreSQL cluster in $PGDATA"
		pg_run "$PGBIN/initdb" -D "$PGDATA" -U postgres -E UTF8 --locale=C.UTF-8 \
			--auth-local=trust --auth-host=scram-sha-256 >/dev/null
		cat >>"$PGDATA/postgresql.conf" <<CONF
listen_addresses = '127.0.0.1'
port = $port
unix_socket_directories = '$PGSOCK'
max_connections = 200
fsync = off
synchronous_commit = off
full_page_writes = off
CONF
	fi
	if ! pg_run "$PGBIN/pg_isready" -h "$PGSOCK" -p "$port" -q; then
		log "starting PostgreSQL on 127.0.0.1:$port"
		pg_run "$PGBIN/pg_ctl" -D "$PGDATA" -l "$PGDATA/server.log" -w -t 30 start >/dev/null
		PG_STARTED="$PGDATA"
	fi
	for _ in $(seq 1 50); do pg_run "$PGBIN/pg_isready" -h "$PGSOCK" -p "$port" -q && break; sleep 0.2; done
	PGPORT_USED="$port"
}

pg_stop() {
	if [ -n "$PG_STARTED" ]; then
		pg_run "$PGBIN/pg_ctl" -D "$PG_STARTED" -m fast -w stop >/dev/null 2>&1 || true
		PG_STARTED=""
	fi
}

psql_admin() { pg_run "$PGBIN/psql" -h "$PGSOCK" -p "$PGPORT_USED" -U postgres -v ON_ERROR_STOP=1 -qAt "$@"; }

# pg_database <db> <role> <password> [fresh]: create role and database; "fresh" drops the database first
pg_database() {
	local db="$1" role="$2" pass="$3" fresh="${4:-}"
	psql_admin -d postgres -c "DO \$\$BEGIN IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = '$role') THEN CREATE ROLE $role LOGIN PASSWORD '$pass'; END IF; END\$\$;"
	if [ "$fresh" = "fresh" ]; then psql_admin -d postgres -c "DROP DATABASE IF EXISTS $db WITH (FORCE);"; fi
	if [ "$(psql_admin -d postgres -c "SELECT 1 FROM pg_database WHERE datname = '$db'")" != "1" ]; then
		psql_admin -d postgres -c "CREATE DATABASE $db OWNER $role;"
	fi
}

# start_bg <logfile> <command...>: start in the background and remember it for cleanup
start_bg() {
	local logfile="$1"; shift
	"$@" >"$logfile" 2>&1 &
	STARTED_PIDS+=("$!")
}

stop_started() {
	local pid
	for pid in "${STARTED_PIDS[@]:-}"; do
		[ -n "$pid" ] && kill "$pid" 2>/dev/null || true
	done
	for pid in "${STARTED_PIDS[@]:-}"; do
		[ -n "$pid" ] && wait "$pid" 2>/dev/null || true
	done
	STARTED_PIDS=()
	pg_stop
}

wait_for_url() { # wait_for_url <url> <seconds>
	local url="$1" secs="$2"
	for _ in $(seq 1 $((secs * 5))); do
		if curl -fsS -o /dev/null "$url" 2>/dev/null; then return 0; fi
		sleep 0.2
	done
	log "timed out waiting for $url"; return 1
}

load_env() { # load_env <file>: export every variable in a dotenv file
	if [ -f "$1" ]; then set -a; . "$1"; set +a; fi
}
