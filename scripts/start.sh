#!/usr/bin/env bash
# npm start: everything from a fresh clone to a served app.
source "$(dirname "$0")/common.sh"
export PORT="${PORT:-3000}"
ensure_deps
ensure_db lagwise
ensure_secret_key
migrate
start_dev_idp
start_s3_fake
node_modules/.bin/tsx db/move-documents.ts
node_modules/.bin/tsx seed/index.ts --if-empty
start_mail_sink
log "building (next build)"
node_modules/.bin/next build
export APP_URL="${APP_URL:-http://127.0.0.1:$PORT}"
if port_in_use "$PORT"; then log "port $PORT is taken; set PORT to a free port"; exit 1; fi
print_logins
log "serving on http://127.0.0.1:$PORT"
# The local set-up serves plain HTTP on loopback, so the session cookie cannot be Secure here.
case "${HOST:-127.0.0.1}" in
  127.*|localhost|::1) ;;
  *) if [ -z "${LAGWISE_SECURE_COOKIES:-}" ]; then
       log "WARNING: serving on ${HOST} without LAGWISE_SECURE_COOKIES=1: session cookies are not marked Secure and"
       log "         no HSTS is sent. Put Lagwise behind an HTTPS proxy and set LAGWISE_SECURE_COOKIES=1 (and TRUST_PROXY)."
     fi ;;
esac
[ -z "${LAGWISE_SECURE_COOKIES:-}" ] && export LAGWISE_INSECURE_COOKIES=1
start_worker
trap 'stop_worker; stop_s3_fake' EXIT
node_modules/.bin/next start -H "${HOST:-127.0.0.1}" -p "$PORT"
