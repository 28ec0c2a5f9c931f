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
printf '\nLaser safety: Class 3B/4 beams, invisible in the mid-infrared. Wear eye\nprotection rated for every wavelength present; local rules and your laser\nsafety officer take precedence.\n'
