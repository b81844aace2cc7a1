#!/usr/bin/env bash
# Runs a command against the durable dev database: starts the private cluster when DATABASE_URL is not
# set, exports DATABASE_URL, then replaces itself with the command. Used by the db:* npm scripts.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_dotenv
use_dev_database
exec npx "$@"
