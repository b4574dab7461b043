#!/usr/bin/env bash
# npm run dev: the same services, with next dev.
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
print_logins
start_worker
trap 'stop_worker; stop_s3_fake' EXIT
node_modules/.bin/next dev -H 127.0.0.1 -p "$PORT"
