#!/usr/bin/env bash
# `npm test`: the same set-up as `npm start` against a fresh test database, then every test:
# type checks, vitest unit and integration, then Playwright in Debian's Chromium against the
# production build. Ends with one line "N passed, N failed" and a non-zero exit on any failure.
set -uo pipefail
source "$(dirname "$0")/env.sh"
source "$ROOT_DIR/scripts/deps.sh"
set -e

# The test stack has its own mail fake and mail folder.
export SMTP_PORT="${TEST_SMTP_PORT:-2526}"
export MAIL_DIR="$ROOT_DIR/.data/mail-test-$SMTP_PORT"
export E2E_PORT="${E2E_PORT:-4173}"
export LOOPWRIGHT_ENV=test
export BETTER_AUTH_SECRET="${BETTER_AUTH_SECRET:-test-secret-for-local-runs-only-0123456789}"
# Not test-results/: Playwright empties that folder when it starts.
results="$ROOT_DIR/.tmp/test-report"
rm -rf "$results"; mkdir -p "$results"

ensure_dependencies
ensure_debian_package chromium chromium
ensure_debian_package ngspice ngspice
bash "$ROOT_DIR/scripts/db-up.sh"
# From here on the test stack never touches the development database or mail folder.
export DB_NAME="$DB_NAME_TEST"

log "recreating the test database $DB_NAME"
"$(command -v mariadb || echo /usr/bin/mariadb)" --no-defaults --protocol=socket --socket="$DB_SOCKET" -uroot \
	-e "DROP DATABASE IF EXISTS \`$DB_NAME\`; CREATE DATABASE \`$DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;"
npx tsx scripts/migrate.ts "$DB_NAME"
rm -rf "$MAIL_DIR"
start_mail_fake
trap stop_mail_fake EXIT
set +e

status=0
log "type checks (svelte-check)"
npx svelte-check --tsconfig ./tsconfig.json --threshold error --output human >"$results/svelte-check.log" 2>&1
check_status=$?
tail -3 "$results/svelte-check.log"
[ $check_status -eq 0 ] || { grep -E "Error|error" "$results/svelte-check.log" | head -40; status=1; }

log "unit and integration tests (vitest)"
npx vitest run --reporter=default --reporter=json --outputFile.json="$results/vitest.json"
[ $? -eq 0 ] || status=1

log "building for the browser tests"
if npx vite build --logLevel warn >"$results/build.log" 2>&1; then
	log "browser tests (Playwright + Debian Chromium)"
	PW_JSON_OUTPUT="$results/e2e.json" npx playwright test
	[ $? -eq 0 ] || status=1
else
	tail -30 "$results/build.log"; status=1
fi

node "$ROOT_DIR/scripts/test-summary.mjs" "$results" "$check_status"
summary_status=$?
[ $summary_status -eq 0 ] || status=1
exit $status
