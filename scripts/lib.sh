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

# Starts the local SMTP sink (scripts/smtp-sink.ts, smtp-server on 127.0.0.1) on port $1,
# storing messages in folder $2; sets SMTP_SINK_PID. Waits until the port answers.
start_smtp_sink() {
  local port="$1" dir="$2"
  mkdir -p "$dir"
  (cd "$ROOT" && SIDEREA_SMTP_PORT="$port" SIDEREA_MAIL_SINK_DIR="$dir" exec node --import tsx scripts/smtp-sink.ts) &
  SMTP_SINK_PID=$!
  for _ in $(seq 1 40); do
    if (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; then return 0; fi
    kill -0 "$SMTP_SINK_PID" 2>/dev/null || die "the SMTP sink could not start on 127.0.0.1:$port (is the port taken? set SIDEREA_SMTP_PORT)"
    sleep 0.25
  done
  die "the SMTP sink did not answer on 127.0.0.1:$port"
}
