#!/usr/bin/env bash
# Runs `next build` unless the last build was made from exactly the current sources.
set -euo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"
# Files deleted but not yet committed are still listed by git; only files that exist are hashed
# (a missing one made sha256sum fail, which ended `npm start` without a word).
hash="$( { git ls-files -co --exclude-standard -- app components lib models public fonts types \
             next.config.mjs postcss.config.mjs tailwind.config.ts tsconfig.json package-lock.json \
           | sort -u | while IFS= read -r f; do if [ -f "$f" ]; then sha256sum -- "$f"; fi; done; } | sha256sum | cut -c1-64)"
if [ -f .next/BUILD_ID ] && [ "$(cat .next/siderea-source-hash 2>/dev/null)" = "$hash" ]; then
  say "build is up to date"
  exit 0
fi
say "building the app (next build)"
./node_modules/.bin/next build > .next-build.log 2>&1 || { tail -40 .next-build.log >&2; die "next build failed (log above, full log in .next-build.log)"; }
echo "$hash" > .next/siderea-source-hash
