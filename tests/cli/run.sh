#!/bin/sh
# Command-line tests: run build/deltak as a user would and check exit
# codes, output and error messages. Prints "cli: N passed, M failed".
DK=${1:-build/deltak}
pass=0; fail=0
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT

# expect NAME EXIT-CODE PATTERN -- ARGS...: run, check the code and that
# stdout+stderr match the (grep -E) pattern.
expect() {
    name=$1; code=$2; pat=$3; shift 4
    "$DK" "$@" >"$tmp/out" 2>"$tmp/err"; rc=$?
    if [ "$rc" -eq "$code" ] && cat "$tmp/out" "$tmp/err" | grep -Eq -- "$pat"; then
        pass=$((pass + 1))
    else
        fail=$((fail + 1))
        echo "not ok: $name (exit $rc, wanted $code; pattern '$pat')"
        sed 's/^/    /' "$tmp/out" "$tmp/err" | head -20
    fi
}

# no_stdout NAME ARGS...: a failing command writes nothing on stdout.
no_stdout() {
    name=$1; shift
    "$DK" "$@" >"$tmp/out" 2>/dev/null
    if [ ! -s "$tmp/out" ]; then pass=$((pass + 1)); else
        fail=$((fail + 1)); echo "not ok: $name wrote to stdout on failure"; fi
}

# lacks NAME PATTERN -- ARGS...: the command succeeds and neither stdout
# nor stderr matches the pattern.
lacks() {
    name=$1; pat=$2; shift 3
    "$DK" "$@" >"$tmp/out" 2>"$tmp/err"; rc=$?
    if [ "$rc" -eq 0 ] && ! cat "$tmp/out" "$tmp/err" | grep -Eq -- "$pat"; then
        pass=$((pass + 1))
    else
        fail=$((fail + 1))
        echo "not ok: $name (exit $rc; pattern '$pat' should not appear)"
        sed 's/^/    /' "$tmp/out" "$tmp/err" | head -20
    fi
}

# json_has NAME KEYS -- ARGS...: stdout parses as JSON and has the keys.
json_has() {
    name=$1; keys=$2; shift 3
    "$DK" "$@" >"$tmp/out" 2>/dev/null
    if python3 -c "
import json,sys
d=json.load(open('$tmp/out'))
for k in '$keys'.split():
    cur=d
    for part in k.split('.'):
        cur=cur[int(part)] if isinstance(cur,list) else cur[part]
" 2>"$tmp/err"; then pass=$((pass + 1)); else
        fail=$((fail + 1)); echo "not ok: $name"; sed 's/^/    /' "$tmp/err" | tail -3; fi
}

expect version 0 '^deltak [0-9]+\.[0-9]+\.[0-9]+$' -- --version
expect help 0 'commands:' -- --help
expect unknown-command 2 "unknown command 'frobnicate'" -- frobnicate
expect no-command 2 'usage: deltak' --
expect crystals-list 0 'MgO:LiNbO3' -- crystals
expect crystals-one 0 'Gayer2008' -- crystals mgo:ln
expect crystals-alias-ci 0 'KTiOPO4' -- crystals ppktp
expect crystals-qpm-default 0 'QPM default  Fradkin1999: fitted to poled' -- crystals KTP
expect crystals-qpm-default-why 0 'type-II 775 -> 1550 nm gives 46\.22 um' -- crystals KTP
expect crystals-unknown 1 "unknown crystal 'unobtainium'" -- crystals unobtainium
expect index-table 0 'group index' -- index --crystal MgO:LN --wavelength 1064nm --temp 40
expect index-bare-number 2 'has no unit.*1064nm' -- index --crystal MgO:LN --wavelength 1064
expect index-bad-unit 2 "unknown wavelength unit 'parsec'" -- index --crystal MgO:LN --wavelength 3parsec
expect index-opaque 1 'outside the transparency range' -- index --crystal MgO:LN --wavelength 8um
expect index-fit-range 0 'outside the fitted range' -- index --crystal MgO:LN --wavelength 4.5um
expect index-bad-set 1 "no data set 'nobody1999'" -- index --crystal MgO:LN --wavelength 1um --dispersion nobody1999
expect index-no-crystal 2 '--crystal is required' -- index --wavelength 1um
expect index-bad-temp 2 "cannot read temperature" -- index --crystal MgO:LN --wavelength 1um --temp hot
expect index-kelvin 0 '40 C' -- index --crystal MgO:LN --wavelength 1um --temp 313.15K
expect index-bad-option 2 'unknown option' -- index --crystal MgO:LN --wavelength 1um --frobnicate
expect index-csv 0 '^crystal,dispersion,axis,wavelength_um' -- index --crystal MgO:LN --wavelength 1064nm --csv
expect index-all-sets 0 'spread between data sets' -- index --crystal MgO:LN --wavelength 1064nm --all-sets
expect index-wavenumber 0 '9398.50 cm-1' -- index --crystal MgO:LN --wavelength 9398.496cm-1
no_stdout index-fail-quiet index --crystal MgO:LN --wavelength 8um --json
json_has index-json "crystal dispersion wavelength_um temperature_C axes.0.axis axes.0.n axes.0.group_index axes.0.gvd_fs2_per_mm axes.0.tod_fs3_per_mm" -- index --crystal MgO:LN --wavelength 1064nm --temp 40 --json
json_has index-json-all "sets.1.axes.0.n spread.0.n_spread" -- index --crystal MgO:LN --wavelength 1064nm --all-sets --json
json_has index-json-warnings "warnings.0" -- index --crystal MgO:LN --wavelength 4.5um --json
json_has crystals-json "crystals.0.crystal crystals.0.sets" -- crystals --json

