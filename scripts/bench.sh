#!/usr/bin/env bash
# npm run bench:* — benchmarks that need the database run against a fresh test database.
source "$(dirname "$0")/common.sh"
ensure_deps
if [ -z "${DATABASE_URL:-}" ]; then
  bash db/pg.sh start
  bash db/pg.sh reset-test
  export DATABASE_URL="$(bash db/pg.sh url lagwise_test)"
fi
migrate
exec node --import tsx "$@"
