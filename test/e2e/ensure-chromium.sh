#!/usr/bin/env bash
# Browser tests drive Debian's headless Chromium at /usr/bin/chromium through
# playwright-core; no browser is ever downloaded by npm. If it is missing we
# install the distribution package when we can (root), and otherwise stop with
# instructions: the browser test never skips silently.
set -euo pipefail

chromium="${CHROMIUM_PATH:-/usr/bin/chromium}"

if [ -x "$chromium" ]; then
  exit 0
fi

if [ "$(id -u)" -eq 0 ] && command -v apt-get >/dev/null 2>&1; then
  echo "ensure-chromium: $chromium is missing; installing Debian's chromium package with apt-get" >&2
  export DEBIAN_FRONTEND=noninteractive
  apt-get update
  apt-get install -y --no-install-recommends chromium
  if [ -x "$chromium" ]; then
    exit 0
  fi
  echo "ensure-chromium: apt-get finished but $chromium still does not exist" >&2
  exit 1
fi

cat >&2 <<MSG
ensure-chromium: the browser tests need Chromium at $chromium, and it is not installed.
Install it, then run the tests again:

  sudo apt-get update && sudo apt-get install -y chromium

(On a distribution without that package, install Chromium another way and set
CHROMIUM_PATH to its executable.)
MSG
exit 1
