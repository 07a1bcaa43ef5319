#!/usr/bin/env bash
# Builds the Fivefold web app into web/dist and serves it on this machine only.
#   PORT=9000 web/tools/serve.sh      (default port 8765)
set -euo pipefail
# shellcheck source=common.sh
source "$(dirname "${BASH_SOURCE[0]}")/common.sh"

PORT="${PORT:-8765}"
case "$PORT" in
    '' | *[!0-9]*) die "PORT must be a number, not '$PORT'" ;;
esac

command -v python3 >/dev/null || die "python3 is needed to serve the page"
build_app

step "Serving $DIST"
echo "    Open http://127.0.0.1:$PORT/ in a browser (Ctrl-C stops the server)."
cd "$DIST"
exec python3 -m http.server "$PORT" --bind 127.0.0.1
