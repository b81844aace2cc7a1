#!/usr/bin/env bash
# npm start: from a fresh clone on a machine with Node.js to the running app at http://127.0.0.1:PORT.
# Installs npm packages and PostgreSQL when missing, starts the durable private cluster (it keeps
# running afterwards and is reused; `npm run db:stop` stops it), migrates, seeds the demo (idempotent),
# builds the front end when its sources changed, then replaces itself with the server's supervisor
# (backend/src/supervisor.ts: restarts the server after an unexpected exit; Ctrl-C stops both).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_dotenv

require_node
step "Checking npm packages"
ensure_node_modules

step "Starting the database (private PostgreSQL cluster on 127.0.0.1:${CAGEWRIGHT_PG_PORT:-54320} unless DATABASE_URL is set)"
use_dev_database

step "Migrating the database"
npx tsx --tsconfig tsconfig.json backend/src/db/migrate.ts

step "Seeding the demo club (kept if already there)"
npx tsx --tsconfig tsconfig.json backend/src/db/seed.ts

step "Checking the front end"
ensure_frontend_built

export PORT="${PORT:-3000}"
# Invitation links are built from PUBLIC_URL; follow the port unless the caller says otherwise.
export PUBLIC_URL="${PUBLIC_URL:-http://127.0.0.1:$PORT}"
step "Serving Cagewright at http://127.0.0.1:$PORT (Ctrl-C stops it; the database keeps running)"
# The server itself runs the fake SMTP server (FAKE_SMTP, on by default outside production).
fake_smtp="${FAKE_SMTP:-$([ "${NODE_ENV:-development}" = production ] && echo false || echo true)}"
if [ "$fake_smtp" = true ] || [ "$fake_smtp" = 1 ]; then
  info "e-mail is caught by the local fake SMTP server on ${SMTP_URL:-smtp://127.0.0.1:2525}; admins read it under Mailbox"
fi
# The supervisor restarts the server if it ever exits unexpectedly, and says so in the log.
exec node --import tsx backend/src/supervisor.ts -- node --import tsx backend/src/server.ts
