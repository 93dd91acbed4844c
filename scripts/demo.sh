#!/usr/bin/env bash
# Sets up and runs Emberwright with demo data: embedded database, local fakes, production build.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p data

export DATABASE_URL="${DATABASE_URL:-file:./data/emberwright.db}"
export PORT="${PORT:-3000}"
export HOST="${HOST:-127.0.0.1}"
# A production build insists on its own origin and secrets; the demo makes each once and keeps it
# in data/ (the local payment and e-mail stand-ins are handed the same values).
export APP_ORIGIN="${APP_ORIGIN:-http://localhost:${PORT}}"
keep_secret() { # NAME FILE PREFIX
  if [ -z "${!1:-}" ]; then
    [ -s "$2" ] || node -e 'process.stdout.write(process.argv[1] + require("node:crypto").randomBytes(32).toString("hex"))' "$3" > "$2"
    export "$1=$(cat "$2")"
  fi
}
keep_secret SESSION_SECRET data/session-secret ""
keep_secret STRIPE_WEBHOOK_SECRET data/stripe-webhook-secret whsec_demo_
keep_secret STRIPE_SECRET_KEY data/stripe-secret-key sk_test_demo_
keep_secret RESEND_API_KEY data/resend-api-key re_demo_

npm run --silent db:migrate
npm run --silent db:seed
npm run --silent build

pids=()
cleanup() { for pid in "${pids[@]}"; do kill "$pid" 2>/dev/null || true; done; }
trap cleanup EXIT INT TERM
# shellcheck source=/dev/null
source scripts/start-fakes.sh

cat <<INFO

  Emberwright is running at ${APP_ORIGIN}
  A contractor's public page:  ${APP_ORIGIN}/c/cinder-slate
  Staff sign-in:               ${APP_ORIGIN}/login
    owner@cinder-slate.test · estimator@cinder-slate.test · crew@cinder-slate.test
    owner@north-ridge.test (a second company)
    password for all: $(npx tsx -e 'import { DEMO_PASSWORD } from "./scripts/seed-data.ts"; console.log(DEMO_PASSWORD)')
${FAKES_INFO:-}
INFO

NODE_ENV=production node server.mjs &
pids+=($!)
wait "${pids[-1]}"
