#!/bin/sh
# make bench: speed of the engine, measured, never asserted.
# Counts instructions with callgrind when valgrind is present (repeatable
# whatever else the machine does), and wall time of repeated runs.
DK=${1:-build/deltak}
BIN=$(dirname "$DK")/bench_index
make -s "$BIN" >/dev/null 2>&1 || { echo "error: cannot build $BIN"; exit 1; }
"$BIN"
SIM=$(dirname "$DK")/bench_simulate
make -s "$SIM" >/dev/null 2>&1 || { echo "error: cannot build $SIM"; exit 1; }
"$SIM"
if command -v valgrind >/dev/null 2>&1; then
    out=$(valgrind --tool=callgrind --callgrind-out-file=/dev/null "$DK" index \
          --crystal MgO:LN --wavelength 1064nm --temp 40 --json 2>&1 >/dev/null |
          sed -n 's/.*Collected : //p')
    echo "deltak index (whole program, load database + evaluate): $out instructions"
fi
# Whole commands, timed over repeated runs (hyperfine when installed).
run() {
    if command -v hyperfine >/dev/null 2>&1; then
        hyperfine -N --warmup 1 --runs 5 "$DK $*" 2>/dev/null | sed -n '1,2p'
    else
        t0=$(date +%s.%N); "$DK" "$@" >/dev/null 2>&1; t1=$(date +%s.%N)
        printf '%-70s %8.3f s\n' "deltak $*" "$(echo "$t1 - $t0" | bc)"
    fi
}
run period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um
run chip --crystal MgO:LN --pump 1064nm --idler-range 2.8um:4.2um --oven 30:200
run angle --crystal KTP --fundamental 1064nm
run sweep --crystal MgO:LN --pump 1064nm --vary temp=20:200:121 --solve wavelengths --family period=31.8um,32.0um,32.2um --csv
run sweep --crystal MgO:LN --signal 1550nm --period 30.5um --vary pump=1.05um:1.08um:151 --map temp=20:200:121 --length 20mm --csv
run gain --crystal BBO --fundamental 1064nm --type I --length 10mm --power 1W
# Bandwidth as time, broadband spectra and the pulse simulator through the
# command line (the engine alone: bench_simulate above).
run pulse --crystal GaSe --candidates AgGaS2,LGS,LiIO3,BGS --pump 1.65um --signal 2.74um --type I --duration 65fs
run tolerance --crystal LiIO3 --pump 1030nm --signal 1.6um --type I --length 1mm
run simulate --crystal GaSe --pump 1.65um --signal 2.74um --type I --length 0.5mm --pump-in fluence=0.3mJ/cm2,fwhm=60fs --signal-in fluence=0.1mJ/cm2,fwhm=70fs --model low-conversion
run simulate --crystal GaSe --pump 1.65um --signal 2.74um --type I --length 0.5mm --pump-in fluence=0.3mJ/cm2,fwhm=60fs --signal-in fluence=0.1mJ/cm2,fwhm=70fs
run simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in peak=60GW/cm2,fwhm=100fs --signal-in peak=0.01GW/cm2,fwhm=40fs
