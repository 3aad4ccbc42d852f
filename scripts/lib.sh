#!/usr/bin/env bash
# Shared helpers for Seedplot's shell scripts. Sourced, not run.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export NEXT_TELEMETRY_DISABLED=1

log() { printf '\033[1;32m[seedplot]\033[0m %s\n' "$*"; }
die() { printf '\033[1;31m[seedplot] %s\033[0m\n' "$*" >&2; exit 1; }

# Runs a command as root: directly when we are root, through sudo when it exists, otherwise stops
# with the list of Debian packages the user must install themselves.
as_root() {
  if [ "$(id -u)" = 0 ]; then "$@"
  elif command -v sudo >/dev/null 2>&1; then sudo "$@"
  else return 127
  fi
}

# Installs Debian packages that provide the given commands, only when a command is missing.
# Usage: ensure_debian_packages "mariadbd:mariadb-server" "chromium:chromium"
ensure_debian_packages() {
  local missing=() pair cmd pkg
  for pair in "$@"; do
    cmd="${pair%%:*}"; pkg="${pair#*:}"
    command -v "$cmd" >/dev/null 2>&1 || [ -x "/usr/sbin/$cmd" ] || missing+=("$pkg")
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  log "Installing Debian packages: ${missing[*]}"
  if ! as_root env DEBIAN_FRONTEND=noninteractive apt-get update -qq \
     || ! as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null; then
    die "Could not install ${missing[*]}. Please install them yourself (as root: apt-get install -y ${missing[*]}) and run this command again."
  fi
}

# Installs node_modules when they are missing or older than the lockfile.
ensure_node_modules() {
  cd "$ROOT"
  command -v node >/dev/null 2>&1 || die "Node.js 20.9 or newer is needed; install it first."
  node -e 'const [a,b]=process.versions.node.split(".").map(Number); process.exit(a>20||(a===20&&b>=9)?0:1)' \
    || die "Node.js 20.9 or newer is needed; this is $(node --version)."
  if [ ! -d node_modules ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    log "Installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

# Loads KEY=VALUE lines from a file into the environment without overriding what is already set.
load_env_file() {
  local file="$1" line key
  [ -f "$file" ] || return 0
  while IFS= read -r line || [ -n "$line" ]; do
    case "$line" in ''|\#*) continue ;; esac
    key="${line%%=*}"
    if [ -z "${!key:-}" ]; then export "$line"; fi
  done < "$file"
}

# Waits until an HTTP URL answers (any status), up to $2 seconds.
wait_for_http() {
  local url="$1" limit="${2:-60}" i=0
  until node -e "fetch(process.argv[1]).then(()=>process.exit(0),()=>process.exit(1))" "$url" 2>/dev/null; do
    i=$((i + 1)); [ "$i" -gt $((limit * 4)) ] && return 1; sleep 0.25
  done
}

# Starts a command in the background in its own process group (so that stopping it also stops the
# children that npx, tsx and next spawn), logging to $2 and recording the group id in $1.
start_background() {
  local pidfile="$1" logfile="$2"; shift 2
  setsid "$@" > "$logfile" 2>&1 < /dev/null &
  echo $! > "$pidfile"
}

# Stops a background process group recorded in a pid file, if it is still running.
stop_pidfile() {
  local pidfile="$1" pid
  [ -f "$pidfile" ] || return 0
  pid="$(cat "$pidfile")"
  if [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null; then
    kill -TERM -- "-$pid" 2>/dev/null || kill -TERM "$pid" 2>/dev/null || true
    for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.2; done
    kill -KILL -- "-$pid" 2>/dev/null || true
  fi
  rm -f "$pidfile"
}

# Fails with a clear message when a TCP port on 127.0.0.1 is already taken.
require_free_port() {
  if node -e "const s=require('net').connect(+process.argv[1],'127.0.0.1');s.on('connect',()=>process.exit(0));s.on('error',()=>process.exit(1))" "$1"; then
    die "Port $1 on 127.0.0.1 is already in use (by an earlier run?). Stop that program or choose another port with $2."
  fi
}
