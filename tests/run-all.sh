#!/usr/bin/env bash
# The README's test command (`npm test`): unit, API and engine reference tests (vitest), then a
# production build, then the browser tests (Playwright on Debian's chromium against `next start`).
set -euo pipefail

cd "$(dirname "${BASH_SOURCE[0]}")/.."
export NEXT_TELEMETRY_DISABLED=1

step="checking system packages"
started=$(date +%s)
finish() {
  local code=$?
  local took=$(( $(date +%s) - started ))
  if [ "$code" -eq 0 ]; then
    echo "portolan tests: PASSED (vitest, next build, playwright) in ${took}s"
  else
    echo "portolan tests: FAILED while ${step} (exit ${code}) after ${took}s" >&2
  fi
}
trap finish EXIT

# Reference tests call Debian's python with numpy and scikit-rf; this numpy needs the old aliases
# restored before scikit-rf 0.15 imports.
has_skrf() {
  [ -x /usr/bin/python3 ] &&
    /usr/bin/python3 -c "import numpy as np; np.complex = complex; np.float = float; np.int = int; import skrf" >/dev/null 2>&1
}
has_chromium() {
  [ -x /usr/bin/chromium ]
}
# tests/api/queue.test.ts starts Debian's redis-server on a loopback port (REDIS_URL, BullMQ)
has_redis() {
  [ -x /usr/bin/redis-server ] && command -v redis-cli >/dev/null 2>&1
}

missing=()
has_chromium || missing+=("chromium")
has_skrf || missing+=("python3-scikit-rf" "python3-numpy")
has_redis || missing+=("redis-server")

if [ "${#missing[@]}" -gt 0 ]; then
  if [ "$(id -u)" -eq 0 ] && command -v apt-get >/dev/null 2>&1; then
    echo "Installing missing system packages: ${missing[*]}"
    apt-get update
    DEBIAN_FRONTEND=noninteractive apt-get install -y chromium python3-scikit-rf python3-numpy redis-server
  else
    {
      echo "Missing system packages: ${missing[*]}"
      echo "  /usr/bin/chromium runs the browser tests; Debian's /usr/bin/python3 with scikit-rf and numpy"
      echo "  is the reference for the engine tests; redis-server backs the queue tests. Install them as root:"
      echo "    sudo apt-get update && sudo apt-get install -y chromium python3-scikit-rf python3-numpy redis-server"
      echo "  then run npm test again. (Never use 'npx playwright install': the tests use Debian's chromium.)"
    } >&2
    exit 1
  fi
  has_chromium || { echo "chromium is still missing after apt-get install" >&2; exit 1; }
  has_skrf || { echo "/usr/bin/python3 still cannot import numpy and skrf after apt-get install" >&2; exit 1; }
  has_redis || { echo "redis-server is still missing after apt-get install" >&2; exit 1; }
fi

step="running vitest (unit, API and engine tests)"
echo "== vitest"
npx vitest run

step="building the app (next build)"
echo "== next build"
npx next build

step="running the browser tests (playwright)"
echo "== playwright"
npx playwright test
