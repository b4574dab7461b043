#!/usr/bin/env bash
# npm test: set up like npm start against a fresh test database, then every suite.
source "$(dirname "$0")/common.sh"
ensure_deps
use_fresh_test_db
migrate

# Test services on their own ports so a running `npm start` is not disturbed.
export MAIL_SINK_SMTP_PORT="${TEST_MAIL_SMTP_PORT:-2535}" MAIL_SINK_HTTP_PORT="${TEST_MAIL_HTTP_PORT:-2536}"
export MAIL_SINK_FILE=".data/mail/test-messages.jsonl"
rm -f "$MAIL_SINK_FILE"
unset SMTP_URL
start_mail_sink
export PORT="${TEST_PORT:-3100}"
export APP_URL="http://127.0.0.1:$PORT"
ensure_secret_key
export OIDC_DEV_PORT="${TEST_OIDC_PORT:-4020}" OIDC_DEV_APP_PORTS="$PORT"
start_dev_idp
trap 'stop_mail_sink; stop_dev_idp; stop_worker' EXIT

status=0
log "format and lint (Biome), then types (tsc)"
node_modules/.bin/biome ci --colors=off . || { log "Biome found format drift or lint errors: run npm run format, then fix what npm run lint names"; status=1; }
node_modules/.bin/tsc --noEmit || status=1
log "unit, reference and integration tests (vitest)"
rm -f .data/reports/*.json
mkdir -p .data/reports
node_modules/.bin/vitest run --reporter=default --reporter=json --outputFile=.data/reports/vitest.json || status=1

if [ ! -x /usr/bin/chromium ]; then
  if [ "$(id -u)" = 0 ]; then
    log "installing Debian's chromium for end-to-end tests"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq >/dev/null && apt-get install -y -qq chromium >/dev/null
  else
    log "chromium is missing: install Debian's chromium package"; exit 1
  fi
fi

log "seeding the demo scenario into the test database"
node_modules/.bin/tsx seed/index.ts
log "building for end-to-end tests"
node_modules/.bin/next build >/tmp/lagwise-test-build.log 2>&1 || { cat /tmp/lagwise-test-build.log; exit 1; }
# The job worker only now: the integration tests start and kill their own workers.
start_worker
log "end-to-end tests (Playwright, Debian chromium)"
LAGWISE_INSECURE_COOKIES=1 PLAYWRIGHT_JSON_OUTPUT_NAME=.data/reports/playwright.json node_modules/.bin/playwright test --reporter=list,json || status=1

node scripts/summary.mjs .data/reports/vitest.json .data/reports/playwright.json || true
if [ "$status" = 0 ]; then log "all suites passed"; else log "some tests failed"; fi
exit "$status"
