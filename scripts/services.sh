#!/usr/bin/env bash
# Starts MariaDB and Redis on loopback with data under var/ (idempotent), and creates the
# application database user. Usage: scripts/services.sh [start|stop|status]
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cmd="${1:-start}"
DATADIR="$FOLDFOLIO_VAR/mariadb"
PIDFILE="$FOLDFOLIO_VAR/mariadb.pid"
REDIS_DIR="$FOLDFOLIO_VAR/redis"
SECRETS="$FOLDFOLIO_VAR/db-password"
mkdir -p "$FOLDFOLIO_VAR" "$REDIS_DIR"

mysql_root() { mariadb --protocol=socket --socket="$FOLDFOLIO_DB_SOCKET" -uroot "$@"; }

db_alive() { mysql_root -e 'SELECT 1' >/dev/null 2>&1; }

start_db() {
  if db_alive; then log "MariaDB already running on $FOLDFOLIO_DB_HOST:$FOLDFOLIO_DB_PORT"; return; fi
  if [ ! -d "$DATADIR/mysql" ]; then
    log "initialising MariaDB datadir $DATADIR"
    mariadb-install-db --user="$(id -un)" --datadir="$DATADIR" \
      --auth-root-authentication-method=socket --skip-test-db >"$FOLDFOLIO_VAR/mariadb-install.log" 2>&1 ||
      { cat "$FOLDFOLIO_VAR/mariadb-install.log" >&2; die "mariadb-install-db failed"; }
  fi
  log "starting MariaDB on $FOLDFOLIO_DB_HOST:$FOLDFOLIO_DB_PORT"
  setsid mariadbd --no-defaults --user="$(id -un)" --datadir="$DATADIR" \
    --socket="$FOLDFOLIO_DB_SOCKET" --port="$FOLDFOLIO_DB_PORT" --bind-address=127.0.0.1 \
    --pid-file="$PIDFILE" --log-error="$FOLDFOLIO_VAR/mariadb.err" \
    --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
    --max-connections=500 --innodb-buffer-pool-size=256M --max-allowed-packet=256M \
    </dev/null >/dev/null 2>&1 &
  for _ in $(seq 1 120); do db_alive && break; sleep 0.5; done
  db_alive || { tail -30 "$FOLDFOLIO_VAR/mariadb.err" >&2; die "MariaDB did not start"; }
}

ensure_db_user() {
  [ -s "$SECRETS" ] || { head -c 24 /dev/urandom | base64 | tr -d '/+=' > "$SECRETS"; chmod 600 "$SECRETS"; }
  local pw; pw="$(cat "$SECRETS")"
  mysql_root <<SQL
CREATE DATABASE IF NOT EXISTS \`$FOLDFOLIO_DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS '$FOLDFOLIO_DB_USER'@'127.0.0.1' IDENTIFIED BY '$pw';
CREATE USER IF NOT EXISTS '$FOLDFOLIO_DB_USER'@'localhost' IDENTIFIED BY '$pw';
ALTER USER '$FOLDFOLIO_DB_USER'@'127.0.0.1' IDENTIFIED BY '$pw';
ALTER USER '$FOLDFOLIO_DB_USER'@'localhost' IDENTIFIED BY '$pw';
GRANT ALL PRIVILEGES ON \`foldfolio%\`.* TO '$FOLDFOLIO_DB_USER'@'127.0.0.1';
GRANT ALL PRIVILEGES ON \`foldfolio%\`.* TO '$FOLDFOLIO_DB_USER'@'localhost';
FLUSH PRIVILEGES;
SQL
}

redis_alive() { redis-cli -h "$FOLDFOLIO_REDIS_HOST" -p "$FOLDFOLIO_REDIS_PORT" ping 2>/dev/null | grep -q PONG; }

start_redis() {
  if redis_alive; then log "Redis already running on $FOLDFOLIO_REDIS_HOST:$FOLDFOLIO_REDIS_PORT"; return; fi
  log "starting Redis on $FOLDFOLIO_REDIS_HOST:$FOLDFOLIO_REDIS_PORT"
  redis-server --bind 127.0.0.1 --port "$FOLDFOLIO_REDIS_PORT" --dir "$REDIS_DIR" \
    --daemonize yes --pidfile "$FOLDFOLIO_VAR/redis.pid" --logfile "$FOLDFOLIO_VAR/redis.log" \
    --save "" --appendonly no >/dev/null
  for _ in $(seq 1 40); do redis_alive && break; sleep 0.25; done
  redis_alive || die "Redis did not start (see $FOLDFOLIO_VAR/redis.log)"
}

case "$cmd" in
  start) start_db; ensure_db_user; start_redis ;;
  stop)
    [ -f "$PIDFILE" ] && kill "$(cat "$PIDFILE")" 2>/dev/null || true
    redis-cli -h "$FOLDFOLIO_REDIS_HOST" -p "$FOLDFOLIO_REDIS_PORT" shutdown nosave >/dev/null 2>&1 || true
    log "stopped" ;;
  status) db_alive && echo "mariadb: up" || echo "mariadb: down"; redis_alive && echo "redis: up" || echo "redis: down" ;;
  *) die "usage: scripts/services.sh [start|stop|status]" ;;
esac
