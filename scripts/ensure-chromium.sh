#!/usr/bin/env bash
# Browser tests drive Debian's Chromium; install it when it is missing.
set -euo pipefail
if [ -x /usr/bin/chromium ]; then exit 0; fi
echo "[headroom] /usr/bin/chromium is missing; installing Debian's chromium package"
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
$SUDO apt-get update -qq
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq chromium fonts-dejavu-core >/dev/null
/usr/bin/chromium --version
