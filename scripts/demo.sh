#!/usr/bin/env bash
# Sets up and runs Emberwright with demo data: embedded database, local fakes, production build.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p data

export DATABASE_URL="${DATABASE_URL:-file:./data/emberwright.db}"
export PORT="${PORT:-3000}"
export HOST="${HOST:-127.0.0.1}"
# A production build insists on a real secret; the demo keeps one of its own in data/.
if [ -z "${SESSION_SECRET:-}" ]; then
  [ -s data/session-secret ] || node -e 'process.stdout.write(require("node:crypto").randomBytes(32).toString("hex"))' > data/session-secret
  export SESSION_SECRET="$(cat data/session-secret)"
fi

npm run --silent db:migrate
npm run --silent db:seed
npm run --silent build

pids=()
cleanup() { for pid in "${pids[@]}"; do kill "$pid" 2>/dev/null || true; done; }
trap cleanup EXIT INT TERM
# shellcheck source=/dev/null
source scripts/start-fakes.sh

cat <<INFO

  Emberwright is running at http://localhost:${PORT}
  A contractor's public page:  http://localhost:${PORT}/c/cinder-slate
  Staff sign-in:               http://localhost:${PORT}/login
    owner@cinder-slate.test · estimator@cinder-slate.test · crew@cinder-slate.test
    owner@north-ridge.test (a second company)
    password for all: $(npx tsx -e 'import { DEMO_PASSWORD } from "./scripts/seed-data.ts"; console.log(DEMO_PASSWORD)')
${FAKES_INFO:-}
INFO

NODE_ENV=production node_modules/.bin/react-router-serve ./build/server/index.js &
pids+=($!)
wait "${pids[-1]}"
