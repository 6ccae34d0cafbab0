#!/usr/bin/env bash
# `npm run test:pg` / `npm run test:e2e:pg`: the integration suite (tests/server) or the browser
# suite (tests/e2e) against PostgreSQL. Uses the server in FIELDTIDE_TEST_PG_URL (an admin URL;
# each test file, or the browser suite's app, makes and drops a database of its own), or starts a
# throwaway one on loopback with scripts/pg-local.sh. Extra arguments go to vitest.
set -euo pipefail
cd "$(dirname "$0")/.."
suite="${1:-server}"
shift || true
if [ -z "${FIELDTIDE_TEST_PG_URL:-}" ]; then
  FIELDTIDE_TEST_PG_URL="$(bash scripts/pg-local.sh start)"
fi
export FIELDTIDE_TEST_PG_URL
echo "[test:pg] PostgreSQL at ${FIELDTIDE_TEST_PG_URL} (${suite})"
case "$suite" in
  server) exec npx vitest run tests/server "$@" ;;
  e2e) exec npx vitest run --config vitest.e2e.config.ts "$@" ;;
  *) echo "usage: $0 server|e2e [vitest args]" >&2; exit 2 ;;
esac
