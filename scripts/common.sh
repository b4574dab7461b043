# Shared set-up for npm start, npm test and npm run dev. Sourced, not run.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
export NEXT_TELEMETRY_DISABLED=1
log() { printf '\033[1m[lagwise]\033[0m %s\n' "$*" >&2; }

# npm ci when node_modules is missing or older than the lock file.
ensure_deps() {
  local stamp=node_modules/.lagwise-lock-hash want
  want="$(sha1sum package-lock.json | cut -c1-40)"
  if [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
    log "installing dependencies (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
    echo "$want" > "$stamp"
  fi
}

# Local PostgreSQL unless DATABASE_URL points elsewhere.
ensure_db() {
  if [ -n "${DATABASE_URL:-}" ]; then
    log "using DATABASE_URL from the environment"
  else
    bash db/pg.sh start
    export DATABASE_URL="$(bash db/pg.sh url "${1:-lagwise}")"
    export DATABASE_OWNER_URL="$(bash db/pg.sh owner-url "${1:-lagwise}")"
  fi
}

port_in_use() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }
http_ok() { node -e "fetch(process.argv[1]).then(r=>process.exit(r.ok?0:1),()=>process.exit(1))" "$1"; }

# Local SMTP sink (unless SMTP_URL is set). Reuses a sink already listening on the port.
start_mail_sink() {
  if [ -n "${SMTP_URL:-}" ]; then log "sending mail through SMTP_URL"; return; fi
  export MAIL_SINK_SMTP_PORT="${MAIL_SINK_SMTP_PORT:-2525}" MAIL_SINK_HTTP_PORT="${MAIL_SINK_HTTP_PORT:-2526}"
  export MAIL_SINK_FILE="${MAIL_SINK_FILE:-.data/mail/messages.jsonl}"
  if port_in_use "$MAIL_SINK_SMTP_PORT"; then
    if http_ok "http://127.0.0.1:$MAIL_SINK_HTTP_PORT/health"; then log "mail sink already running (messages: http://127.0.0.1:$MAIL_SINK_HTTP_PORT/messages)"; return; fi
    log "port $MAIL_SINK_SMTP_PORT is taken by another program; set MAIL_SINK_SMTP_PORT"; exit 1
  fi
  mkdir -p .data/mail
  nohup node_modules/.bin/tsx lib/mail/sink-server.ts >> .data/mail/sink.log 2>&1 &
  echo $! > ".data/mail/sink-$MAIL_SINK_SMTP_PORT.pid"
  for _ in $(seq 1 50); do http_ok "http://127.0.0.1:$MAIL_SINK_HTTP_PORT/health" && break; sleep 0.2; done
  http_ok "http://127.0.0.1:$MAIL_SINK_HTTP_PORT/health" || { log "mail sink did not start; see .data/mail/sink.log"; exit 1; }
  log "mail sink on 127.0.0.1:$MAIL_SINK_SMTP_PORT (messages, loopback only: http://127.0.0.1:$MAIL_SINK_HTTP_PORT/messages)"
}

stop_mail_sink() {
  local f=".data/mail/sink-${MAIL_SINK_SMTP_PORT:-2525}.pid"
  [ -f "$f" ] && kill "$(cat "$f")" 2>/dev/null || true
  rm -f "$f"
}

migrate() { node_modules/.bin/tsx db/migrate.ts; }

# The job worker (npm run worker) next to the web server, with the same environment. Its pid file is
# keyed by the web port, so the start, dev and test set-ups of one checkout each stop only their own.
start_worker() {
  mkdir -p .data
  local f=".data/worker-${PORT:-3000}.pid" l=".data/worker-${PORT:-3000}.log"
  if [ -f "$f" ] && kill -0 "$(cat "$f")" 2>/dev/null; then log "job worker already running (pid $(cat "$f"))"; return; fi
  # React (the PDFs) runs its production build in the worker: the development build adds checks and
  # a debug stack to every element of every calculation sheet, which the worker has no use for.
  NODE_ENV="${WORKER_NODE_ENV:-production}" nohup bash scripts/worker.sh >> "$l" 2>&1 &
  echo $! > "$f"
  for _ in $(seq 1 50); do grep -q "\[worker\] working" "$l" 2>/dev/null && break; kill -0 "$(cat "$f")" 2>/dev/null || break; sleep 0.2; done
  kill -0 "$(cat "$f")" 2>/dev/null || { log "job worker did not start; see $l"; exit 1; }
  log "job worker running (pid $(cat "$f"), log $l)"
}

stop_worker() {
  local f=".data/worker-${PORT:-3000}.pid"
  [ -f "$f" ] && kill "$(cat "$f")" 2>/dev/null || true
  rm -f "$f"
}

# A fresh test database (recreated each time) unless DATABASE_URL points elsewhere; used by npm test and the benchmarks.
use_fresh_test_db() {
  if [ -z "${DATABASE_URL:-}" ]; then
    bash db/pg.sh start
    bash db/pg.sh reset-test
    export DATABASE_URL="$(bash db/pg.sh url "${LAGWISE_TEST_DB_NAME:-lagwise_test}")"
    export DATABASE_OWNER_URL="$(bash db/pg.sh owner-url "${LAGWISE_TEST_DB_NAME:-lagwise_test}")"
  fi
}

