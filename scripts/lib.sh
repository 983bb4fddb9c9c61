# Shared steps of start.sh, test.sh and dev.sh. Sourced, not run.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

step() { printf '\n\033[1m▸ %s\033[0m\n' "$*"; }

# npm ci when node_modules is missing or was installed from another package-lock.json.
ensure_dependencies() {
  local want have=""
  want=$(sha256sum package-lock.json | cut -d' ' -f1)
  [ -f node_modules/.visitwort-lock ] && have=$(cat node_modules/.visitwort-lock)
  if [ "$want" != "$have" ]; then
    step "Installing npm dependencies (npm ci)"
    npm ci --no-audit --no-fund
    echo "$want" > node_modules/.visitwort-lock
  fi
}

# The database for one target (app, test, e2e): cluster up, migrations, checklists.
# The benchmarks' own database: schema only; the benches load their synthetic data themselves.
prepare_bench_database() {
  step "Preparing the bench database"
  npx tsx scripts/db.ts up bench
  VISITWORT_DB=bench npx tsx scripts/migrate.ts
}

prepare_database() {
  local target=$1
  step "Preparing the $target database"
  npx tsx scripts/db.ts up "$target"
  VISITWORT_DB=$target npx tsx scripts/migrate.ts
  VISITWORT_DB=$target npx tsx scripts/seed.ts
}
