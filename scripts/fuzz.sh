#!/usr/bin/env bash
# npm run fuzz: the full property run of tests/api/fuzz.test.ts, 10,000 generated request bodies over
# every write endpoint (npm test runs a short one). FUZZ_RUNS and FUZZ_SEED override; the test cluster
# is started by the api project's own set-up, on CAGEWRIGHT_TEST_PG_PORT.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
require_node
ensure_node_modules
export FUZZ_RUNS="${FUZZ_RUNS:-10000}"
step "Fuzzing every write endpoint with $FUZZ_RUNS generated bodies"
exec npx vitest run --project api tests/api/fuzz.test.ts
