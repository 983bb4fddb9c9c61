#!/usr/bin/env bash
# npm run dev: the same database set-up as npm start, then Vite's dev server with hot reload.
source "$(dirname "$0")/lib.sh"
ensure_dependencies
if [ -z "${S3_ENDPOINT:-}" ]; then
  node_modules/.bin/tsx scripts/s3-fake.ts --exit-with $$ &
  export VISITWORT_EXPECT_STORAGE=1
fi
prepare_database app
export VISITWORT_DB=app
if [ -z "${SMTP_URL:-}" ]; then
  node_modules/.bin/tsx scripts/mail-catcher.ts --exit-with $$ &
fi
exec npx react-router dev --host 127.0.0.1 --port "${PORT:-5173}"
