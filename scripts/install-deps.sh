#!/usr/bin/env bash
# Installs npm dependencies when they are missing or older than the lock file.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "Installing dependencies (npm ci)…"
  npm ci --no-audit --no-fund
fi
