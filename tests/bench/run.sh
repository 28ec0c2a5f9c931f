#!/bin/sh
# make bench: speed of the engine, measured, never asserted.
# Counts instructions with callgrind when valgrind is present (repeatable
# whatever else the machine does), and wall time of repeated runs.
DK=${1:-build/deltak}
BIN=$(dirname "$DK")/bench_index
make -s "$BIN" >/dev/null 2>&1 || { echo "error: cannot build $BIN"; exit 1; }
"$BIN"
if command -v valgrind >/dev/null 2>&1; then
    out=$(valgrind --tool=callgrind --callgrind-out-file=/dev/null "$DK" index \
          --crystal MgO:LN --wavelength 1064nm --temp 40 --json 2>&1 >/dev/null |
          sed -n 's/.*Collected : //p')
    echo "deltak index (whole program, load database + evaluate): $out instructions"
fi
