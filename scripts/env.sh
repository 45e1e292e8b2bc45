#!/usr/bin/env bash
# Writes .env with generated secrets on first run, then exports its values
# (variables already set in the environment win). Sourced by the other scripts.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
if [ ! -f "$root/.env" ]; then
  secret="$(node -e 'console.log(require("crypto").randomBytes(32).toString("hex"))')"
  password="$(node -e 'console.log(require("crypto").randomBytes(18).toString("base64url"))')"
  sed -e "s|^SESSION_SECRET=.*|SESSION_SECRET=$secret|" \
      -e "s|^DB_PASSWORD=.*|DB_PASSWORD=$password|" \
      -e "s|^DEMO_MODE=.*|DEMO_MODE=true|" \
      "$root/.env.example" > "$root/.env"
  chmod 600 "$root/.env"
  echo "Wrote .env with a generated session secret and database password."
fi
while IFS= read -r line || [ -n "$line" ]; do
  case "$line" in ''|'#'*) continue ;; esac
  key="${line%%=*}"
  value="${line#*=}"
  value="${value%\"}"; value="${value#\"}"
  if [ -z "${!key+x}" ]; then export "$key=$value"; fi
done < "$root/.env"