expect period-opo 0 'period 30\.5[0-9]* um as written' -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40
expect period-shg 0 'period 6\.97' -- period --crystal MgO:LN --fundamental 1064nm
expect period-temp 0 'phase-matches at [0-9.]+ C' -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um
expect period-waves 0 'idler 3\.4[0-9]* um' -- period --crystal MgO:LN --pump 1064nm --period 30.5um --temp 40
expect period-all-sets 0 'spread over 2 data sets' -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --all-sets
expect period-ktp-type2 0 'period 46\.' -- period --crystal PPKTP --pump 775nm --signal 1550nm --pol yzy --dispersion Fradkin1999
expect period-unpoled 2 'cannot be periodically poled' -- period --crystal BBO --fundamental 1064nm
expect period-one-wave 2 'exactly two of pump, signal and idler' -- period --crystal MgO:LN --pump 1064nm
expect period-impossible 2 'must be longer than the pump' -- period --crystal MgO:LN --pump 1064nm --signal 800nm
expect period-bad-pol 2 'must have three letters' -- period --crystal MgO:LN --fundamental 1064nm --pol zz
expect period-overdetermined 2 'drop --temp' -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --temp 40
expect period-no-root 1 'no phase-matching temperature' -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 20um
expect period-caution 0 'photorefractive' -- period --crystal LN --fundamental 1064nm --temp 40
expect period-no-tdep 2 'no temperature dependence' -- period --crystal MgO:LN --dispersion Zelmon1997 --fundamental 1064nm --period 7um
json_has period-json "crystal dispersion temperature_C wavelengths_um.pump wavelengths_um.signal wavelengths_um.idler period_um order deff_pm_per_V" -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --json
json_has period-json-sets "sets.0.dispersion sets.0.period_um sets.1.period_um" -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --json --all-sets
json_has period-json-temp "temperature_C solutions.0.temperature_C" -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --json
json_has period-json-waves "wavelengths_um.idler solutions.0.wavelengths_um.signal" -- period --crystal MgO:LN --pump 1064nm --period 30.5um --temp 40 --json

expect chip-layout 0 'gratings cover the idler from 2.8 to 4.2' -- chip --crystal MgO:LN --pump 1064nm --idler-range 2.8um:4.2um --oven 30:200
expect chip-fanout 0 'fan-out, 10 mm wide' -- chip --crystal MgO:LN --pump 1064nm --idler-range 2.8um:4.2um --fanout-width 10mm
expect chip-caution 0 'photorefractive' -- chip --crystal LN --pump 1064nm --idler-range 3um:3.5um --oven 30:200
expect chip-no-range 2 'one of --idler-range and --signal-range' -- chip --crystal MgO:LN --pump 1064nm
expect chip-bad-range 2 'low < high' -- chip --crystal MgO:LN --pump 1064nm --idler-range 4um:3um
expect chip-unpoled 2 'cannot be periodically poled' -- chip --crystal BBO --pump 1064nm --idler-range 3um:4um
json_has chip-json "gratings.0.period_um gratings.0.lo_um gratings.0.hi_um fanout.positions.0.period_um" -- chip --crystal MgO:LN --pump 1064nm --idler-range 2.8um:4.2um --fanout-width 10mm --json

expect angle-bbo 0 'I +oo -> e +- +23\.[34]' -- angle --crystal BBO --fundamental 1030nm --type I
expect angle-bbo-deff 0 'd_eff' -- angle --crystal BBO --fundamental 1064nm
expect angle-ktp-xy 0 'XY' -- angle --crystal KTP --fundamental 1064nm --type II
expect angle-magic 0 'o o e +- +31\.5[0-9]* +90\.000 +\+3\.8' -- angle --crystal BBO --pump 400nm --signal 600nm --magic
expect angle-ncpm 0 'X +1[0-9][0-9]\.' -- angle --crystal LBO --fundamental 1064nm --ncpm --dispersion Kato1994
# Uniaxial NCPM: X and Y alike, one "XY" entry at the phi of the largest
# |d_eff|: point group -42m, type I ooe at theta 90: d_eff = d36 sin 2phi
# (Dmitriev et al., Handbook (1999), class -42m), so phi 45 and d_eff = d36
# (84.5 pm/V in crystals/cdsip2.yaml).
expect angle-ncpm-uniaxial 0 'ooe +XY +[0-9.]+ +84\.500 +45\.00' -- angle --crystal CdSiP2 --pump 1064nm --signal 1.28um --ncpm
lacks angle-ncpm-temp-solved 'default-temperature|temperature 25 C' -- angle --crystal LBO --fundamental 1064nm --ncpm --dispersion Kato1994
expect angle-cut 0 'ext deg' -- angle --crystal BBO --fundamental 1064nm --type I --cut 23
expect angle-isotropic 2 'isotropic' -- angle --crystal GaAs --fundamental 4um
expect angle-bad-type 2 "must be 0, I or II" -- angle --crystal BBO --fundamental 1064nm --type III
json_has angle-json "crystal dispersion wavelengths_um.pump solutions.0.type solutions.0.pol solutions.0.theta_deg solutions.0.phi_deg solutions.0.deff_pm_per_V solutions.0.walkoff_mrad.signal solutions.0.walkoff_mrad.idler solutions.0.walkoff_mrad.pump" -- angle --crystal BBO --fundamental 1030nm --type I --json
json_has angle-json-sets "sets.2.solutions.0.theta_deg" -- angle --crystal BBO --fundamental 1030nm --type I --json --all-sets

