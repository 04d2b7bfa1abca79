# Shared helpers for the project's shell scripts. Source it; do not run it.
# shellcheck shell=bash

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export ROOT

say() { printf '\033[1msiderea:\033[0m %s\n' "$*"; }
die() { printf '\033[1;31msiderea: %s\033[0m\n' "$*" >&2; exit 1; }

# Runs apt-get install for the named Debian packages (root only), waiting for apt's lock.
apt_install() {
  if [ "$(id -u)" != 0 ]; then
    die "the Debian packages '$*' are missing and installing them needs root: run 'sudo apt-get install -y $*' and try again"
  fi
  if [ -z "${SIDEREA_APT_UPDATED:-}" ]; then
    say "updating Debian's package lists"
    apt-get -o DPkg::Lock::Timeout=300 update -qq || die "apt-get update failed; check the network to Debian's mirrors"
    export SIDEREA_APT_UPDATED=1
  fi
  say "installing Debian packages: $*"
  DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=300 install -y -qq "$@" >/dev/null \
    || die "apt-get install $* failed"
}

# Installs npm packages when node_modules is missing or older than the lock file.
ensure_node_modules() {
  local major
  major="$(node -p 'process.versions.node.split(".")[0]' 2>/dev/null)" || die "Node.js is not installed; install Node.js 20 or newer"
  [ "$major" -ge 20 ] || die "Node.js 20 or newer is needed (found $(node -v))"
  if [ ! -f "$ROOT/node_modules/.package-lock.json" ] || [ "$ROOT/package-lock.json" -nt "$ROOT/node_modules/.package-lock.json" ]; then
    say "installing npm packages (npm ci)"
    (cd "$ROOT" && npm ci --no-audit --no-fund --loglevel=error) || die "npm ci failed"
  fi
}

# Creates .env.local with a freshly generated NEXTAUTH_SECRET on first start, then loads it.
ensure_env_file() {
  local file="$ROOT/.env.local"
  if [ ! -f "$file" ]; then
    say "generating local secrets into .env.local (never committed)"
    (
    umask 077
    {
      echo "# Generated on first start by scripts/lib.sh. Local only; git ignores this file."
      echo "NEXTAUTH_SECRET=$(node -e 'console.log(require("crypto").randomBytes(32).toString("base64url"))')"
      echo "SIDEREA_LINK_SECRET=$(node -e 'console.log(require("crypto").randomBytes(32).toString("base64url"))')"
    } > "$file"
    )
  fi
  set -a
  # shellcheck disable=SC1090
  . "$file"
  set +a
}

ensure_chromium() {
  [ -x /usr/bin/chromium ] || apt_install chromium
}
