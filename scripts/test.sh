#!/usr/bin/env bash
# The README's test command: installs what is missing (Debian's Chromium, npm packages), runs every test.
set -euo pipefail
cd "$(dirname "$0")/.."
if [ ! -x /usr/bin/chromium ]; then
  if [ "$(id -u)" = 0 ]; then apt-get update && apt-get install -y chromium
  else sudo apt-get update && sudo apt-get install -y chromium; fi
fi
npm ci
npm test
