#!/usr/bin/env bash
# `npm run test:pg`: the integration suite (tests/server) against PostgreSQL. Uses the server in
# FIELDTIDE_TEST_PG_URL (an admin URL; each test file makes and drops a database of its own), or
# starts a throwaway one on loopback with scripts/pg-local.sh. Extra arguments go to vitest.
set -euo pipefail
cd "$(dirname "$0")/.."
if [ -z "${FIELDTIDE_TEST_PG_URL:-}" ]; then
  FIELDTIDE_TEST_PG_URL="$(bash scripts/pg-local.sh start)"
fi
export FIELDTIDE_TEST_PG_URL
echo "[test:pg] PostgreSQL at ${FIELDTIDE_TEST_PG_URL}"
exec npx vitest run tests/server "$@"
