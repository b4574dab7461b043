#!/usr/bin/env bash
# npm run bench:* — benchmarks that need the database run against a fresh test database.
source "$(dirname "$0")/common.sh"
ensure_deps
use_fresh_test_db
migrate
# Bills and uploads are kept in the object store: the test fake, on the test port.
export S3_FAKE_PORT="${TEST_S3_FAKE_PORT:-4576}" S3_FAKE_DIR=".data/s3-test" S3_BUCKET="${TEST_S3_BUCKET:-lagwise-test}"
start_s3_fake
trap stop_s3_fake EXIT
node ${BENCH_NODE_FLAGS:-} --import tsx "$@"
