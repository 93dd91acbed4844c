#!/usr/bin/env bash
# Every test: formatting, lint (zero warnings), typecheck, module boundaries, unit and API tests,
# production build, bundle budget, several production processes on one database behind a loopback
# balancer, end-to-end in Chromium.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-chromium.sh
npm run --silent format:check
npm run --silent lint
npm run --silent typecheck
node scripts/check-boundaries.mjs
npx vitest run
npm run --silent build
# Pages without the 3D preview ship no three.js and stay under 150 kB of gzipped JS.
npx tsx tests/bench/bundle-budget.ts
# Two and three production processes on one database (about a minute on a quiet machine).
npm run --silent test:multi
npx playwright test
