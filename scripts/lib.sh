# Shared settings for Foldfolio's scripts. Source it; do not run it.
# Every port and path can be overridden from the environment.
set -euo pipefail
FOLDFOLIO_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export FOLDFOLIO_ROOT
export FOLDFOLIO_VAR="${FOLDFOLIO_VAR:-$FOLDFOLIO_ROOT/var}"
export FOLDFOLIO_DB_HOST="${FOLDFOLIO_DB_HOST:-127.0.0.1}"
export FOLDFOLIO_DB_PORT="${FOLDFOLIO_DB_PORT:-33061}"
export FOLDFOLIO_DB_SOCKET="${FOLDFOLIO_DB_SOCKET:-$FOLDFOLIO_VAR/mariadb.sock}"
export FOLDFOLIO_DB_USER="${FOLDFOLIO_DB_USER:-foldfolio}"
export FOLDFOLIO_DB_NAME="${FOLDFOLIO_DB_NAME:-foldfolio}"
export FOLDFOLIO_REDIS_HOST="${FOLDFOLIO_REDIS_HOST:-127.0.0.1}"
export FOLDFOLIO_REDIS_PORT="${FOLDFOLIO_REDIS_PORT:-63791}"
export FOLDFOLIO_PORT="${FOLDFOLIO_PORT:-8080}"
export FOLDFOLIO_SMTP_PORT="${FOLDFOLIO_SMTP_PORT:-2526}"

log() { printf '\033[1;34m[foldfolio]\033[0m %s\n' "$*" >&2; }
die() { printf '\033[1;31m[foldfolio]\033[0m %s\n' "$*" >&2; exit 1; }