expect tol-qpm 0 'temperature +10\.[0-9]+ C' -- tolerance --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --length 20mm
expect tol-bbo 0 'angle theta' -- tolerance --crystal BBO --fundamental 1064nm --type I --length 10mm
expect tol-ncpm 0 'noncritical' -- tolerance --crystal LBO --fundamental 1064nm --dispersion Kato1994 --type I --theta 90 --temp 149.15 --length 10mm
# At the broadband noncollinear angle dk has no slope in the signal: the
# first-order width (once printed as 1.2e8 nm) is no answer.
expect tol-flat-first-order 0 'signal, pump fixed +[0-9.]+ nm +\(noncritical\)' -- tolerance --crystal BBO --pump 400nm --signal 600nm --broadband --length 2mm
expect tol-curve 0 '^temperature_C,sinc2' -- tolerance --crystal MgO:LN --fundamental 1064nm --length 10mm --curve temperature
expect tol-no-length 2 '--length is required' -- tolerance --crystal MgO:LN --fundamental 1064nm
expect tol-bad-curve 2 "must be one of" -- tolerance --crystal MgO:LN --fundamental 1064nm --length 1cm --curve colour
json_has tol-json "length_mm temperature_fwhm_C spectral_fwhm_nm.signal spectral_fwhm_nm.idler spectral_fwhm_nm.pump" -- tolerance --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --length 20mm --json
json_has tol-json-angle "length_mm temperature_fwhm_C angular_fwhm_mrad.theta angular_fwhm_mrad.phi" -- tolerance --crystal KTP --fundamental 1064nm --type II --length 10mm --json

expect pulse-bbo 0 'fund.-harmonic +-19[0-9]\.' -- pulse --crystal BBO --fundamental 800nm --type I --duration 30fs
expect pulse-qpm 0 'QPM design' -- pulse --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --waist 50um
expect pulse-bad-duration 2 'duration' -- pulse --crystal BBO --fundamental 800nm --type I --duration 30
json_has pulse-json "group_index.signal group_index.idler group_index.pump gvm_fs_per_mm.signal_pump gvm_fs_per_mm.idler_pump gvm_fs_per_mm.signal_idler gvd_fs2_per_mm.pump splitting_length_mm.signal_pump" -- pulse --crystal BBO --pump 800nm --signal 1300nm --type I --duration 30fs --json

expect gain-opa 0 'small-signal gain at phase matching' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm --intensity 50GW/cm2
expect gain-shg-focus 0 'Boyd-Kleinman' -- gain --crystal BBO --fundamental 1064nm --type I --length 10mm --power 1W
expect gain-depletion 0 'with pump depletion' -- gain --crystal MgO:LN --fundamental 1064nm --length 20mm --intensity 0.01GW/cm2 --depletion
expect gain-spectrum 0 '^signal_um,idler_um,gain' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm --intensity 50GW/cm2 --spectrum
expect gain-no-intensity 2 'intensity' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm
expect gain-bad-intensity 2 'intensity' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm --intensity 5
expect gain-damage 0 'damage threshold' -- gain --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --length 10mm --intensity 2GW/cm2
json_has gain-json "deff_pm_per_V gamma_per_mm gain gain_fwhm.signal_nm" -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm --intensity 50GW/cm2 --json

# Bandwidth as time (issue 15): broad acceptances get a width, THz and
# transform limits beside nm; the gain estimate of the regime, labelled.
expect tol-liio3-broad 0 'signal, pump fixed +[0-9.]+ nm' -- tolerance --crystal LiIO3 --pump 1030nm --signal 1.6um --type I --length 1mm
"$DK" tolerance --crystal LiIO3 --pump 1030nm --signal 1.6um --type I --length 1mm >"$tmp/out" 2>&1
if ! grep -q 'beyond search' "$tmp/out"; then pass=$((pass + 1)); else
    fail=$((fail + 1)); echo "not ok: tol-never-beyond-search"; fi
