#!/bin/sh
# make plots: regenerate the figures in plots/ from the demo scenarios
# (an invented lab's 3.4 um parametric source and its BBO doubler).
# Each figure is written as PDF (for documents) and PNG (for a quick look).
DK=${1:-build/deltak}
OUT=${2:-plots}
set -e
mkdir -p "$OUT"
fig() { # name, then the deltak arguments without --plot
    name=$1; shift
    for ext in pdf png; do
        "$DK" "$@" --plot "$OUT/$name.$ext" >/dev/null
    done
    echo "  $OUT/$name.{pdf,png}"
}
fig mgoln-idler-vs-period sweep --crystal MgO:LN --pump 1064nm \
    --vary period=28um:32um --solve idler --family temp=30,100,170
fig mgoln-wavelengths-vs-temperature sweep --crystal MgO:LN --pump 1064nm \
    --vary temp=20:200:181 --solve wavelengths --family period=31.8um,32.0um,32.2um
fig mgoln-pump-temperature-map sweep --crystal MgO:LN --signal 1550nm \
    --period 30.5um --vary pump=1.05um:1.08um:151 --map temp=20:200:121 --length 20mm
fig mgoln-temperature-acceptance tolerance --crystal MgO:LN --pump 1064nm \
    --idler 3.4um --period 30.5um --length 20mm --curve temperature
fig bbo-opa-gain-spectrum gain --crystal BBO --pump 800nm --signal 1300nm \
    --type I --length 3mm --intensity 50GW/cm2
fig bbo-shg-angle-vs-wavelength sweep --crystal BBO --fundamental 1030nm \
    --type I --vary fundamental=0.6um:2.0um --solve theta
fig bbo-opa-gvm sweep --crystal BBO --pump 800nm --signal 1300nm --type I \
    --vary signal=1.1um:1.55um --solve gvm
# Few-cycle design (examples/harrowgate-midir-dfg.dk, examples/kestrel-bbo-opa.dk)
fig lgs-dfg-low-conversion-spectrum simulate --crystal LGS --pump 1.65um \
    --signal 2.74um --type I --length 2mm --pump-in energy=10uJ,fwhm=65fs \
    --signal-in energy=6uJ,fwhm=70fs --beam-radius 2mm --model low-conversion
fig lgs-dfg-simulated-pulses simulate --crystal LGS --pump 1.65um \
    --signal 2.74um --type I --length 2mm --pump-in energy=10uJ,fwhm=65fs \
    --signal-in energy=6uJ,fwhm=70fs --beam-radius 2mm --figure pulses
fig bbo-opa-simulated-spectra simulate --crystal BBO --pump 800nm \
    --signal 1300nm --type I --length 2mm --pump-in energy=200uJ,fwhm=120fs \
    --signal-in energy=5nJ,width=40nm --beam-radius 1.5mm
fig bbo-opa-simulated-energy simulate --crystal BBO --pump 800nm \
    --signal 1300nm --type I --length 2mm --pump-in energy=200uJ,fwhm=120fs \
    --signal-in energy=5nJ,width=40nm --beam-radius 1.5mm --figure energy --log y
# A noncollinear BBO amplifier pumped at 400 nm: signal against the pump's
# angle for three internal angles; at 3.8 deg the curve stands vertical
# (the broadband, group-velocity-matched geometry).
fig bbo-nopa-signal-vs-angle sweep --crystal BBO --pump 400nm --pol ooe \
    --vary theta=29:34:401 --solve signal --family alpha=0,2,3.8 --yrange 0.45:1.0
