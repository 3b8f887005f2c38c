# Installs npm dependencies when node_modules is missing or older than package-lock.json,
# then syncs SvelteKit's generated types. Sourced by start.sh and test.sh.
ensure_dependencies() {
	cd "$ROOT_DIR"
	if [ ! -d node_modules ] || [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
		log "installing dependencies (npm ci)"
		npm ci --no-audit --no-fund --loglevel=error
	fi
	npx svelte-kit sync >/dev/null
}

ensure_debian_package() { # ensure_debian_package BINARY PACKAGE
	if ! command -v "$1" >/dev/null 2>&1 && [ ! -x "/usr/bin/$1" ]; then
		log "$1 not found: installing Debian's $2"
		local sudo=""; [ "$(id -u)" -eq 0 ] || sudo="sudo"
		DEBIAN_FRONTEND=noninteractive $sudo apt-get update -qq
		DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends "$2" >/dev/null
	fi
}

start_mail_fake() { # start_mail_fake: background fake SMTP server capturing every message
	[ -f "$ROOT_DIR/scripts/mail-fake.ts" ] || return 0
	mkdir -p "$MAIL_DIR"
	local pidfile="$MAIL_DIR/server.pid"
	if [ -f "$pidfile" ] && kill -0 "$(cat "$pidfile")" 2>/dev/null; then
		log "mail fake already listening on $SMTP_HOST:$SMTP_PORT (reused)"
		return 0
	fi
	setsid npx tsx "$ROOT_DIR/scripts/mail-fake.ts" >"$MAIL_DIR/server.log" 2>&1 </dev/null &
	echo $! >"$pidfile"
	for _ in $(seq 1 40); do
		(exec 3<>"/dev/tcp/$SMTP_HOST/$SMTP_PORT") 2>/dev/null && { log "mail fake listening on $SMTP_HOST:$SMTP_PORT"; return 0; }
		sleep 0.25
	done
	tail -20 "$MAIL_DIR/server.log" >&2
	die "mail fake did not start on $SMTP_HOST:$SMTP_PORT"
}

stop_mail_fake() {
	local pidfile="$MAIL_DIR/server.pid"
	[ -f "$pidfile" ] || return 0
	kill -TERM -- "-$(cat "$pidfile")" 2>/dev/null || kill -TERM "$(cat "$pidfile")" 2>/dev/null || true
	rm -f "$pidfile"
}