expect tol-thz 0 'transform limit: Gaussian, sech2' -- tolerance --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm
expect tol-other-lobe 0 'phase-matched again' -- tolerance --crystal LiIO3 --pump 800nm --signal 1300nm --type I --length 1mm
json_has tol-json-thz "spectral_fwhm_THz.signal transform_limit_fs.gaussian.signal transform_limit_fs.sech2.pump outer_fwhm.signal" -- tolerance --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --json
expect tol-csv-thz 0 '^parameter,unit,fwhm,first_order_fwhm,per_length,per_length_unit,fwhm_THz' -- tolerance --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --csv
expect gain-low-regime 0 'low-gain estimate \(Gamma L <= 2.794\)' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 1mm --intensity 1GW/cm2
expect gain-high-regime 0 'high-gain estimate \(Gamma L > 2.794\)' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm --intensity 50GW/cm2
json_has gain-json-regime "gain_fwhm.regime gain_fwhm.estimate_THz gain_fwhm.low_gain_estimate_THz gain_fwhm.transform_limit_gaussian_fs" -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 1mm --intensity 1GW/cm2 --json
expect pulse-longest 0 'signal-idler \(pump\) +[0-9.]+ +[0-9.]+ +[0-9.]+' -- pulse --crystal BBO --pump 800nm --signal 1300nm --type I --duration 30fs --length 2mm
expect pulse-after 0 'Gaussian pulse after 2 mm' -- pulse --crystal BBO --pump 800nm --signal 1300nm --type I --duration 30fs --length 2mm
expect pulse-bad-shape 2 "--shape 'square' must be gaussian or sech2" -- pulse --crystal BBO --pump 800nm --signal 1300nm --type I --duration 30fs --shape square
expect pulse-rank 0 '^  1 +LiGaS2' -- pulse --crystal GaSe --candidates AgGaS2,LGS --pump 1.65um --signal 2.74um --type I --duration 65fs
expect pulse-rank-needs-duration 2 '--candidates ranks crystals for a pulse' -- pulse --crystal GaSe --candidates AgGaS2 --pump 1.65um --signal 2.74um --type I
expect pulse-rank-unknown 2 "unknown crystal 'unobtainium'" -- pulse --crystal GaSe --candidates unobtainium --pump 1.65um --signal 2.74um --type I --duration 65fs
json_has pulse-rank-json "ranking.0.crystal ranking.0.longest_crystal_mm ranking.0.merit_relative" -- pulse --crystal GaSe --candidates AgGaS2 --pump 1.65um --signal 2.74um --type I --duration 65fs --json
json_has pulse-json-pairs "pairs.0.longest_crystal_mm pairs.0.acceptance_THz after_crystal.pump.fwhm_fs" -- pulse --crystal BBO --pump 800nm --signal 1300nm --type I --duration 30fs --length 2mm --json

# deltak simulate: the pulse simulator over a design.
SIMOPA="--crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in energy=40uJ,fwhm=100fs --signal-in energy=20nJ,fwhm=60fs --beam-radius 1.5mm"
expect sim-opa 0 'convergence: converged \(halving the step changed the output' -- simulate $SIMOPA
expect sim-manley-rowe 0 'Manley-Rowe: photon-number invariants kept to' -- simulate $SIMOPA
expect sim-safety 0 'laser safety officer' -- simulate $SIMOPA
expect gain-safety 0 'caution: laser safety.*laser safety officer' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm --intensity 50GW/cm2
expect sim-walkoff 0 'spatial walk-off .* is not simulated' -- simulate $SIMOPA
json_has sim-json "waves.0.energy_out_J waves.2.fwhm_out_fs waves.1.transform_limit_out_fs convergence.change manley_rowe_defect along_z.z_mm grid.samples" -- simulate $SIMOPA --json
expect sim-csv-energy 0 '^z_mm,signal_fluence_J_per_cm2,signal_energy_J' -- simulate $SIMOPA --csv
expect sim-csv-spectra 0 '^signal_frequency_THz,signal_wavelength_um' -- simulate $SIMOPA --csv --table spectra
expect sim-csv-pulses 0 '^time_fs,signal_in_GW_per_cm2' -- simulate $SIMOPA --csv --table pulses
expect sim-qpm-shg 0 'bulk d of the domains' -- simulate --crystal MgO:LN --fundamental 1064nm --length 1mm --fundamental-in peak=1GW/cm2,fwhm=200fs
expect sim-no-input 2 'give the input pulses' -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm
expect sim-no-beam 2 'give the --beam-radius too' -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in energy=1uJ,fwhm=50fs
expect sim-bad-key 2 "unknown key 'colour'" -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in peak=1GW/cm2,fwhm=50fs,colour=red
expect sim-two-amounts 2 'exactly one of energy=, fluence= or peak=' -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in peak=1GW/cm2,fluence=1mJ/cm2,fwhm=50fs
expect sim-no-duration 2 'give the duration fwhm=' -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in peak=1GW/cm2
expect sim-bare-energy 2 'not a energy with a unit|is not an energy' -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in energy=5,fwhm=50fs --beam-radius 1mm
expect sim-shg-wrong-input 2 'takes --fundamental-in' -- simulate --crystal BBO --fundamental 1030nm --type I --length 1mm --pump-in peak=1GW/cm2,fwhm=50fs
expect sim-bad-table 2 "--table 'z' must be" -- simulate $SIMOPA --csv --table z
expect sim-no-length 2 '--length is required' -- simulate --crystal BBO --fundamental 1030nm --type I --fundamental-in peak=1GW/cm2,fwhm=50fs
mkdir -p "$tmp/sim"
python3 -c "
import math
print('# a smooth seed spectrum, 60 nm wide')
print('wavelength_nm,intensity')
for k in range(121):
    x = 1180 + 2 * k
    print('%g,%.6g' % (x, math.exp(-4 * math.log(2) * ((x - 1300) / 60) ** 2)))
