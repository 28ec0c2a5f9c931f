#!/bin/sh
# load.sh DELTAK [SECONDS] [CONNECTIONS] - a load test of `deltak explore`
# on loopback with wrk (Debian: apt-get install wrk): a period query
# (JSON) and a tuning-curve figure (SVG), each for SECONDS (default 10,
# at most 60) over CONNECTIONS keep-alive connections (default 4, at
# most 16). Prints requests per second and latency percentiles, and
# fails if any request failed (socket error or an answer other than
# 200). This measures; `make check` never runs it.
DK=${1:-build/deltak}
SECS=${2:-10}; CONN=${3:-4}
[ "$SECS" -gt 60 ] && SECS=60
[ "$CONN" -gt 16 ] && CONN=16
if ! command -v wrk >/dev/null 2>&1; then
    echo "load: needs wrk (apt-get install wrk)"; exit 1
fi
log=$(mktemp); out=$(mktemp)
trap 'rm -f "$log" "$out"' EXIT
"$DK" explore --port 0 --workers 2 >"$log" 2>&1 &
pid=$!
port=""
for i in 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16 17 18 19 20; do
    port=$(sed -n 's/.*127\.0\.0\.1:\([0-9]*\)\/.*/\1/p' "$log" | head -1)
    [ -n "$port" ] && break
    sleep 0.25
done
[ -n "$port" ] || { kill "$pid"; echo "load: the server did not start"; exit 1; }
base="http://127.0.0.1:$port"
status=0
run() {
    name=$1; url=$2
    # The answer must be right before it is counted.
    code=$(curl -s -o /dev/null -w '%{http_code}' "$url" 2>/dev/null || echo 000)
    timeout $((SECS + 30)) wrk -t 2 -c "$CONN" -d "${SECS}s" --timeout 30s \
        --latency "$url" >"$out" 2>&1
    rps=$(sed -n 's/^Requests\/sec: *\([0-9.]*\).*/\1/p' "$out")
    n=$(sed -n 's/^ *\([0-9]*\) requests in.*/\1/p' "$out")
    p50=$(awk '$1=="50%"{print $2}' "$out"); p90=$(awk '$1=="90%"{print $2}' "$out")
    p99=$(awk '$1=="99%"{print $2}' "$out")
    bad=$(sed -n 's/^ *Non-2xx or 3xx responses: *\([0-9]*\).*/\1/p' "$out")
    sock=$(grep -c '^ *Socket errors' "$out")
    printf '%-22s %6s requests  %8s req/s  latency p50 %s  p90 %s  p99 %s  non-200: %s  socket errors: %s  (first answer HTTP %s)\n' \
        "$name" "$n" "$rps" "$p50" "$p90" "$p99" "${bad:-0}" "$sock" "$code"
    if [ "$code" != 200 ] || [ -n "$bad" ] || [ "$sock" != 0 ] || [ -z "$n" ]; then
        status=1; sed 's/^/    /' "$out"
    fi
}
echo "load: $SECS s each, $CONN connections, 2 workers, $(nproc) cores"
run "period (JSON)" "$base/api/period?crystal=MgO:LN&pump=1064nm&idler=3.4um&temp=40"
run "tuning curve (SVG)" "$base/figure/sweep.svg?crystal=MgO:LN&pump=1064nm&period=30.5um&vary=temp=20:200:91&solve=wavelengths"
run "page (HTML)" "$base/"
kill -INT "$pid"; wait "$pid"
[ $status = 0 ] && echo "load: no failed request" || echo "load: FAILED requests"
exit $status
