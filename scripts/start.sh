#!/usr/bin/env bash
# `npm start`: installs what is missing, starts PostgreSQL, migrates, seeds the demo, builds
# and serves the app on http://127.0.0.1:${PORT:-3000}.
set -euo pipefail
. "$(dirname "$0")/lib.sh"
started=$(date +%s)

bash "$ROOT/scripts/setup.sh"
ensure_env_file
export DATABASE_URL="${DATABASE_URL:-$(bash "$ROOT/scripts/db.sh" url)}"
say "seeding the demo scenario (skipped where already seeded)"
(cd "$ROOT" && ./node_modules/.bin/sequelize-cli db:seed:all >/dev/null) || die "seeding failed (run 'npm run seed' to see why)"
bash "$ROOT/scripts/build-if-changed.sh"

PORT="${PORT:-3000}"
export NEXTAUTH_URL="${NEXTAUTH_URL:-http://127.0.0.1:$PORT}"
export SIDEREA_GIT_COMMIT="${SIDEREA_GIT_COMMIT:-$(git -C "$ROOT" rev-parse HEAD 2>/dev/null || true)}"
say "ready in $(( $(date +%s) - started )) s: serving on http://127.0.0.1:$PORT (demo accounts in README.md; Ctrl-C stops)"
cd "$ROOT"
# Mail: unless a relay is configured (SIDEREA_SMTP_URL, or SIDEREA_SMTP_HOST other than
# 127.0.0.1), the local SMTP sink receives it and the admin inbox page shows it.
sink=""
if [ -z "${SIDEREA_SMTP_URL:-}" ] && [ "${SIDEREA_SMTP_HOST:-127.0.0.1}" = 127.0.0.1 ]; then
  export SIDEREA_SMTP_PORT="${SIDEREA_SMTP_PORT:-2525}"
  export SIDEREA_MAIL_SINK_DIR="${SIDEREA_MAIL_SINK_DIR:-$ROOT/.siderea/mail}"
  export SIDEREA_MAIL_INBOX="${SIDEREA_MAIL_INBOX:-on}"
  start_smtp_sink "$SIDEREA_SMTP_PORT" "$SIDEREA_MAIL_SINK_DIR"
  sink=$SMTP_SINK_PID
  say "SMTP sink on 127.0.0.1:$SIDEREA_SMTP_PORT (messages in $SIDEREA_MAIL_SINK_DIR; Admin -> Inbox shows them)"
fi
# The job worker runs beside the web server; more can be started with `npm run worker`.
node --import tsx --conditions=react-server lib/worker/main.ts &
worker=$!
trap 'kill $worker $sink 2>/dev/null || true' EXIT INT TERM
./node_modules/.bin/next start -H 127.0.0.1 -p "$PORT"
