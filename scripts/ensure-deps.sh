#!/bin/sh
# Installs node_modules from package-lock.json when they are missing or older than the lock.
set -eu
if [ "${1:-}" = '--help' ]; then
  echo 'usage: sh scripts/ensure-deps.sh  (runs npm ci when node_modules is missing or stale)'
  exit 0
fi
cd "$(dirname "$0")/.."

if [ ! -d node_modules ] || [ ! -f node_modules/.package-lock.json ] \
  || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo 'deps: installing node_modules (npm ci)'
  npm ci --no-audit --no-fund
fi
