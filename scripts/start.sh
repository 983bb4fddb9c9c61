#!/usr/bin/env bash
# npm start: install, database, migrations, seed, build, serve on http://127.0.0.1:$PORT.
source "$(dirname "$0")/lib.sh"
export PORT="${PORT:-3000}"

ensure_dependencies
# Refuse early, before rebuilding under a running server.
npx tsx scripts/port-free.ts "$PORT" "Visitwort (or another program) is already serving on 127.0.0.1:$PORT. Open http://127.0.0.1:$PORT, stop the other server, or start with PORT=<another port> npm start."
if [ -z "${S3_ENDPOINT:-}" ]; then
  step "Starting the local photo storage (an S3-compatible fake on 127.0.0.1)"
  node_modules/.bin/tsx scripts/s3-fake.ts --exit-with $$ &
  # The demo seed stores its photos there: let the seed wait for it.
  export VISITWORT_EXPECT_STORAGE=1
fi
prepare_database app
step "Building the app"
npx react-router build --logLevel warn
if [ -z "${SMTP_URL:-}" ]; then
  step "Starting the local mail catcher (read what was sent at /dev/mail, signed in as a coordinator)"
  # tsx itself, not npx: npx does not pass signals on. --exit-with: it stops with the server.
  node_modules/.bin/tsx scripts/mail-catcher.ts --exit-with $$ &
fi
step "Serving Visitwort at http://127.0.0.1:$PORT"
export NODE_ENV=production HOST=127.0.0.1 VISITWORT_DB=app
exec node scripts/serve.js
