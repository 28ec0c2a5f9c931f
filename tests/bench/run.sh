#!/bin/sh
# make bench: the speed of deltak on this machine, measured, never asserted.
#
#   engine      bench_speed: the 1000 x 1000 map (one thread, all threads,
#               the bare Sellmeier floor it contains), the 10^4-point
#               tuning curve, designs resolved in-process
#   reference   tests/bench/reference.py: the same two jobs with NumPy and
#               SciPy (/usr/bin/python3), and the ratios
#   commands    whole commands, start-up and database included (bench_run:
#               fork/exec, best and median of repeated runs), and a
#               three-curve tuning figure rendered to PDF
#   index       bench_index: database load and n(λ, T) with derivatives
#   simulate    bench_simulate: the pulsed three-wave mixing solver
#   instructions  callgrind's count for one whole command, when valgrind
#               is installed (repeatable whatever else the machine does)
#
# The machine may be shared: figures are the best of several runs.
DK=${1:-build/deltak}
DIR=$(dirname "$DK")
HERE=$(dirname "$0")
for b in bench_speed bench_run bench_index bench_simulate; do
    make -s "$DIR/$b" >/dev/null 2>&1 || { echo "error: cannot build $DIR/$b"; exit 1; }
done
get() { sed -n "s/^$1 //p" "$DIR/bench.out"; }
ratio() { awk -v a="$1" -v b="$2" 'BEGIN { if (b > 0) printf "%.1f", a / b; else printf "n/a" }'; }

echo "machine: $(nproc) cores, $(sed -n 's/^model name[^:]*: //p' /proc/cpuinfo | head -1); load $(cut -d' ' -f1-3 /proc/loadavg)"
"$DIR/bench_speed" > "$DIR/bench.out" || { echo "error: bench_speed failed"; exit 1; }

echo
echo "== engine (in-process)"
printf 'map 1000x1000 sinc2, 1 thread     %10.3g Δk evaluations/s  (%.2f ms)\n' \
    "$(get map_evals_per_s_1)" "$(awk "BEGIN{print $(get map_seconds_1)*1e3}")"
printf 'map 1000x1000 sinc2, %s threads    %10.3g Δk evaluations/s  (%.2f ms)\n' \
    "$(get map_threads)" "$(get map_evals_per_s_all)" "$(awk "BEGIN{print $(get map_seconds_all)*1e3}")"
printf 'bare Sellmeier floor of that map   %10.3g cells/s          (%.2f ms, 1 thread)\n' \
    "$(get floor_cells_per_s)" "$(awk "BEGIN{print $(get floor_seconds)*1e3}")"
printf 'of which the cells alone            %10.2f ms (no Δk = 0 line, arrays allocated once)\n' \
    "$(awk "BEGIN{print $(get map_cells_seconds_1)*1e3}")"
echo "map / floor (1 thread)             $(ratio "$(get map_seconds_1)" "$(get floor_seconds)") x   (cells alone: $(ratio "$(get map_cells_seconds_1)" "$(get floor_seconds)") x)"
printf 'same map cell by cell (old path)   %10.3g Δk evaluations/s\n' "$(get map_cell_by_cell_evals_per_s)"
printf 'tuning curve, 10^4 points          %10.3g points/s         (%.2f ms, %s evaluations a point)\n' \
    "$(get curve_points_per_s)" "$(awk "BEGIN{print $(get curve_seconds)*1e3}")" "$(get curve_evals_per_point)"
printf 'same via dk_sweep_curves()         %10.2f ms (series, flags, turning points)\n' \
    "$(awk "BEGIN{print $(get curve_api_seconds)*1e3}")"
printf 'full scan per point (old way)      %10.3g points/s\n' "$(get curve_scan_points_per_s)"
printf 'database: all %s files %.2f ms; one crystal by name %.2f ms\n' \
    "$(ls "$HERE/../../crystals"/*.yaml 2>/dev/null | wc -l)" "$(get db_full_load_ms)" "$(get db_one_crystal_ms)"
for k in period_MgO:LN angle_BBO angle_KTP_II angle_LBO angle_BIBO; do
    printf 'design resolved in-process %-15s %8.3f ms\n' "$k" "$(get "${k}_ms")"
done

echo
echo "== NumPy/SciPy reference (tests/bench/reference.py, same jobs)"
if [ -x /usr/bin/python3 ] && /usr/bin/python3 -c 'import numpy, scipy' 2>/dev/null; then
    /usr/bin/python3 "$HERE/reference.py" > "$DIR/bench.py.out"
    np_map=$(sed -n 's/^map \([^ ]*\) .*/\1/p' "$DIR/bench.py.out")
    np_curve=$(sed -n 's/^curve \([^ ]*\) .*/\1/p' "$DIR/bench.py.out")
    printf 'NumPy map 1000x1000                %10.3g cells/s          (%.2f ms)\n' \
        "$(awk "BEGIN{print 1e6/$np_map}")" "$(awk "BEGIN{print $np_map*1e3}")"
    printf 'SciPy brentq loop, 10^4 points     %10.3g points/s         (%.2f ms)\n' \
        "$(awk "BEGIN{print 1e4/$np_curve}")" "$(awk "BEGIN{print $np_curve*1e3}")"
    echo "checksums: NumPy map $(sed -n 's/^map [^ ]* //p' "$DIR/bench.py.out"), deltak map $(get map_checksum); SciPy idlers $(sed -n 's/^curve [^ ]* //p' "$DIR/bench.py.out"), deltak $(get curve_checksum)"
    echo "ratio map, all threads / NumPy     $(ratio "$np_map" "$(get map_seconds_all)") x   (1 thread: $(ratio "$np_map" "$(get map_seconds_1)") x)"
    echo "ratio curve / SciPy                $(ratio "$np_curve" "$(get curve_seconds)") x"
