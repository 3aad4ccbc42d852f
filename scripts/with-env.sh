#!/usr/bin/env bash
# Runs a command with the demo database settings from .env.local (as scripts/up.sh sets them).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
load_env_file .env.local
export DATABASE_URL="${DATABASE_URL:-mysql://${DB_USER:-seedplot}:${DB_PASSWORD:-seedplot_dev_pw}@127.0.0.1:${DB_PORT:-33306}/${DB_NAME:-seedplot}}"
exec "$@"
