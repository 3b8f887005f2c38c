#!/usr/bin/env bash
# Brings up a private MariaDB for this checkout: installs Debian's mariadb-server when missing,
# initialises a data folder under .data/, starts mariadbd on 127.0.0.1:$DB_PORT and creates the
# app and test databases. Safe to run twice: a server that already answers is reused.
set -euo pipefail
source "$(dirname "$0")/env.sh"

as_root() { if [ "$(id -u)" -eq 0 ]; then "$@"; else sudo "$@"; fi; }

find_bin() { # the Debian package puts the server in /usr/sbin, which may not be on PATH
	command -v "$1" 2>/dev/null || { [ -x "/usr/sbin/$1" ] && echo "/usr/sbin/$1"; } || { [ -x "/usr/bin/$1" ] && echo "/usr/bin/$1"; } || true
}

if [ -z "$(find_bin mariadbd)" ]; then
	log "mariadbd not found: installing Debian's mariadb-server"
	export DEBIAN_FRONTEND=noninteractive
	as_root apt-get update -qq
	as_root apt-get install -y -qq --no-install-recommends mariadb-server mariadb-client >/dev/null
fi
MARIADBD="$(find_bin mariadbd)"
INSTALL_DB="$(find_bin mariadb-install-db)"
CLIENT="$(find_bin mariadb)"
ADMIN="$(find_bin mariadb-admin)"

root_sql() { "$CLIENT" --no-defaults --protocol=socket --socket="$DB_SOCKET" -uroot "$@"; }
answers() { "$ADMIN" --no-defaults --protocol=socket --socket="$DB_SOCKET" -uroot ping >/dev/null 2>&1; }

mkdir -p "$DB_DATA_DIR"
if answers; then
	log "MariaDB already running on $DB_HOST:$DB_PORT (reused)"
else
	if [ ! -d "$DB_DATA_DIR/mysql" ]; then
		log "initialising a MariaDB data folder in ${DB_DATA_DIR#$ROOT_DIR/}"
		"$INSTALL_DB" --no-defaults --datadir="$DB_DATA_DIR" --user="$(id -un)" \
			--auth-root-authentication-method=socket --skip-test-db >"$DB_DATA_DIR/install.log" 2>&1 ||
			{ tail -20 "$DB_DATA_DIR/install.log" >&2; die "mariadb-install-db failed"; }
	fi
	if (exec 3<>"/dev/tcp/$DB_HOST/$DB_PORT") 2>/dev/null; then
		die "port $DB_PORT on $DB_HOST is taken by another process, not this checkout's MariaDB: set DB_PORT to a free port"
	fi
	log "starting MariaDB on $DB_HOST:$DB_PORT"
	# setsid: the server must outlive the npm process that started it.
	setsid "$MARIADBD" --no-defaults --datadir="$DB_DATA_DIR" --user="$(id -un)" \
		--bind-address="$DB_HOST" --port="$DB_PORT" --socket="$DB_SOCKET" --pid-file="$DB_PID_FILE" \
		--log-error="$DB_LOG_FILE" --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
		--skip-name-resolve --innodb-buffer-pool-size=128M --max-connections=300 \
		</dev/null >/dev/null 2>&1 &
	server_pid=$!
	for _ in $(seq 1 120); do
		answers && break
		kill -0 "$server_pid" 2>/dev/null || break # it exited: the log says why
		sleep 0.5
	done
	if ! answers; then
		echo "---- last lines of ${DB_LOG_FILE#$ROOT_DIR/} ----" >&2
		tail -25 "$DB_LOG_FILE" >&2 || true
		die "MariaDB did not answer on $DB_HOST:$DB_PORT (it stopped, or 60 s passed)"
	fi
fi

root_sql <<SQL
CREATE DATABASE IF NOT EXISTS \`$DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE DATABASE IF NOT EXISTS \`$DB_NAME_TEST\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS '$DB_USER'@'127.0.0.1' IDENTIFIED BY '$DB_PASSWORD';
CREATE USER IF NOT EXISTS '$DB_USER'@'localhost' IDENTIFIED BY '$DB_PASSWORD';
GRANT ALL PRIVILEGES ON \`$DB_NAME\`.* TO '$DB_USER'@'127.0.0.1', '$DB_USER'@'localhost';
GRANT ALL PRIVILEGES ON \`$DB_NAME_TEST\`.* TO '$DB_USER'@'127.0.0.1', '$DB_USER'@'localhost';
FLUSH PRIVILEGES;
SQL
log "databases $DB_NAME and $DB_NAME_TEST ready"
