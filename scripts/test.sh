#!/usr/bin/env bash
# npm test: the same set-up as the demo, then every check. Exits non-zero on the first failure
# and stops what it started.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
bash scripts/install-deps.sh
# shellcheck source=scripts/env.sh
source scripts/env.sh
export TEST_DB_NAME="${TEST_DB_NAME:-foamtally_test}"
export FAKES_TAG="test-${E2E_PORT:-3101}"
# The tests' own fakes, on ports of their own, so that a demo running on this machine is left alone.
export FAKE_SMTP_PORT="$(( ${E2E_PORT:-3101} + 2000 ))"
export SMTP_URL="smtp://127.0.0.1:${FAKE_SMTP_PORT}"
export S3_ENDPOINT="http://localhost:$(( ${E2E_PORT:-3101} + 2001 ))"
export BUILD_DIR="${BUILD_DIR:-build-test-${E2E_PORT:-3101}}"

if [ ! -x /usr/bin/chromium ]; then
  if [ "$(id -u)" -eq 0 ]; then
    echo "Installing Debian's chromium for the end-to-end tests…"
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null ||
      { apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null; }
  else
    echo "Chromium is missing. Run once: sudo apt-get install -y chromium" >&2
    exit 1
  fi
fi

# Stop at the end only what this run started: a MariaDB already running is left running.
db_was_running=false
bash scripts/db.sh status && db_was_running=true
bash scripts/db.sh up
cleanup() {
  bash scripts/fakes.sh stop || true
  if [ "$db_was_running" = false ]; then bash scripts/db.sh stop || true; fi
}
trap cleanup EXIT

step() { printf '\n== %s ==\n' "$1"; }
step "type check"; npm run --silent typecheck
step "lint"; npm run --silent lint
step "format"; npm run --silent format:check
step "unit and integration tests (Vitest, MariaDB ${TEST_DB_NAME})"
NODE_OPTIONS="--import tsx" npx vitest run
step "build"; npm run --silent build >/dev/null
step "end-to-end tests (Playwright, Chromium)"
DB_NAME="$TEST_DB_NAME" NODE_OPTIONS="--import tsx" node -e '
  const { freshTestDatabase } = await import("./tests/support/test-database.ts");
  await freshTestDatabase({ seed: true });
' --input-type=module
bash scripts/fakes.sh start
npx playwright test
echo; echo "All checks passed."
