#!/usr/bin/env bash
# The server the end-to-end tests run against: a fresh database, demo data, fakes, production build.
set -euo pipefail
cd "$(dirname "$0")/.."
rm -rf data/e2e && mkdir -p data/e2e
export DATABASE_URL="file:./data/e2e/emberwright.db"
export UPLOADS_DIR="./data/e2e/uploads"
export PAYMENTS_FAKE_STATE="./data/e2e/payments-fake.json"
export SESSION_SECRET="e2e-secret-0123456789abcdef0123456789abcdef"
export PORT="${E2E_PORT:-3210}" HOST=127.0.0.1
# Production settings of its own; the fakes get the same webhook secret and e-mail key.
export APP_ORIGIN="http://localhost:${PORT}"
export STRIPE_WEBHOOK_SECRET="whsec_e2e_0123456789abcdef" STRIPE_SECRET_KEY="sk_test_e2e_0123456789" RESEND_API_KEY="re_e2e_0123456789"
# Every journey comes from one address; the per-address limit has its own tests.
export PUBLIC_FORM_LIMIT=1000
export EMAIL_FAKE_PORT="${E2E_EMAIL_PORT:-4110}" PAYMENTS_FAKE_PORT="${E2E_PAYMENTS_PORT:-4120}"
npm run --silent db:migrate
npm run --silent db:seed
pids=()
trap 'for pid in "${pids[@]}"; do kill "$pid" 2>/dev/null || true; done' EXIT INT TERM
# shellcheck source=/dev/null
source scripts/start-fakes.sh
NODE_ENV=production node server.mjs &
pids+=($!)
wait "${pids[-1]}"
