#!/usr/bin/env bash
# npm test: the whole suite from any machine with Node.js, CI included (fresh clone, root, no tty).
# Installs what is missing (npm packages, Chromium, poppler), starts the throw-away test cluster,
# then lint, type-checks, the front-end build and every vitest project. It keeps going after a failed
# step so one run shows everything, prints `N passed, N failed` last and exits non-zero on any failure.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

require_node
step "Checking npm packages"
ensure_node_modules
ensure_debian_package chromium chromium
ensure_debian_package pdftotext poppler-utils

step "Starting the test database cluster"
# The test cluster may already serve someone (another terminal); stop it at the end only if we started it.
started_cluster=""
scripts/pg.sh status --test || started_cluster=1
cleanup() {
  if [ -n "$started_cluster" ]; then scripts/pg.sh stop --test || true; fi
}
trap cleanup EXIT
trap 'exit 130' INT TERM
# The api project's global setup resets the test database itself, once per run; starting is enough here.
scripts/pg.sh start --test
# The suite never touches a database named by the caller's environment: always the test cluster's.
DATABASE_URL="$(scripts/pg.sh url --test)"
export DATABASE_URL
# From here on a failed step is counted, not fatal.
set +e

mkdir -p .artifacts
results_file=.artifacts/test-results.json
rm -f "$results_file"
steps=()
run_step() {
  local name="$1"; shift
  local started=$SECONDS
  step "$name"
  "$@"
  local code=$?
  info "$name: $([ $code = 0 ] && echo ok || echo "FAILED (exit $code)") in $((SECONDS - started)) s"
  steps+=("$name=$code")
}

run_step "lint (eslint)" npx eslint --max-warnings=0 .
run_step "type-check backend and tests (tsc)" npx tsc -p tsconfig.json --noEmit
run_step "type-check front end (vue-tsc)" npx vue-tsc -p frontend/tsconfig.json --noEmit
run_step "build front end (vite)" build_frontend

step "tests (vitest: unit, frontend, api, e2e)"
started=$SECONDS
npx vitest run --reporter=default --reporter=json --outputFile.json="$results_file"
vitest_code=$?
info "vitest exited $vitest_code in $((SECONDS - started)) s"

# Stop the cluster now (if ours) so that its message does not follow the closing line.
cleanup
started_cluster=""

step "Summary"
node scripts/test-summary.mjs "$results_file" "$vitest_code" "${steps[@]}"
