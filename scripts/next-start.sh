#!/usr/bin/env bash
# Serves the build (`next start "$@"`) with the server's V8 settings. Every script that serves the build comes
# through here (up.sh, test.sh, the benchmarks, the browser tests' servers), so they all measure the same server.
#
# --max-semi-space-size=64 (MiB; Node 20's default is 16): each young-generation collection copies every object
# still alive, and with fifty saves in flight that is all of their requests. A young generation four times as
# large is collected a quarter as often for about the same copying each time: the server spends ~0.6 ms less CPU
# per save and the saves' p95 falls by a quarter (npm run bench:load), for about 100 MB more resident memory.
set -euo pipefail
cd "$(dirname "$0")/.."
export NODE_OPTIONS="${NODE_OPTIONS:+$NODE_OPTIONS }--max-semi-space-size=64"
exec node_modules/.bin/next start "$@"