# Key for secrets at rest (company sign-in client secrets): from the environment, or a local one kept in .data/.
ensure_secret_key() {
  if [ -z "${LAGWISE_SECRET_KEY:-}" ]; then
    mkdir -p .data
    [ -s .data/secret-key ] || node -e "process.stdout.write(require('crypto').randomBytes(32).toString('base64url'))" > .data/secret-key
    chmod 600 .data/secret-key
    export LAGWISE_SECRET_KEY="$(cat .data/secret-key)"
  fi
}

# Local OpenID Connect provider for company sign-in in development and tests (never in production use).
start_dev_idp() {
  if [ "${OIDC_DEV_DISABLED:-}" = 1 ]; then return; fi
  export OIDC_DEV_PORT="${OIDC_DEV_PORT:-4010}"
  export OIDC_DEV_ISSUER="http://127.0.0.1:$OIDC_DEV_PORT"
  export OIDC_DEV_APP_PORTS="${OIDC_DEV_APP_PORTS:-${PORT:-3000}}"
  if http_ok "$OIDC_DEV_ISSUER/.well-known/openid-configuration"; then log "local identity provider already running"; return; fi
  if port_in_use "$OIDC_DEV_PORT"; then log "port $OIDC_DEV_PORT is taken by another program; set OIDC_DEV_PORT"; exit 1; fi
  mkdir -p .data
  nohup node lib/auth/dev-idp.mjs >> ".data/idp-$OIDC_DEV_PORT.log" 2>&1 &
  echo $! > ".data/idp-$OIDC_DEV_PORT.pid"
  for _ in $(seq 1 50); do http_ok "$OIDC_DEV_ISSUER/.well-known/openid-configuration" && break; sleep 0.2; done
  http_ok "$OIDC_DEV_ISSUER/.well-known/openid-configuration" || { log "identity provider did not start; see .data/idp-$OIDC_DEV_PORT.log"; exit 1; }
  log "local identity provider at $OIDC_DEV_ISSUER (company sign-in for korvane.example)"
}

stop_dev_idp() {
  local f=".data/idp-${OIDC_DEV_PORT:-4010}.pid"
  [ -f "$f" ] && kill "$(cat "$f")" 2>/dev/null || true
  rm -f "$f"
}

# S3-compatible object storage for documents kept as issued (unless S3_ENDPOINT points at real storage):
# a local fake (s3rver) on loopback, objects under S3_FAKE_DIR. Reuses a fake already answering on the port.
start_s3_fake() {
  if [ -n "${S3_ENDPOINT:-}" ]; then log "keeping documents in the object store at S3_ENDPOINT"; return; fi
  export S3_FAKE_PORT="${S3_FAKE_PORT:-4566}" S3_FAKE_DIR="${S3_FAKE_DIR:-.data/s3}" S3_BUCKET="${S3_BUCKET:-lagwise}"
  export S3_ENDPOINT="http://127.0.0.1:$S3_FAKE_PORT" S3_ACCESS_KEY_ID="${S3_ACCESS_KEY_ID:-S3RVER}" S3_SECRET_ACCESS_KEY="${S3_SECRET_ACCESS_KEY:-S3RVER}"
  if http_ok "$S3_ENDPOINT/"; then log "local object store already running ($S3_ENDPOINT)"; return; fi
  if port_in_use "$S3_FAKE_PORT"; then log "port $S3_FAKE_PORT is taken by another program; set S3_FAKE_PORT"; exit 1; fi
  mkdir -p "$S3_FAKE_DIR"
  nohup node lib/storage/fake-s3.mjs >> ".data/s3-$S3_FAKE_PORT.log" 2>&1 &
  echo $! > ".data/s3-$S3_FAKE_PORT.pid"
  for _ in $(seq 1 50); do http_ok "$S3_ENDPOINT/" && break; sleep 0.2; done
  http_ok "$S3_ENDPOINT/" || { log "local object store did not start; see .data/s3-$S3_FAKE_PORT.log"; exit 1; }
  log "local object store on $S3_ENDPOINT (bucket $S3_BUCKET, files in $S3_FAKE_DIR)"
}

stop_s3_fake() {
  local f=".data/s3-${S3_FAKE_PORT:-4566}.pid"
  [ -f "$f" ] && kill "$(cat "$f")" 2>/dev/null || true
  rm -f "$f"
}

print_logins() {
  cat >&2 <<'EOT'

  Demo sign-ins (organization Korvane Polymers, project BP-STM-24):
    owner       owner@korvane.example              kiln-owner-4471
    engineer    engineer@korvane.example           kiln-engineer-4471
    reviewer    reviewer@korvane.example           kiln-reviewer-4471
    contractor  contractor@hollis-thermal.example  kiln-contractor-4471
  A second organization (Tallgate Energy): owner@tallgate.example / kiln-tallgate-4471
  Company sign-in (local identity provider): engineer@korvane.example / korvane-sso-engineer,
    newcomer@korvane.example / korvane-sso-newcomer (arrives as a member waiting for approval)
EOT
}
