#!/usr/bin/env bash
# npm run demo: migrate, seed the invented demo, build if the sources changed, start.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p .data
if [ -z "${NUXT_SESSION_PASSWORD:-}" ]; then
  [ -s .data/session-password ] || node -e "console.log(require('crypto').randomBytes(32).toString('base64url'))" > .data/session-password
  NUXT_SESSION_PASSWORD="$(cat .data/session-password)"
  export NUXT_SESSION_PASSWORD
fi
# Links in mail (invitations, password links) are built from this address only.
export NUXT_PUBLIC_URL="${NUXT_PUBLIC_URL:-http://localhost:${PORT:-3000}}"
npm run --silent db:migrate
npm run --silent db:seed
if [ ! -f .output/server/index.mjs ] || [ -n "$(find app server shared public nuxt.config.ts tailwind.config.ts -newer .output/server/index.mjs -type f -print -quit)" ]; then
  npm run build
fi
echo "Glint is starting on http://localhost:${PORT:-3000} (demo password: harbour-lantern-42)"
exec bash scripts/start.sh
