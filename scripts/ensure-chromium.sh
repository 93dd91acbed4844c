#!/usr/bin/env bash
# End-to-end tests drive Debian's Chromium (Playwright cannot download browsers here).
set -euo pipefail
CHROMIUM="${CHROMIUM_PATH:-/usr/bin/chromium}"
if [ -x "$CHROMIUM" ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null; then
  echo "Chromium is missing: installing Debian's chromium package…"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
  exit 0
fi
echo "Chromium was not found at $CHROMIUM. Install Debian's package (sudo apt-get install chromium) or set CHROMIUM_PATH." >&2
exit 1
