#!/usr/bin/env bash
# Writes .env with generated secrets on first run, adds any key that .env.example has gained since
# (generating its secret), then exports its values (variables already set in the environment win).
# Sourced by the other scripts.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
random_hex() { node -e 'console.log(require("crypto").randomBytes(32).toString("hex"))'; }
random_password() { node -e 'console.log(require("crypto").randomBytes(18).toString("base64url"))'; }
if [ ! -f "$root/.env" ]; then
  sed -e "s|^SESSION_SECRET=.*|SESSION_SECRET=$(random_hex)|" \
      -e "s|^DB_PASSWORD=.*|DB_PASSWORD=$(random_password)|" \
      -e "s|^DB_MIGRATION_PASSWORD=.*|DB_MIGRATION_PASSWORD=$(random_password)|" \
      -e "s|^DEMO_MODE=.*|DEMO_MODE=true|" \
      "$root/.env.example" > "$root/.env"
  chmod 600 "$root/.env"
  echo "Wrote .env with a generated session secret and database passwords."
else
  # An .env written before a key existed gets that key appended: secrets generated, others as in the example.
  added=""
  while IFS= read -r line || [ -n "$line" ]; do
    case "$line" in ''|'#'*) continue ;; esac
    key="${line%%=*}"
    if grep -q "^$key=" "$root/.env"; then continue; fi
    case "$key" in
      DB_MIGRATION_PASSWORD) line="$key=$(random_password)" ;;
      SESSION_SECRET) line="$key=$(random_hex)" ;;
    esac
    [ -n "$(tail -c1 "$root/.env")" ] && echo >> "$root/.env"
    echo "$line" >> "$root/.env"
    added="$added $key"
  done < "$root/.env.example"
  if [ -n "$added" ]; then echo "Added to .env:$added"; fi
fi
while IFS= read -r line || [ -n "$line" ]; do
  case "$line" in ''|'#'*) continue ;; esac
  key="${line%%=*}"
  value="${line#*=}"
  value="${value%\"}"; value="${value#\"}"
  if [ -z "${!key+x}" ]; then export "$key=$value"; fi
done < "$root/.env"