" > "$tmp/sim/seed.csv"
expect sim-spectrum-file 0 'converged' -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 1mm --pump-in peak=20GW/cm2,fwhm=100fs --signal-in peak=0.01GW/cm2,spectrum=$tmp/sim/seed.csv
printf 'wavelength_nm,intensity\n1250,0.1\n1300,x\n' > "$tmp/sim/bad.csv"
expect sim-spectrum-bad 1 "bad.csv' line 3" -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 1mm --pump-in peak=20GW/cm2,fwhm=100fs --signal-in peak=0.01GW/cm2,spectrum=$tmp/sim/bad.csv
if "$DK" simulate $SIMOPA --plot "$tmp/sim/sim.svg" --figure pulses >/dev/null 2>&1 &&
   python3 -c "import xml.dom.minidom; xml.dom.minidom.parse('$tmp/sim/sim.svg')" 2>/dev/null; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: sim-svg-valid"; fi
MIX="--crystal GaSe --pump 1.65um --signal 2.74um --type I --length 0.5mm --pump-in fluence=0.01mJ/cm2,fwhm=60fs --signal-in fluence=0.01mJ/cm2,fwhm=70fs"
expect sim-low-conversion 0 'low-conversion model: difference-frequency of the inputs into the idler' -- simulate $MIX --model low-conversion
expect sim-low-conversion-csv 0 '^frequency_THz,wavelength_um,spectrum_J_per_cm2_THz,phase_rad,pm_modulus,pm_phase_rad' -- simulate $MIX --model low-conversion --csv --table spectra
json_has sim-low-conversion-json "generated spectral_fwhm_THz transform_limit_fs photon_fraction fluence_J_per_cm2" -- simulate $MIX --model low-conversion --json
expect sim-opa-gain 0 'largest gain over the seed' -- simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in peak=20GW/cm2,shape=cw --signal-in peak=1e-6GW/cm2,fwhm=100fs --model opa-gain
expect sim-bad-model 2 "--model 'fast' must be" -- simulate $MIX --model fast
expect sim-model-inputs 1 'takes the pump' -- simulate --crystal GaSe --pump 1.65um --signal 2.74um --type I --length 0.5mm --pump-in fluence=0.01mJ/cm2,fwhm=60fs --model low-conversion
no_stdout sim-fail-quiet simulate --crystal BBO --pump 800nm --signal 1300nm --type I --length 2mm --pump-in energy=1uJ,fwhm=50fs
expect sweep-csv 0 '^period_um,idler_um' -- sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --csv
expect sweep-family 0 '^period_um,temp_C,idler_um' -- sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --family temp=30,100 --csv
expect sweep-map 0 '^pump_um,temp_C,sinc2' -- sweep --crystal MgO:LN --signal 1550nm --period 30.5um --vary pump=1.05um:1.08um:5 --map temp=20:200:5 --length 20mm --csv
# A sweep that sets the temperature itself makes no temperature choice.
expect sweep-temp-default 0 'default-temperature' -- sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --csv
lacks sweep-temp-family 'default-temperature|temperature 25 C' -- sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --family temp=30,100 --csv
lacks sweep-temp-map 'default-temperature|temperature 25 C' -- sweep --crystal MgO:LN --signal 1550nm --period 30.5um --vary pump=1.05um:1.08um:5 --map temp=20:200:5 --length 20mm --csv
lacks sweep-temp-solved 'default-temperature|temperature 25 C' -- sweep --crystal MgO:LN --pump 1064nm --idler 3.4um --vary period=28um:32um:5 --solve temp --csv
expect sweep-theta 0 '^fundamental_um,theta_deg' -- sweep --crystal BBO --fundamental 1064nm --type I --vary fundamental=0.8um:1.2um:5 --solve theta --csv
# Figures on standard output (--plot -.svg), as `deltak explore` uses them.
expect plot-stdout-svg 0 '^<\?xml' -- sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot -.svg
no_stdout plot-stdout-not-with-csv sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot -.svg --csv
expect plot-stdout-not-with-csv 2 'drop --csv and --json' -- sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot -.svg --csv
expect plot-stdout-tolerance 0 '^%PDF-' -- tolerance --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --length 20mm --curve temperature --plot -.pdf
expect plot-stdout-not-gain 2 'give gain a file name' -- gain --crystal BBO --pump 800nm --signal 1300nm --type I --length 3mm --intensity 1GW/cm2 --plot -.svg
"$DK" sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot -.png >"$tmp/fig.png" 2>"$tmp/err"
"$DK" sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot "$tmp/file.png" >/dev/null 2>&1
if cmp -s "$tmp/fig.png" "$tmp/file.png" && ! grep -q assumed "$tmp/fig.png" && grep -q '^note: ' "$tmp/err"; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: plot-stdout-same-bytes-as-file"; fi
rm -f "$tmp/fig.png" "$tmp/file.png"
expect explore-help 0 'deltak explore \[--port' -- explore --help
expect explore-bad-port 2 '--port' -- explore --port 70000
expect explore-bad-deadline 2 '--deadline' -- explore --deadline 0
expect explore-stray-argument 2 "unexpected argument 'now'" -- explore now
expect sweep-deff 0 '^phi_deg,deff_pm_per_V' -- sweep --crystal BBO --fundamental 1064nm --type I --vary phi=0:180:7 --solve deff --csv
expect sweep-gvm 0 'gvm_signal_idler' -- sweep --crystal BBO --pump 800nm --signal 1300nm --type I --vary signal=1.1um:1.6um:6 --solve gvm --csv
expect sweep-bad-var 2 "unknown variable 'colour'" -- sweep --crystal MgO:LN --pump 1064nm --vary colour=1:2 --solve idler
expect sweep-bad-ext 1 'unknown figure format' -- sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot /tmp/x.bmp
expect angle-curve 0 '^pol,phi_deg,theta_deg' -- angle --crystal KTP --fundamental 1064nm --curve --pol sff
expect angle-spread 0 'spread over 3 data sets' -- angle --crystal BBO --fundamental 1064nm --type I --all-sets

