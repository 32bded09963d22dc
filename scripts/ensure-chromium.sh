#!/usr/bin/env bash
# The browser tests drive Debian's Chromium; install it when it is missing and we may.
set -euo pipefail
bin="${CODEWEIR_CHROMIUM:-/usr/bin/chromium}"
if [ -x "$bin" ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "codeweir: installing Debian's chromium for the browser tests..." >&2
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq chromium >/dev/null
else
  echo "codeweir: the browser tests need Chromium at $bin; install Debian's 'chromium' package (apt-get install -y chromium) or set CODEWEIR_CHROMIUM." >&2
  exit 1
fi
