#!/bin/sh
# browser.sh DELTAK OUTDIR - the page in headless Chromium (browser.mjs),
# against a server started here on a free loopback port. Needs Debian's
# chromium and Node.js; playwright-core (the driver only, no browser of
# its own) is installed from npm into OUTDIR/node_modules on first use.
# Without chromium or node it says so and counts nothing.
DK=$1; OUT=$2
mkdir -p "$OUT"
CHROMIUM=${CHROMIUM:-/usr/bin/chromium}
if [ ! -x "$CHROMIUM" ] || ! command -v node >/dev/null 2>&1; then
    echo "browser: skipped: needs chromium and node (apt-get install chromium nodejs; CI installs them)"
    exit 0
fi
if [ ! -d "$OUT/node_modules/playwright-core" ]; then
    if ! command -v npm >/dev/null 2>&1 ||
       ! (cd "$OUT" && npm install --no-save --no-package-lock --no-audit \
              --no-fund --loglevel=error playwright-core@1 >npm.log 2>&1); then
        echo "browser: skipped: could not install playwright-core with npm (see $OUT/npm.log)"
        exit 0
    fi
fi
log=$OUT/server.log
rm -f "$log"   # never read the port of an earlier run
"$DK" explore --port 0 >"$log" 2>&1 &
pid=$!
port=""
for i in 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16 17 18 19 20; do
    port=$(sed -n 's/.*127\.0\.0\.1:\([0-9]*\)\/.*/\1/p' "$log" 2>/dev/null | head -1)
    [ -n "$port" ] && break
    sleep 0.25
done
if [ -z "$port" ]; then
    kill "$pid" 2>/dev/null
    echo "browser: 0 passed, 1 failed (the server did not start: $(cat "$log"))"
    exit 1
fi
NODE_MODULES_DIR="$OUT/node_modules" CHROMIUM="$CHROMIUM" \
    timeout 600 node "$(dirname "$0")/browser.mjs" "$(realpath "$DK")" \
    "http://127.0.0.1:$port/" "$OUT"
rc=$?
kill -INT "$pid" 2>/dev/null
wait "$pid"
exit $rc
