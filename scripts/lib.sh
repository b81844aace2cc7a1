# Shared helpers for the project's shell scripts (start, test, dev). Sourced, never run directly.
# Each helper prints one progress line, does its work only when needed, and stops the script on failure.

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"

# The project's .env, when present: its variables for everything the script runs, the environment winning.
load_dotenv() {
  [ -f "$root/.env" ] || return 0
  local exports
  exports="$(node "$root/scripts/dotenv-exports.mjs" "$root/.env")" || fail "could not read .env"
  eval "$exports"
}

step() { printf '\n\033[1m==> %s\033[0m\n' "$*"; }
info() { printf '    %s\n' "$*"; }
fail() { printf '\n\033[31mcagewright: %s\033[0m\n' "$*" >&2; exit 1; }

# Node.js itself is the one thing the machine must bring; say so plainly rather than fail later.
require_node() {
  command -v node >/dev/null || fail "Node.js is required (20.19 or newer) and was not found."
  local major
  major="$(node -p 'process.versions.node.split(".")[0]')"
  [ "$major" -ge 20 ] || fail "Node.js 20.19 or newer is required; found $(node --version)."
}

# npm ci when node_modules is missing or older than the lock file (npm writes
# node_modules/.package-lock.json on every install, so its age is the install's age).
ensure_node_modules() {
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    step "Installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
  else
    info "npm packages are up to date"
  fi
}

# The durable dev database: DATABASE_URL set by the caller means a database of their own, and then no
# private cluster is started; otherwise the private cluster is started (idempotent) and named.
use_dev_database() {
  if [ -n "${DATABASE_URL:-}" ]; then
    info "using the database in DATABASE_URL"
    return 0
  fi
  scripts/pg.sh start
  DATABASE_URL="$(scripts/pg.sh url)"
  export DATABASE_URL
}

# Debian packages by name, installed only when their command is missing. apt-get update runs at most
# once per script run. Usage: ensure_debian_package COMMAND PACKAGE
apt_updated=""
ensure_debian_package() {
  local cmd="$1" pkg="$2"
  command -v "$cmd" >/dev/null && return 0
  [ "$(id -u)" = 0 ] || fail "'$cmd' is missing; install the Debian package '$pkg' (as root: apt-get install $pkg)."
  step "Installing $pkg from Debian's packages"
  if [ -z "$apt_updated" ]; then
    DEBIAN_FRONTEND=noninteractive apt-get update -qq
    apt_updated=1
  fi
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "$pkg" >/dev/null
}

# The newest file the front-end build depends on is newer than the build: rebuild. The front end also
# imports the server's pure domain and wire contracts, so those count as its sources.
frontend_is_stale() {
  [ -f frontend/dist/index.html ] || return 0
  local newer
  newer="$(find frontend/src frontend/index.html frontend/vite.config.ts frontend/tsconfig.json \
    backend/src/domain backend/src/contracts package-lock.json \
    -newer frontend/dist/index.html -type f -print -quit 2>/dev/null)"
  [ -n "$newer" ]
}

build_frontend() {
  npx vite build --config frontend/vite.config.ts --logLevel warn
}

ensure_frontend_built() {
  if frontend_is_stale; then
    step "Building the front end (frontend/dist)"
    build_frontend
  else
    info "front end build is up to date"
  fi
}