else
    echo "NumPy/SciPy not found: install python3-numpy and python3-scipy (apt-get) to compare"
fi

echo
echo "== whole commands (start-up, database and output included; best / median of 10)"
cmd() {
    label=$1; shift
    set -- $("$DIR/bench_run" 10 "$DK" "$@")
    printf '%-46s %8s ms %8s ms  (exit %s)\n' "$label" "$1" "$2" "$3"
}
cmd "deltak --version (start-up alone)" --version
cmd "period MgO:LN 1064 nm -> 3.4 um at 100 C" period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 100
cmd "period MgO:LN, temperature of a grating" period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um
cmd "angle BBO SHG of 1064 nm" angle --crystal BBO --fundamental 1064nm
cmd "angle KTP type II SHG of 1064 nm" angle --crystal KTP --fundamental 1064nm --type II
cmd "angle LBO SHG of 1064 nm" angle --crystal LBO --fundamental 1064nm
cmd "index MgO:LN" index --crystal MgO:LN --wavelength 1064nm --temp 40
cmd "tolerance BBO 2 mm" tolerance --crystal BBO --fundamental 1064nm --length 2mm
cmd "chip MgO:LN 2.8-4.2 um" chip --crystal MgO:LN --pump 1064nm --idler-range 2.8um:4.2um --oven 30:200
cmd "crystals (whole database)" crystals
cmd "sweep: three-curve tuning figure, PDF" sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um --solve idler --family temp=30,100,170 --plot "$DIR/bench-tuning.pdf"
cmd "sweep: 10^4-point tuning curve, CSV" sweep --crystal MgO:LN --pump 1064nm --temp 100 --vary period=28um:32um:10000 --solve idler --csv
cmd "sweep: 1000x1000 map, PNG" sweep --crystal MgO:LN --signal 1550nm --period 30.5um --vary pump=1.05um:1.08um:1000 --map temp=20:200:1000 --length 20mm --plot "$DIR/bench-map.png"
rm -f "$DIR/bench-tuning.pdf" "$DIR/bench-map.png"
# Bandwidth as time, broadband spectra and the pulse simulator through the
# command line (the engine alone: bench_simulate below).
cmd "pulse: crystals ranked for a 65 fs pulse" pulse --crystal GaSe --candidates AgGaS2,LGS,LiIO3,BGS --pump 1.65um --signal 2.74um --type I --duration 65fs
cmd "tolerance LiIO3, broad turning acceptance" tolerance --crystal LiIO3 --pump 1030nm --signal 1.6um --type I --length 1mm
cmd "simulate GaSe DFG, low-conversion model" simulate --crystal GaSe --pump 1.65um --signal 2.74um --type I --length 0.5mm --pump-in fluence=0.3mJ/cm2,fwhm=60fs --signal-in fluence=0.1mJ/cm2,fwhm=70fs --model low-conversion
cmd "simulate GaSe DFG, full" simulate --crystal GaSe --pump 1.65um --signal 2.74um --type I --length 0.5mm --pump-in fluence=0.3mJ/cm2,fwhm=60fs --signal-in fluence=0.1mJ/cm2,fwhm=70fs
cmd "simulate BBO OPA, full" simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in peak=60GW/cm2,fwhm=100fs --signal-in peak=0.01GW/cm2,fwhm=40fs

echo
echo "== index evaluation"
"$DIR/bench_index"

echo
echo "== pulsed three-wave mixing"
"$DIR/bench_simulate"

if command -v valgrind >/dev/null 2>&1; then
    echo
    echo "== instructions per whole command (callgrind; independent of the machine's load)"
    count() {
        label=$1; shift
        n=$(valgrind --tool=callgrind --callgrind-out-file=/dev/null "$DK" "$@" \
            2>&1 >/dev/null | sed -n 's/.*Collected : //p')
        printf '%-46s %12s instructions\n' "$label" "$n"
    }
    count "deltak --version (start-up alone)" --version
    count "index MgO:LN (load + evaluate)" index --crystal MgO:LN --wavelength 1064nm --temp 40 --json
    count "period MgO:LN 1064 nm -> 3.4 um at 100 C" period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 100
    count "angle BBO SHG of 1064 nm" angle --crystal BBO --fundamental 1064nm
    count "angle KTP type II SHG of 1064 nm" angle --crystal KTP --fundamental 1064nm --type II
    count "sweep: three-curve tuning figure, PDF" sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um --solve idler --family temp=30,100,170 --plot "$DIR/bench-tuning.pdf"
    rm -f "$DIR/bench-tuning.pdf"
fi
