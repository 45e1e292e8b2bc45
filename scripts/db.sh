#!/usr/bin/env bash
# Private MariaDB for Foamtally: `db.sh up` installs (when missing), initialises,
# starts on 127.0.0.1:$DB_PORT and creates the database, the app's account and the migration account; `db.sh stop` stops it.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
# shellcheck source=scripts/env.sh
source "$root/scripts/env.sh"

port="${DB_PORT:-3307}"
datadir="$root/.data/mariadb-$port"
socket="/tmp/foamtally-mariadb-$port.sock"
pidfile="$root/.data/mariadb-$port.pid"
logfile="$root/.data/mariadb-$port.log"

client() { mariadb --no-defaults --protocol=socket --socket="$socket" -uroot "$@"; }

running() {
  [ -f "$pidfile" ] && kill -0 "$(cat "$pidfile")" 2>/dev/null
}

install_server() {
  if command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ]; then return; fi
  if [ "$(id -u)" -ne 0 ]; then
    echo "MariaDB is not installed. Run this once, then try again:" >&2
    echo "  sudo apt-get install -y mariadb-server" >&2
    exit 1
  fi
  echo "Installing mariadb-server from Debian's packages…"
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq mariadb-server >/dev/null ||
    { apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq mariadb-server >/dev/null; }
  # Debian's package starts a system server on 3306; ours is separate and leaves it alone.
}

up() {
  install_server
  export PATH="$PATH:/usr/sbin"
  mkdir -p "$root/.data"
  if ! running; then
    if (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; then
      echo "Port $port on 127.0.0.1 is taken by another program. Set DB_PORT to a free port." >&2
      exit 1
    fi
    if [ ! -d "$datadir/mysql" ]; then
      mariadb-install-db --no-defaults --datadir="$datadir" --auth-root-authentication-method=normal \
        --skip-test-db --user="$(id -un)" >"$logfile" 2>&1 ||
        { echo "mariadb-install-db failed; see $logfile" >&2; exit 1; }
    fi
    mariadbd --no-defaults --datadir="$datadir" --socket="$socket" --port="$port" \
      --bind-address=127.0.0.1 --user="$(id -un)" --skip-name-resolve --pid-file="$pidfile" \
      --log-error="$logfile" --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
      --innodb-buffer-pool-size=256M --max-connections=300 >>"$logfile" 2>&1 &
    disown || true
  fi
  for _ in $(seq 1 100); do
    if client -e "SELECT 1" >/dev/null 2>&1; then break; fi
    sleep 0.2
  done
  client -e "SELECT 1" >/dev/null 2>&1 || { echo "MariaDB did not start; see $logfile" >&2; exit 1; }
  local app_user="${DB_USER:-foamtally}" app_password="${DB_PASSWORD:?DB_PASSWORD must be set in .env}"
  local migration_user="${DB_MIGRATION_USER:-foamtally_migrate}"
  local migration_password="${DB_MIGRATION_PASSWORD:?DB_MIGRATION_PASSWORD must be set in .env}"
  if [ "$app_user" = "$migration_user" ]; then
    echo "DB_USER and DB_MIGRATION_USER must be two different accounts." >&2
    exit 1
  fi
  local app_escaped="${app_password//\'/\'\'}" migration_escaped="${migration_password//\'/\'\'}"
  # Two accounts on every database named foamtally*: the migration account owns the schema; the app's
  # account reads and writes rows and nothing else (no DROP, so no TRUNCATE either; no ALTER, no GRANT).
  # Revoking first takes away what an older set-up granted the app's account.
  local hosts=("127.0.0.1" "localhost") sql="" host
  sql+="CREATE DATABASE IF NOT EXISTS \`${DB_NAME:-foamtally}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;"$'\n'
  for host in "${hosts[@]}"; do
    sql+="CREATE USER IF NOT EXISTS '$migration_user'@'$host' IDENTIFIED BY '$migration_escaped';
ALTER USER '$migration_user'@'$host' IDENTIFIED BY '$migration_escaped';
GRANT ALL PRIVILEGES ON \`foamtally%\`.* TO '$migration_user'@'$host';
CREATE USER IF NOT EXISTS '$app_user'@'$host' IDENTIFIED BY '$app_escaped';
ALTER USER '$app_user'@'$host' IDENTIFIED BY '$app_escaped';
REVOKE ALL PRIVILEGES, GRANT OPTION FROM '$app_user'@'$host';
GRANT SELECT, INSERT, UPDATE, DELETE ON \`foamtally%\`.* TO '$app_user'@'$host';
"
  done
  sql+="FLUSH PRIVILEGES;"
  client <<<"$sql"
  echo "MariaDB is up on 127.0.0.1:$port (data in ${datadir#"$root/"})."
}

stop() {
  if running; then
    local pid; pid="$(cat "$pidfile")"
    kill "$pid"
    for _ in $(seq 1 100); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
    echo "MariaDB on port $port stopped."
  else
    echo "MariaDB on port $port is not running (no live pid file)."
  fi
}

# Drops and recreates a database (the tests' own, never the demo's by accident).
recreate() {
  local name="${1:?database name}"
  case "$name" in foamtally_test*) ;; *) echo "refusing to recreate $name: only foamtally_test* databases" >&2; exit 2 ;; esac
  up >/dev/null
  client -e "DROP DATABASE IF EXISTS \`$name\`; CREATE DATABASE \`$name\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;"
}

case "${1:-up}" in
  up) up ;;
  status) running ;;
  recreate) recreate "${2:-}" ;;
  is-empty) up >/dev/null; n="$(client -N -e "SELECT COUNT(*) FROM \`${DB_NAME:-foamtally}\`.users" 2>/dev/null || echo 0)"; [ "$n" = "0" ] ;;
  stop) stop ;;
  *) echo "usage: db.sh up|stop" >&2; exit 2 ;;
esac
