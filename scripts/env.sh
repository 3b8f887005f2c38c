# Shared settings for the set-up scripts; sourced, never run. Every value can be overridden
# from the environment (see .env.example); the defaults keep the database inside the checkout.
ROOT_DIR="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export DB_HOST="${DB_HOST:-127.0.0.1}"
export DB_PORT="${DB_PORT:-3307}"
export DB_USER="${DB_USER:-loopwright}"
export DB_PASSWORD="${DB_PASSWORD:-loopwright}"
export DB_NAME="${DB_NAME:-loopwright}"
export DB_NAME_TEST="${DB_NAME_TEST:-loopwright_test}"
export DB_DATA_DIR="${DB_DATA_DIR:-$ROOT_DIR/.data/mariadb-$DB_PORT}"
export DB_SOCKET="${DB_SOCKET:-$DB_DATA_DIR/mysqld.sock}"
export DB_PID_FILE="$DB_DATA_DIR/mysqld.pid"
export DB_LOG_FILE="$DB_DATA_DIR/mysqld.log"
export HOST="${HOST:-127.0.0.1}"
export PORT="${PORT:-3000}"
export SMTP_HOST="${SMTP_HOST:-127.0.0.1}"
export SMTP_PORT="${SMTP_PORT:-2525}"
export MAIL_DIR="${MAIL_DIR:-$ROOT_DIR/.data/mail-$SMTP_PORT}"

database_url() { # database_url NAME
	printf 'mysql://%s:%s@%s:%s/%s' "$DB_USER" "$DB_PASSWORD" "$DB_HOST" "$DB_PORT" "$1"
}

log() { printf '\033[36m[loopwright]\033[0m %s\n' "$*"; }
die() { printf '\033[31m[loopwright] %s\033[0m\n' "$*" >&2; exit 1; }
