#!/usr/bin/env bash
# npm run dev: the API under `tsx watch` (restarts on save) and the Vite dev server (hot reload, proxies
# /api to the API) together against the durable dev cluster. Ctrl-C stops both; the database keeps running.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_dotenv

require_node
ensure_node_modules
use_dev_database
npx tsx --tsconfig tsconfig.json backend/src/db/migrate.ts
npx tsx --tsconfig tsconfig.json backend/src/db/seed.ts

# vite.config.ts proxies /api to port 3000, so the API keeps that port here.
export PORT=3000
# People use the Vite address in development, so invitation links point there.
export PUBLIC_URL="${PUBLIC_URL:-http://127.0.0.1:5173}"
step "API on http://127.0.0.1:3000 (tsx watch), app on http://127.0.0.1:5173 (vite)"
node node_modules/tsx/dist/cli.mjs watch --tsconfig tsconfig.json --clear-screen=false backend/src/server.ts &
api_pid=$!
node node_modules/vite/bin/vite.js --config frontend/vite.config.ts --host 127.0.0.1 &
vite_pid=$!
# Stop both children by their own process ids (not an npx wrapper, which would leave them running).
trap 'kill "$api_pid" "$vite_pid" 2>/dev/null; wait' EXIT INT TERM
wait -n "$api_pid" "$vite_pid"