# Numbers and options under careless and hostile input (issue 13).
expect order-wrap 2 'from 1 to 99' -- period --crystal MgO:LN --fundamental 1064nm --order 4294967297
expect length-overflow 2 'length' -- tolerance --crystal MgO:LN --fundamental 1064nm --length 1e308m
expect phi-empty 2 "phi '' must be" -- angle --crystal BBO --fundamental 1064nm --phi ''
expect alpha-nan 2 'noncollinear' -- angle --crystal BBO --pump 400nm --signal 600nm --noncollinear nan
expect hex-wavelength 2 'wavelength' -- index --crystal BBO --wavelength 0x1p0um
expect repeated-option 2 'given twice' -- period --crystal MgO:LN --fundamental 1064nm --temp 20 --temp 30
expect isotropic-pol 2 'polarisation letters do not apply' -- period --crystal GaAs --fundamental 4um --pol zzz
expect unphysical-index 1 'which no transparent crystal has' -- index --crystal MgO:LN --wavelength 1064nm --temp 100000
expect hot-design 2 'above 1000 C' -- period --crystal MgO:LN --fundamental 1064nm --temp 100000
expect huge-temp-range 2 'temperature range' -- period --crystal MgO:LN --pump 1064nm --idler 3.4um --period 30.5um --temp-range -200:1e6
expect sweep-no-solution 1 'no point of the sweep has a solution' -- sweep --crystal BBO --fundamental 1064nm --type I --vary fundamental=0.36um:0.38um:5 --solve theta
no_stdout sweep-no-solution-quiet sweep --crystal BBO --fundamental 1064nm --type I --vary fundamental=0.36um:0.38um:5 --solve theta
expect sweep-huge-range 2 'outside what a sweep takes' -- sweep --crystal MgO:LN --pump 1064nm --idler 3.4um --vary temp=20:1e308:5 --solve period
expect broadband-degenerate 0 'o o e +- +29\.2[0-9]* +90\.000 +1\.9' -- angle --crystal BBO --pump 400nm --signal 800nm --broadband
expect exact-bound 1 '0\.3499999 um is outside the transparency range 0\.35-5 um' -- index --crystal MgO:LN --wavelength 0.3499999um
# A design names the wave that is outside (ZGP opens at 0.74 um, crystal file).
expect design-opaque-wave 1 'the pump \(0\.72 um\) is outside the transparency range 0\.74-12 um of ZnGeP2' -- angle --crystal ZGP --pump 720nm --idler 8um
expect no-pm-exit 1 'does not phase-match' -- angle --crystal BBO --fundamental 400nm --type I
"$DK" index --crystal "$(printf 'BB\033[2JO')" --wavelength 1um 2>"$tmp/err" >/dev/null
if grep -q 'BB\\x1b\[2JO' "$tmp/err" && ! grep -q "$(printf '\033')" "$tmp/err"; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: control-chars-escaped"; fi

# The range policy in every command: an answer outside the data set's
# fitted range is flagged naming the wave, in text, JSON and CSV.
# MgO:LN Gayer2008 is fitted over 0.5-4 um, so a 4.5 um idler is outside;
# BIBO Umemura2007 over 0.48-3.1 um, so the 0.4 um harmonic of 800 nm is.
# flagged NAME PATTERN -- ARGS: exit 0 and PATTERN in stdout alone (the
# answer itself carries the flag, not only a warning on stderr).
flagged() {
    name=$1; pat=$2; shift 3
    "$DK" "$@" >"$tmp/out" 2>"$tmp/err"; rc=$?
    if [ "$rc" -eq 0 ] && grep -Eq -- "$pat" "$tmp/out"; then
        pass=$((pass + 1))
    else
        fail=$((fail + 1)); echo "not ok: range-$name (exit $rc; pattern '$pat' not in stdout)"
        sed 's/^/    /' "$tmp/out" "$tmp/err" | head -12
    fi
}
LN="--crystal MgO:LN --dispersion Gayer2008"
for mode in text json csv; do
    case $mode in
    text) o=""; wv='extrapolated.*idler'; wl='extrapolated'; sh='extrapolated: second harmonic'; tp='extrapolated.*temperature' ;;
    json) o="--json"; wv='"range:idler"'; wl='"range:wavelength"'; sh='"range:second-harmonic"'; tp='"range:temperature"' ;;
    csv) o="--csv"; wv='range:idler'; wl='range:wavelength'; sh='range:second-harmonic'; tp='range:temperature' ;;
    esac
    flagged index-$mode "$wl" -- index $LN --wavelength 4.5um $o
    flagged period-$mode "$wv" -- period $LN --pump 1064nm --idler 4.5um --temp 40 $o
    flagged period-temp-$mode "$tp" -- period $LN --fundamental 1064nm --temp 230 $o
    flagged angle-$mode "$sh" -- angle --crystal BIBO --fundamental 800nm --type I $o
    flagged chip-$mode "$wv" -- chip $LN --pump 1064nm --idler-range 3.5um:4.4um --oven 30:200 $o
    [ $mode = csv ] && t2="--csv" || t2="$o"
    flagged tolerance-$mode "$wv" -- tolerance $LN --pump 1064nm --idler 4.5um --temp 40 --length 10mm $t2
    if [ $mode != csv ]; then
        flagged pulse-$mode "$wv" -- pulse $LN --pump 1064nm --idler 4.5um --temp 40 $o
        flagged gain-$mode "$wv" -- gain $LN --pump 1064nm --idler 4.5um --temp 40 --length 10mm --intensity 0.1GW/cm2 $o
    else
        flagged gain-csv "$wv" -- gain $LN --pump 1064nm --idler 4.5um --temp 40 --length 10mm --intensity 0.1GW/cm2 --spectrum
    fi
    if [ $mode != text ]; then
        flagged sweep-$mode "$wv" -- sweep $LN --pump 1064nm --temp 40 --vary period=26um:30um:9 --solve idler $o
    fi
