#!/usr/bin/env bash
# Shared set-up of `npm start` and `npm test`: npm packages, local secrets, PostgreSQL,
# migrations of the demo database. Safe to run again: every step skips what is done.
set -euo pipefail
. "$(dirname "$0")/lib.sh"

ensure_node_modules
ensure_env_file
bash "$ROOT/scripts/db.sh" start
export DATABASE_URL="${DATABASE_URL:-$(bash "$ROOT/scripts/db.sh" url)}"
say "migrating $(echo "$DATABASE_URL" | sed -E 's#//[^@]*@#//#')"
(cd "$ROOT" && ./node_modules/.bin/sequelize-cli db:migrate >/dev/null) || die "migrations failed (run 'npm run migrate' to see why)"
