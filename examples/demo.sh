#!/bin/sh
# The demo: an invented scenario run on the shipped crystal database.
#
# The (invented) Larchmont Street photonics group wants a 3.4 um idler
# from a 1064 nm pumped MgO:PPLN parametric stage and must choose data,
# grating and oven. Each step is one deltak command.
DK=${1:-build/deltak}
set -e
step() { printf '\n== %s\n$ deltak %s\n' "$1" "$2"; shift 2; "$DK" "$@"; }

step "The crystal database" "crystals" crystals
step "One crystal, with every data set and source" "crystals MgO:LN" crystals MgO:LN
step "Indices of MgO:LN at the pump, 40 C" \
     "index --crystal MgO:LN --wavelength 1064nm --temp 40" \
     index --crystal MgO:LN --wavelength 1064nm --temp 40
step "How far do the published data sets disagree at the idler?" \
     "index --crystal MgO:LN --wavelength 3.4um --all-sets" \
     index --crystal MgO:LN --wavelength 3.4um --all-sets
step "The same as JSON, for scripts" \
     "index --crystal MgO:LN --wavelength 1064nm --temp 40 --json" \
     index --crystal MgO:LN --wavelength 1064nm --temp 40 --json
step "Which poling period gives a 3.4 um idler at 40 C?" \
     "period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --all-sets" \
     period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --all-sets
step "The chip arrived with a 30.5 um grating: at what oven temperature?" \
     "period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um" \
     period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um
step "How far may the oven drift, and how wide is the band? (20 mm chip)" \
     "tolerance --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --length 20mm" \
     tolerance --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --length 20mm
step "A five-grating chip covering 2.8-4.2 um with a 30-200 C oven" \
     "chip --crystal MgO:LN --pump 1064nm --idler-range 2.8um:4.2um --oven 30:200" \
     chip --crystal MgO:LN --pump 1064nm --idler-range 2.8um:4.2um --oven 30:200
step "Do 100 fs pump and signal pulses stay together over 1 mm?" \
     "pulse --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 51 --duration 100fs --length 1mm" \
     pulse --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 51 --duration 100fs --length 1mm
step "A second stage doubles the 1030 nm seed laser in BBO: which cut?" \
     "angle --crystal BBO --fundamental 1030nm --type I" \
     angle --crystal BBO --fundamental 1030nm --type I
step "Its alignment tolerance in a 2 mm crystal" \
     "tolerance --crystal BBO --fundamental 1030nm --type I --length 2mm" \
     tolerance --crystal BBO --fundamental 1030nm --type I --length 2mm
step "The whole design as one reproducible file, with a report" \
     "run examples/larchmont-3um-source.dk" \
     run examples/larchmont-3um-source.dk
printf '\nLaser safety: Class 3B/4 beams, invisible in the mid-infrared. Wear eye\nprotection rated for every wavelength present; local rules and your laser\nsafety officer take precedence.\n'
