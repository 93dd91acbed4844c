#!/usr/bin/env bash
# Every test: typecheck, unit and API tests, production build, end-to-end in Chromium.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-chromium.sh
npm run --silent typecheck
node scripts/check-boundaries.mjs
npx vitest run
npm run --silent build
npx playwright test
