#!/usr/bin/env bash
# npm start: everything from a fresh clone to a served app.
source "$(dirname "$0")/common.sh"
export PORT="${PORT:-3000}"
ensure_deps
ensure_db lagwise
ensure_secret_key
migrate
start_dev_idp
node_modules/.bin/tsx seed/index.ts --if-empty
start_mail_sink
log "building (next build)"
node_modules/.bin/next build
export APP_URL="${APP_URL:-http://127.0.0.1:$PORT}"
if port_in_use "$PORT"; then log "port $PORT is taken; set PORT to a free port"; exit 1; fi
print_logins
log "serving on http://127.0.0.1:$PORT"
# The local set-up serves plain HTTP on loopback, so the session cookie cannot be Secure here.
[ -z "${LAGWISE_SECURE_COOKIES:-}" ] && export LAGWISE_INSECURE_COOKIES=1
exec node_modules/.bin/next start -H "${HOST:-127.0.0.1}" -p "$PORT"
