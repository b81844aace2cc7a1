#!/usr/bin/env bash
# TypeORM's CLI under tsx against the dev database (or DATABASE_URL), with the project's data source.
#   npm run migration:generate -- backend/src/db/migrations/AddSomething   (writes a timestamped file)
#   npm run migration:generate -- backend/src/db/migrations/Drift --check  (exit 1 when entities drifted)
#   npm run migration:run | npm run migration:revert
# Generated files must still be listed in the data source's migrations array (we list them explicitly).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
command="${1:?usage: scripts/typeorm.sh migration:generate|migration:run|migration:revert [args]}"
shift
extra=()
[ "$command" = migration:generate ] && extra=(--pretty)
use_dev_database
exec node --import tsx node_modules/typeorm/cli.js "$command" -d scripts/typeorm-data-source.ts "${extra[@]}" "$@"
