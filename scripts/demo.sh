#!/usr/bin/env bash
# npm run demo: install, start MariaDB and the local fakes, migrate, seed (empty database only), build, serve.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
bash scripts/install-deps.sh
# shellcheck source=scripts/env.sh
source scripts/env.sh
# Links in e-mail point at the port actually served, unless APP_URL was set on purpose.
if [ -n "${PORT:-}" ] && [ "${APP_URL:-}" = "http://127.0.0.1:3000" ]; then export APP_URL="http://127.0.0.1:$PORT"; fi
bash scripts/db.sh up
npm run --silent db:migrate
# The local fakes come first: the demo seed puts its placeholder safety sheets into the file store.
bash scripts/fakes.sh start
if bash scripts/db.sh is-empty; then
  echo "Seeding the invented Alder Bend demo district…"
  npm run --silent db:seed
else
  echo "The database already has data; the demo seed was not run."
fi
npm run --silent build
port="${PORT:-3000}"
cat <<TXT

Foamtally demo: http://127.0.0.1:$port
Demo accounts (password: alder-bend-demo-2026 — demo data only, invented people):
  officer@alderbend.example   company officer
  enviro@alderbend.example    environmental officer
  chief@alderbend.example     chief
  records@alderbend.example   records clerk
  admin@alderbend.example     administrator
Mail goes to the local fake SMTP server; sign in as admin and open /admin/outbox to read it.
Stop with Ctrl-C; \`npm run db:stop\` stops MariaDB.

TXT
exec node scripts/serve.js
