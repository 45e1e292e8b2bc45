#!/usr/bin/env bash
# Local stand-ins for hosted services (mail, object storage) on loopback, for the demo and the tests.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
pidfile=".data/fakes-${FAKES_TAG:-demo}.pid"
mkdir -p .data
case "${1:-start}" in
  start)
    if [ -f "$pidfile" ] && kill -0 "$(cat "$pidfile")" 2>/dev/null; then exit 0; fi
    nohup node --import tsx scripts/fakes.ts >".data/fakes-${FAKES_TAG:-demo}.log" 2>&1 &
    echo $! >"$pidfile"
    for _ in $(seq 1 300); do grep -q "fakes ready" ".data/fakes-${FAKES_TAG:-demo}.log" 2>/dev/null && break; sleep 0.2; done
    grep -q "fakes ready" ".data/fakes-${FAKES_TAG:-demo}.log" || { echo "local fakes did not start; see .data/fakes-${FAKES_TAG:-demo}.log" >&2; exit 1; }
    ;;
  stop)
    if [ -f "$pidfile" ]; then kill "$(cat "$pidfile")" 2>/dev/null || true; rm -f "$pidfile"; fi
    ;;
esac
