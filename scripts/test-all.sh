#!/usr/bin/env bash
# `npm test`: formatting, type checks, the build, then unit, integration and browser tests.
set -euo pipefail
cd "$(dirname "$0")/.."

chromium_bin="${CHROMIUM_PATH:-/usr/bin/chromium}"
if [ ! -x "$chromium_bin" ]; then
	if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null; then
		echo "Chromium is missing: installing Debian's chromium package for the browser tests…"
		apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
	else
		echo "The browser tests need Chromium. Install the Debian package: sudo apt-get install chromium" >&2
		exit 1
	fi
fi

echo "== format and types"
npx prettier --check . --log-level warn
npx svelte-kit sync
npx svelte-check --tsconfig ./tsconfig.json --fail-on-warnings --output human
npx eslint . --max-warnings 0
npx knip --no-progress

echo "== sample imagery"
node geodata/generate-tiles.js

echo "== build"
npx vite build --logLevel warn
node scripts/check-bundle.js

# Projects run one after another: integration and browser tests each start servers,
# and this machine has two cores.
echo "== unit tests"
npx vitest run --project unit
echo "== integration tests"
npx vitest run --project integration
echo "== browser tests"
npx vitest run --project e2e
