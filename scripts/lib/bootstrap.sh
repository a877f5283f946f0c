# Sourced by scripts/start.sh, scripts/test.sh and scripts/bench.sh.
#
#   source "$(dirname "${BASH_SOURCE[0]}")/lib/bootstrap.sh"
#   dialsheet_bootstrap [--with-chromium]
#
# Makes sure the machine has what Dialsheet needs (Node.js, PostgreSQL server binaries, ffmpeg,
# a font for rendered text, and Chromium for browser tests), installs the npm dependencies when
# they are missing or older than package-lock.json, and leaves the shell in the repository root.
# Silent when everything is already there, so the everyday `npm start` prints only the app.

dialsheet_bootstrap() {
  local with_chromium=0
  local arg
  for arg in "$@"; do
    case "$arg" in
      --with-chromium) with_chromium=1 ;;
      *) echo "bootstrap: unknown option $arg" >&2; return 2 ;;
    esac
  done

  # This file lives in scripts/lib/, two levels below the repository root.
  local root
  root="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
  cd "$root" || return 1

  _dialsheet_check_node || exit 1

  local missing=()
  if ! _dialsheet_find_pg_bin >/dev/null; then missing+=(postgresql); fi
  if ! command -v ffmpeg >/dev/null 2>&1 || ! command -v ffprobe >/dev/null 2>&1; then
    missing+=(ffmpeg)
  fi
  if [ ! -f /usr/share/fonts/truetype/dejavu/DejaVuSans.ttf ]; then missing+=(fonts-dejavu-core); fi
  if [ "$with_chromium" = 1 ] && [ ! -x /usr/bin/chromium ]; then missing+=(chromium); fi

  if [ "${#missing[@]}" -gt 0 ]; then
    _dialsheet_install_packages "${missing[@]}" || exit 1
  fi

  PG_BIN_DIR="$(_dialsheet_find_pg_bin)" || {
    echo "PostgreSQL server binaries are still missing (expected /usr/lib/postgresql/<version>/bin/initdb)." >&2
    exit 1
  }
  export PG_BIN_DIR
  FFMPEG_PATH="$(command -v ffmpeg)"
  FFPROBE_PATH="$(command -v ffprobe)"
  export FFMPEG_PATH FFPROBE_PATH
  if [ "$with_chromium" = 1 ]; then
    export CHROMIUM_PATH=/usr/bin/chromium
  fi

  _dialsheet_npm_install || exit 1
}

_dialsheet_check_node() {
  if ! command -v node >/dev/null 2>&1 || ! command -v npm >/dev/null 2>&1; then
    echo "Node.js 20.19 or newer (with npm) is required and was not found on PATH." >&2
    echo "Install Node.js 20 LTS (https://nodejs.org/en/download) and run this again." >&2
    return 1
  fi
  # engines in package.json: >=20.19
  if ! node -e 'const [a,b]=process.versions.node.split(".").map(Number);process.exit(a>20||(a===20&&b>=19)?0:1)'; then
    echo "Node.js 20.19 or newer is required; this machine has $(node -v)." >&2
    return 1
  fi
}

# Prints the bin directory of the newest installed PostgreSQL server (Debian layout).
_dialsheet_find_pg_bin() {
  local best="" best_major=-1 dir major
  for dir in /usr/lib/postgresql/*/bin; do
    [ -x "$dir/initdb" ] && [ -x "$dir/pg_ctl" ] && [ -x "$dir/psql" ] || continue
    major="$(basename "$(dirname "$dir")")"
    major="${major%%.*}"
    case "$major" in ''|*[!0-9]*) continue ;; esac
    if [ "$major" -gt "$best_major" ]; then best_major="$major"; best="$dir"; fi
  done
  [ -n "$best" ] || return 1
  printf '%s\n' "$best"
}

_dialsheet_install_packages() {
  if [ "$(id -u)" != 0 ]; then
    echo "Dialsheet needs these system packages, which are not installed: $*" >&2
    echo "Install them with:" >&2
    echo "" >&2
    echo "  sudo apt-get update && sudo apt-get install -y $*" >&2
    echo "" >&2
    echo "then run this command again." >&2
    return 1
  fi
  if ! command -v apt-get >/dev/null 2>&1; then
    echo "Dialsheet needs these packages, which are not installed: $*" >&2
    echo "This script installs them only on Debian or Ubuntu (apt-get); install the equivalents and run it again." >&2
    return 1
  fi
  local log
  log="$(mktemp -t dialsheet-apt.XXXXXX)" || return 1
  echo "Installing system packages: $* (log: $log) ..."
  if ! apt-get update >"$log" 2>&1 </dev/null; then
    echo "apt-get update failed; the last lines of $log:" >&2
    tail -n 20 "$log" >&2
    return 1
  fi
  if ! DEBIAN_FRONTEND=noninteractive apt-get install -y --no-install-recommends "$@" >>"$log" 2>&1 </dev/null; then
    echo "apt-get install failed; the last lines of $log:" >&2
    tail -n 20 "$log" >&2
    return 1
  fi
  echo "Installed: $*"
}

_dialsheet_npm_install() {
  if [ -d node_modules ] && ! [ package-lock.json -nt node_modules/.package-lock.json ]; then
    return 0
  fi
  local log
  log="$(mktemp -t dialsheet-npm.XXXXXX)" || return 1
  echo "Installing npm dependencies (npm ci, log: $log) ..."
  if ! npm ci --no-audit --no-fund >"$log" 2>&1 </dev/null; then
    echo "npm ci failed; the last lines of $log:" >&2
    tail -n 30 "$log" >&2
    return 1
  fi
  echo "npm dependencies installed."
}
