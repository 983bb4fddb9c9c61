#!/usr/bin/env bash
# npm run dev: the same database set-up as npm start, then Vite's dev server with hot reload.
source "$(dirname "$0")/lib.sh"
ensure_dependencies
prepare_database app
export VISITWORT_DB=app
if [ -z "${SMTP_URL:-}" ]; then
  node_modules/.bin/tsx scripts/mail-catcher.ts --exit-with $$ &
fi
exec npx react-router dev --host 127.0.0.1 --port "${PORT:-5173}"
