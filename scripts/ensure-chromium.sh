#!/usr/bin/env bash
# The browser tests drive Debian's Chromium; install it from apt when it is missing (needs root, as on CI).
set -euo pipefail
if command -v chromium >/dev/null 2>&1; then exit 0; fi
if [ "$(id -u)" != 0 ]; then
  echo "browser tests need Chromium: run 'sudo apt-get install chromium' (Debian) and retry" >&2
  exit 1
fi
apt-get update -qq
DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends chromium fonts-liberation >/dev/null
