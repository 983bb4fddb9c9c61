#!/usr/bin/env bash
# The browser tests drive Debian's Chromium; nothing downloads a browser of its own.
set -euo pipefail
CHROMIUM=${CHROMIUM_PATH:-/usr/bin/chromium}
if [ -x "$CHROMIUM" ]; then exit 0; fi
if [ "$(id -u)" != 0 ]; then
  echo "Chromium is missing for the browser tests. Install it with: sudo apt-get install -y chromium" >&2
  exit 1
fi
echo "▸ Installing Debian's chromium for the browser tests (apt-get)"
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
apt-get install -y -qq --no-install-recommends chromium fonts-dejavu-core >/dev/null
