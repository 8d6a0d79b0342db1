#!/bin/sh
# Browser tests drive Debian's Chromium; install it when missing and we are root.
if command -v chromium >/dev/null 2>&1 || [ -x /usr/bin/chromium ]; then
    exit 0
fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
    echo "Installing Chromium for the browser tests (apt-get install chromium)..."
    apt-get update -qq && apt-get install -y -qq chromium >/dev/null && exit 0
fi
echo "Chromium is not installed: browser tests will be skipped."
echo "Install it with: sudo apt-get install -y chromium"
exit 0