done
flagged sweep-map-csv 'range:' -- sweep $LN --signal 1550nm --period 30.5um --vary pump=1.05um:1.08um:4 --map temp=20:260:4 --length 20mm --csv

# Figures: valid files, nothing left behind on failure.
if "$DK" sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:21 --solve idler --family temp=30,170 --plot "$tmp/t.svg" >/dev/null 2>&1 &&
   python3 -c "import xml.dom.minidom,sys; xml.dom.minidom.parse('$tmp/t.svg')" 2>/dev/null; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: sweep-svg-valid"; fi
if "$DK" sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:21 --solve idler --temp 40 --plot "$tmp/t.pdf" >/dev/null 2>&1 &&
   head -c 5 "$tmp/t.pdf" | grep -q '%PDF'; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: sweep-pdf-valid"; fi
"$DK" sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:21 --solve idler --temp 40 --plot "$tmp/nodir/t.png" >/dev/null 2>&1
if [ $? -eq 1 ] && [ -z "$(ls "$tmp" | grep -v -e db -e out -e err -e '^t\.' -e '^sim$')" ]; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: plot-unwritable"; ls "$tmp"; fi

# Design files: a report only when every step succeeds; paths are taken
# from the design file's folder and stay inside it.
printf 'title: test design\nreport: r.md\nperiod --crystal MgO:LN --fundamental 1064nm\nangle --crystal BBO --fundamental "1064nm" --type I\n' > "$tmp/ok.dk"
printf 'report: bad.md\nperiod --crystal MgO:LN --fundamental 1064nm\nperiod --crystal unobtainium --fundamental 1064nm\n' > "$tmp/bad.dk"
expect run-ok 0 'ran 2 steps' -- run "$tmp/ok.dk"
if grep -q '^## Laser safety' "$tmp/r.md" && grep -q 'Gayer2008' "$tmp/r.md" &&
   python3 -c "import json; d=json.load(open('$tmp/r.json')); assert d['steps'][0]['result']['period_um'] > 6" 2>/dev/null; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: run-report-content"; fi
expect run-fail 1 'line 3 failed' -- run "$tmp/bad.dk"
if [ ! -e "$tmp/bad.md" ] && ! ls -a "$tmp" | grep -q '\.tmp$'; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: run-fail-no-report"; fi
expect run-missing 1 'cannot read design file' -- run "$tmp/none.dk"
expect run-report-after 0 'ran 2 steps' -- run "$tmp/ok.dk" --report "$tmp/r2.md"
# A design file never runs another, however the line is written.
for form in 'run ok.dk' '  run ok.dk' '"run" ok.dk' "$(printf '\trun ok.dk')" 'deltak run ok.dk' 'deltak  "run" ok.dk'; do
    printf '%s\n' "$form" > "$tmp/self.dk"
    expect "run-self:$form" 1 'not a command a design file may run' -- run "$tmp/self.dk"
