#!/usr/bin/env bash
# `npm start` (production build) and `npm run dev` (Vite dev server) from a fresh clone:
# dependencies, database, migrations, demo seed, mail fake, build, serve.
set -euo pipefail
source "$(dirname "$0")/env.sh"
source "$ROOT_DIR/scripts/deps.sh"
mode="${1:-}"

ensure_dependencies
bash "$ROOT_DIR/scripts/db-up.sh"
npx tsx scripts/migrate.ts "$DB_NAME"
start_mail_fake
[ -f scripts/seed.ts ] && npx tsx scripts/seed.ts

export ORIGIN="${ORIGIN:-http://$HOST:$PORT}"
export BETTER_AUTH_URL="${BETTER_AUTH_URL:-$ORIGIN}"
export LOOPWRIGHT_ENV="${LOOPWRIGHT_ENV:-development}"
# adapter-node refuses bodies above 512 kB by default; bench files may be 5 MB (multipart).
export BODY_SIZE_LIMIT="${BODY_SIZE_LIMIT:-7M}"

banner() {
	log "Loopwright is at $ORIGIN"
	npx tsx scripts/demo-users.ts | sed 's/^/[loopwright] /'
	log "captured e-mail: $ORIGIN/dev/mail shows each signed-in user their own; before signing in: npm run -s mail -- ADDRESS"
	log "stop the database afterwards with: npm run db:stop"
}

if [ "$mode" = "--dev" ]; then
	banner
	exec npx vite dev --host "$HOST" --port "$PORT" --strictPort
fi

# Rebuild only when a source, asset or config file is newer than the last build.
stale_build() {
	[ -f build/handler.js ] || return 0
	[ -n "$(find src static svelte.config.js vite.config.ts package-lock.json -newer build/handler.js -print -quit)" ]
}
if stale_build; then
	log "building"
	npx vite build --logLevel warn
else
	log "build is up to date"
fi
banner
export NODE_ENV=production
# The supervisor restarts the server if it ever exits on its own (and logs why); SIGTERM goes
# through it to the server, which closes its pools and exits, and then the supervisor ends.
exec node scripts/supervise.mjs build
