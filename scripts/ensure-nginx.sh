#!/usr/bin/env bash
# The speed bench puts Debian's nginx in front of the app processes, as production would.
set -euo pipefail
NGINX="${NGINX_PATH:-/usr/sbin/nginx}"
if [ -x "$NGINX" ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null; then
  echo "nginx is missing: installing Debian's nginx package…"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq nginx >/dev/null
  # The package may start its own server on port 80: the bench runs its own, so stop that one.
  if [ -f /run/nginx.pid ]; then kill "$(cat /run/nginx.pid)" 2>/dev/null || true; fi
  exit 0
fi
echo "nginx was not found at $NGINX. Install Debian's package (sudo apt-get install nginx) or set NGINX_PATH." >&2
exit 1
