#!/usr/bin/env bash
# npm test: the same set-up as npm start against the test databases, then typecheck, the
# unit and integration tests and the browser tests, in one vitest run.
source "$(dirname "$0")/lib.sh"

ensure_dependencies
bash scripts/ensure-chromium.sh
prepare_database test
prepare_database e2e
prepare_bench_database
step "Typecheck"
npm run --silent typecheck
step "Building the app for the browser tests"
npx react-router build --logLevel warn
step "Tests"
exec npx vitest run "$@"