done
DELTAK_RUN_DEPTH=1 "$DK" run "$tmp/ok.dk" >/dev/null 2>"$tmp/err"
if [ $? -eq 1 ] && grep -q 'cannot run another design file' "$tmp/err"; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: run-depth"; fi
# Over-long lines, NUL bytes and control characters are refused with the
# line number; nothing of such a line runs.
python3 -c "print('# ' + 'x' * 5000); print('period --crystal MgO:LN --fundamental 1064nm')" > "$tmp/long.dk"
expect run-long-line 1 'line 1 is longer than' -- run "$tmp/long.dk"
printf 'period --crystal MgO:LN --fundamental 1064nm\nperiod --crystal MgO:LN\000 --fundamental 1064nm\n' > "$tmp/nul.dk"
expect run-nul 1 'line 2: a NUL byte' -- run "$tmp/nul.dk"
printf 'title: a\033[2Jb\nperiod --crystal MgO:LN --fundamental 1064nm\n' > "$tmp/ctl.dk"
expect run-control 1 'line 1: a control character' -- run "$tmp/ctl.dk"
# Outputs only inside the design file's folder, never through a link.
printf 'report: ../escape.md\nperiod --crystal MgO:LN --fundamental 1064nm\n' > "$tmp/esc.dk"
expect run-escape 1 'leaves the design file' -- run "$tmp/esc.dk"
printf 'report: /tmp/abs.md\nperiod --crystal MgO:LN --fundamental 1064nm\n' > "$tmp/abs.dk"
expect run-absolute 1 'must be a path inside' -- run "$tmp/abs.dk"
printf 'sweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot ../f.svg\n' > "$tmp/fig.dk"
expect run-figure-escape 1 'leaves the design file' -- run "$tmp/fig.dk"
echo victim > "$tmp/victim.txt"
ln -s "$tmp/victim.txt" "$tmp/link.md"
printf 'report: link.md\nperiod --crystal MgO:LN --fundamental 1064nm\n' > "$tmp/link.dk"
expect run-link 1 'not a regular file' -- run "$tmp/link.dk"
if [ "$(cat "$tmp/victim.txt")" = victim ]; then pass=$((pass + 1)); else
    fail=$((fail + 1)); echo "not ok: run-link-victim-untouched"; fi
# A figure and the report beside it, the figure referenced from the report.
mkdir -p "$tmp/proj"
printf 'report: out/p.md\nsweep --crystal MgO:LN --pump 1064nm --vary period=28um:32um:5 --solve idler --temp 40 --plot out/t.svg\n' > "$tmp/proj/p.dk"
expect run-figure 0 'ran 1 steps' -- run "$tmp/proj/p.dk"
if [ -s "$tmp/proj/out/t.svg" ] && grep -q '(t.svg)' "$tmp/proj/out/p.md"; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: run-figure-beside-report"; fi
printf 'simulate --crystal BBO --fundamental 800nm --type I --length 1mm --fundamental-in energy=1uJ,spectrum=../../etc/passwd\n' > "$tmp/spec.dk"
expect run-spectrum-escape 1 'leaves the design file' -- run "$tmp/spec.dk" --check
# A killed run leaves no step running and no temporary file behind.
mkdir -p "$tmp/slow"
# (twelve family members: seconds of work even for the fast engine)
printf 'sweep --crystal MgO:LN --pump 1064nm --idler 3.4um --vary temp=30:200:100000 --solve accept-temp --length 10mm --family length=5mm,6mm,7mm,8mm,9mm,10mm,11mm,12mm,13mm,14mm,15mm,16mm --plot slow.svg\n' > "$tmp/slow/s.dk"
"$DK" run "$tmp/slow/s.dk" >/dev/null 2>&1 &
runpid=$!
sleep 1
kill -TERM $runpid 2>/dev/null
wait $runpid 2>/dev/null
sleep 0.5
if ! pgrep -f "$tmp/slow/slow.svg" >/dev/null && [ -z "$(ls -A "$tmp/slow" | grep -v '^s.dk$')" ]; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: run-killed-cleanly"; ls -A "$tmp/slow"; pkill -f "$tmp/slow/slow.svg"; fi
expect run-check 0 '2 steps, checked; nothing run' -- run "$tmp/ok.dk" --check

# The few-cycle scenarios of examples/ carried out end to end (a copy, so
# that their out/ folder lands in the temporary folder).
mkdir -p "$tmp/ex"
for ex in harrowgate-midir-dfg kestrel-bbo-opa; do
    cp "examples/$ex.dk" "$tmp/ex/"
    expect "example-$ex" 0 "ran [0-9]+ steps" -- run "$tmp/ex/$ex.dk"
    if grep -q 'converged' "$tmp/ex/out/$ex.md" && grep -q 'longest crystal' "$tmp/ex/out/$ex.md" &&
       grep -q 'Manley-Rowe' "$tmp/ex/out/$ex.md" && [ "$(ls "$tmp/ex/out/" | grep -c '\.svg$')" -ge 3 ]; then
        pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: example-$ex-report"; fi
    rm -rf "$tmp/ex/out"
done
# Write errors on standard output are failures, not silent successes.
if [ -w /dev/full ]; then
    for c in --version --help "run $tmp/ok.dk" "crystals"; do
        "$DK" $c >/dev/full 2>/dev/null
        if [ $? -ne 0 ]; then pass=$((pass + 1)); else
            fail=$((fail + 1)); echo "not ok: full-disk: deltak $c exited 0"; fi
    done
fi

# A broken crystal file is reported with file, line and column and skipped.
mkdir -p "$tmp/db"
cp crystals/mgo-linbo3.yaml "$tmp/db/"
printf 'id: Broken\nname: [unclosed\n' > "$tmp/db/broken.yaml"
DELTAK_CRYSTALS="$tmp/db" "$DK" crystals >"$tmp/out" 2>"$tmp/err"
if [ $? -eq 0 ] && grep -Eq "broken.yaml': line [0-9]*, column" "$tmp/err" && grep -q MgO "$tmp/out"; then
    pass=$((pass + 1)); else fail=$((fail + 1)); echo "not ok: broken-file-skipped"; cat "$tmp/err"; fi

echo "cli: $pass passed, $fail failed"
[ "$fail" -eq 0 ]
