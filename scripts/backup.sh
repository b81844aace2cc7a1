#!/usr/bin/env bash
# Backup and restore of everything a club would miss: the database and the uploaded photos.
#
#   scripts/backup.sh backup [FILE]          writes FILE (a pg_dump custom-format archive, default
#                                            backups/cagewright-<UTC stamp>.dump) and FILE's uploads
#                                            beside it as <FILE without .dump>.uploads.tar.gz
#   scripts/backup.sh restore FILE [--yes]   replaces the database and the uploads folder with the
#                                            backup's; asks first unless --yes is given
#
# The database is DATABASE_URL when set, else the private dev cluster (started when needed); the
# uploads folder is UPLOAD_DIR (default .data/uploads), as the server reads them.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_dotenv

mode="${1:-}"; shift || true

pg_tool() {
  local d
  for d in /usr/lib/postgresql/*/bin; do
    [ -x "$d/$1" ] && { echo "$d/$1"; return 0; }
  done
  command -v "$1" || fail "$1 was not found; npm start installs PostgreSQL from Debian's packages."
}

upload_dir() {
  local dir="${UPLOAD_DIR:-.data/uploads}"
  case "$dir" in /*) echo "$dir" ;; *) echo "$root/$dir" ;; esac
}

uploads_archive_for() { echo "${1%.dump}.uploads.tar.gz"; }

# Never print the password inside DATABASE_URL.
safe_url() { sed -E 's#//([^:/@]+):[^@]*@#//\1:***@#' <<<"$1"; }

do_backup() {
  local file="${1:-backups/cagewright-$(date -u +%Y%m%d-%H%M%S).dump}"
  case "$file" in *.dump) ;; *) fail "the backup file must end in .dump (got $file)";; esac
  [ -e "$file" ] && fail "$file exists already; choose another name (a backup never overwrites one)."
  use_dev_database
  mkdir -p "$(dirname "$file")"
  local uploads archive
  uploads="$(upload_dir)"
  archive="$(uploads_archive_for "$file")"
  step "Backing up $(safe_url "$DATABASE_URL") to $file"
  # Written under a temporary name first so that a failed dump never leaves a file that looks whole.
  "$(pg_tool pg_dump)" --format=custom --no-owner --no-privileges --file="$file.partial" "$DATABASE_URL"
  mv "$file.partial" "$file"
  step "Backing up the uploads in $uploads to $archive"
  if [ -d "$uploads" ]; then
    tar -czf "$archive.partial" -C "$uploads" .
  else
    # No uploads yet: an empty archive, so a restore still knows there were none.
    tar -czf "$archive.partial" -T /dev/null
  fi
  mv "$archive.partial" "$archive"
  info "done: $file and $archive"
}

do_restore() {
  local file="" yes=""
  for arg in "$@"; do
    case "$arg" in --yes) yes=1 ;; *) file="$arg" ;; esac
  done
  [ -n "$file" ] || fail "usage: npm run db:restore -- FILE.dump [--yes]"
  [ -f "$file" ] || fail "no backup at $file"
  local archive uploads
  archive="$(uploads_archive_for "$file")"
  [ -f "$archive" ] || fail "the uploads archive $archive that belongs beside $file is missing"
  # Check both archives before anything is touched, so a bad file loses nothing.
  "$(pg_tool pg_restore)" --list "$file" >/dev/null || fail "$file is not a database backup that pg_restore can read"
  tar -tzf "$archive" >/dev/null || fail "$archive is not a readable uploads archive"
  use_dev_database
  uploads="$(upload_dir)"
  if [ -z "$yes" ]; then
    [ -t 0 ] || fail "restore replaces the database and the uploads; run it again with --yes to confirm"
    printf 'This replaces every row in %s and every file in %s with the backup %s.\n' "$(safe_url "$DATABASE_URL")" "$uploads" "$file"
    read -r -p "Type 'restore' to go on: " answer
    [ "$answer" = restore ] || fail "nothing was changed"
  fi
  step "Restoring the database from $file"
  # One transaction: a failure part-way leaves the database as it was.
  "$(pg_tool pg_restore)" --clean --if-exists --no-owner --no-privileges --single-transaction \
    --exit-on-error --dbname="$DATABASE_URL" "$file"
  step "Restoring the uploads into $uploads"
  local staging="$uploads.restoring"
  rm -rf "$staging"
  mkdir -p "$staging"
  tar -xzf "$archive" -C "$staging"
  rm -rf "$uploads.previous"
  [ -d "$uploads" ] && mv "$uploads" "$uploads.previous"
  mv "$staging" "$uploads"
  rm -rf "$uploads.previous"
  info "done: restart the server if it is running"
}

case "$mode" in
  backup) do_backup "$@" ;;
  restore) do_restore "$@" ;;
  *) fail "usage: scripts/backup.sh backup [FILE.dump] | restore FILE.dump [--yes]" ;;
esac
