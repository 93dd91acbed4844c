# Sourced by demo.sh and the end-to-end server: starts each local fake that exists, appends its
# pid to `pids` and points the app at it. Each fake also runs alone (see DEVELOPERS.md).
FAKES_INFO=""
if [ -f fakes/email/server.ts ]; then
  export EMAIL_FAKE_PORT="${EMAIL_FAKE_PORT:-4010}"
  export RESEND_BASE_URL="http://127.0.0.1:${EMAIL_FAKE_PORT}"
  # The stand-in accepts only the app's own key, as the service would.
  if [ -n "${RESEND_API_KEY:-}" ]; then export EMAIL_FAKE_API_KEY="${RESEND_API_KEY}"; fi
  node_modules/.bin/tsx fakes/email/server.ts &
  pids+=($!)
  FAKES_INFO+="  Local mail catcher:          ${RESEND_BASE_URL}"$'\n'
fi
if [ -f fakes/payments/server.ts ]; then
  export PAYMENTS_FAKE_PORT="${PAYMENTS_FAKE_PORT:-4020}"
  export STRIPE_API_BASE="http://127.0.0.1:${PAYMENTS_FAKE_PORT}"
  export PAYMENTS_FAKE_WEBHOOK_URL="http://127.0.0.1:${PORT}/api/webhooks/stripe"
  node_modules/.bin/tsx fakes/payments/server.ts &
  pids+=($!)
  FAKES_INFO+="  Local payments service:      ${STRIPE_API_BASE}"$'\n'
fi
