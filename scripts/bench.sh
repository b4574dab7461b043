#!/usr/bin/env bash
# npm run bench:* — benchmarks that need the database run against a fresh test database.
source "$(dirname "$0")/common.sh"
ensure_deps
use_fresh_test_db
migrate
exec node ${BENCH_NODE_FLAGS:-} --import tsx "$@"
