#!/usr/bin/env bash
# npm test: every check CI runs, in order — system packages, lint, types, client build, all test suites.
set -euo pipefail
cd "$(dirname "$0")/.."

bash scripts/ensure-system-packages.sh
echo "== lint"; npx eslint .
echo "== typecheck"; npx tsc -b
echo "== build"; npx vite build --logLevel warn
echo "== tests"; npx vitest run "$@"
