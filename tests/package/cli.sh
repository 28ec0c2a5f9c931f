#!/bin/sh
# The command line as a user meets it: the crystal list fits 80 columns,
# "did you mean" for crystals and data sets, the crystal search path
# (DELTAK_CRYSTALS adds to the shipped database; --crystal takes a file),
# --names for scripts and completion. Prints "package: N passed, M failed".
#   sh tests/package/cli.sh BUILD/deltak [LABEL]
DK=${1:-build/deltak}
LABEL=${2:-package}
PY=${PYTHON:-/usr/bin/python3}
pass=0; fail=0
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
unset DELTAK_CRYSTALS

ok() { pass=$((pass + 1)); }
no() { fail=$((fail + 1)); echo "not ok: $1"; [ -f "$tmp/err" ] && sed 's/^/    /' "$tmp/out" "$tmp/err" | head -12; }

# expect NAME CODE PATTERN -- ARGS: exit code and a pattern in stdout+stderr.
expect() {
    name=$1; code=$2; pat=$3; shift 4
    "$DK" "$@" >"$tmp/out" 2>"$tmp/err"; rc=$?
    if [ "$rc" -eq "$code" ] && cat "$tmp/out" "$tmp/err" | grep -Eq -- "$pat"; then ok
    else no "$name (exit $rc, wanted $code; pattern '$pat')"; fi
}

# width NAME FILE: no line wider than 80 columns (characters, not bytes).
width() {
    w=$("$PY" -c "import sys; print(max([len(l.rstrip('\n')) for l in open(sys.argv[1], encoding='utf-8')] or [0]))" "$2")
    if [ "$w" -le 80 ]; then ok; else no "$1: $w columns"; fi
}

# The list of crystals fits 80 columns and still names every crystal.
"$DK" crystals >"$tmp/list" 2>"$tmp/err"
width crystals-80-columns "$tmp/list"
n=$("$DK" crystals --json | "$PY" -c "import json,sys; print(len(json.load(sys.stdin)['crystals']))")
ids=$("$DK" crystals --json | "$PY" -c "
import json,sys
for c in json.load(sys.stdin)['crystals']: print(c['crystal'])")
missing=0
for id in $ids; do grep -q "^$id " "$tmp/list" || missing=$((missing + 1)); done
if [ "$missing" -eq 0 ] && grep -q "^$n crystals" "$tmp/list"; then ok; else no "crystals-list-complete ($missing missing)"; fi
grep -q 'β-BBO' "$tmp/list" && ok || no "crystals-list-aliases"

# Names for scripts and completion.
expect names 0 '^MgO:LN$' -- crystals --names
expect names-sets 0 '^Tamosauskas2018$' -- crystals --names BBO
expect names-json 2 'choose one of --json and --names' -- crystals --names --json

# "Did you mean" for crystals (alias shown with its id) and data sets.
expect mean-crystal 1 "unknown crystal 'MgO:LNN'; did you mean 'MgO:LN' \(MgO:LiNbO3\)\?" -- index --crystal MgO:LNN --wavelength 1um
expect mean-crystal-two 1 "did you mean 'BBO' \(beta-BaB2O4\) or 'LBO' \(LiB3O5\)\?" -- index --crystal XBO --wavelength 1um
expect mean-crystal-prefix 1 "did you mean 'MgO:CLT', 'MgO:LiNbO3' or 'MgO:SLT'\?" -- crystals MgO
expect mean-set-index 1 "no data set 'Gayer2009'; did you mean 'Gayer2008'\?" -- index --crystal MgO:LN --dispersion Gayer2009 --wavelength 1um
expect mean-set-design 1 "no data set 'gayer'; did you mean 'Gayer2008'\?" -- period --crystal MgO:LN --dispersion gayer --fundamental 1064nm
expect mean-set-sweep 1 "did you mean 'Tamosauskas2018'\?" -- sweep --crystal BBO --dispersion Tamoskauskas2018 --fundamental 1064nm --type I --vary fundamental=0.8um:1.2um:3 --solve theta
expect far-crystal 1 "known crystals:.*" -- index --crystal unobtainium --wavelength 1um
"$DK" index --crystal unobtainium --wavelength 1um >/dev/null 2>"$tmp/err"
width unknown-crystal-80-columns "$tmp/err"
if grep -q 'did you mean' "$tmp/err"; then no "far-crystal-no-suggestion"; else ok; fi
expect help-search-path 0 'DELTAK_CRYSTALS' -- --help
expect help-crystals 0 'DELTAK_CRYSTALS' -- crystals --help

# DELTAK_CRYSTALS adds to the shipped database (invented test crystals).
mkdir "$tmp/own" "$tmp/more"
cp tests/data/good/minimal.yaml "$tmp/own/"
DELTAK_CRYSTALS="$tmp/own" "$DK" crystals >"$tmp/out" 2>"$tmp/err"
if grep -q '^Testium\*' "$tmp/out" && grep -q '^MgO:LiNbO3 ' "$tmp/out" &&
   grep -q "^$((n + 1)) crystals" "$tmp/out" && grep -q 'from your own files' "$tmp/out" &&
   [ ! -s "$tmp/err" ]; then ok; else no "search-path-adds"; fi
DELTAK_CRYSTALS="$tmp/own" "$DK" crystals --json | "$PY" -c "
import json, sys
c = {k['crystal']: k for k in json.load(sys.stdin)['crystals']}
assert c['Testium']['shipped'] is False and c['Testium']['file'].endswith('/own/minimal.yaml')
assert c['GaAs']['shipped'] is True" 2>"$tmp/err" && ok || no "search-path-json"
# A file of the user's with a shipped name wins, with a warning naming both.
sed 's/^name: .*/name: a lab copy with other numbers/' crystals/bbo.yaml >"$tmp/own/my-bbo.yaml"
DELTAK_CRYSTALS="$tmp/own" "$DK" crystals BBO >"$tmp/out" 2>"$tmp/err"
if grep -q "file  *$tmp/own/my-bbo.yaml" "$tmp/out" &&
   grep -q "warning: 'beta-BaB2O4' from '$tmp/own/my-bbo.yaml' is used, not 'beta-BaB2O4' from '.*crystals/bbo.yaml'" "$tmp/err"; then ok
else no "search-path-replaces"; fi
# Of two entries the earlier wins; a missing entry is a warning.
sed 's/^name: .*/name: the second copy/' crystals/bbo.yaml >"$tmp/more/bbo2.yaml"
DELTAK_CRYSTALS="$tmp/more:$tmp/own:$tmp/none" "$DK" crystals BBO >"$tmp/out" 2>"$tmp/err"
if grep -q "file  *$tmp/more/bbo2.yaml" "$tmp/out" && grep -q "cannot read '$tmp/none'" "$tmp/err"; then ok
else no "search-path-order"; fi
# An alias shared with a shipped crystal goes to the user's file.
sed 's/^aliases: .*/aliases: [TST, PPLN]/' tests/data/good/minimal.yaml >"$tmp/alias.yaml"
DELTAK_CRYSTALS="$tmp/alias.yaml" "$DK" crystals PPLN >"$tmp/out" 2>"$tmp/err"
if grep -q '^Testium' "$tmp/out" && grep -q "the name 'PPLN' means 'Testium'" "$tmp/err"; then ok
else no "search-path-alias"; fi
expect search-path-ln-kept 0 'LiNbO3 - ' -- crystals LN

# --crystal takes a file: an unchanged copy gives the same answer, quietly.
cp crystals/mgo-linbo3.yaml "$tmp/mgln.yaml"
"$DK" period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 >"$tmp/a" 2>/dev/null
"$DK" period --crystal "$tmp/mgln.yaml" --pump 1064nm --idler 3.4um --temp 40 >"$tmp/b" 2>"$tmp/err"
if cmp -s "$tmp/a" "$tmp/b" && ! grep -q "is used, not" "$tmp/err"; then ok; else no "crystal-file-same"; fi
expect crystal-file-index 0 'Testium' -- index --crystal tests/data/good/minimal.yaml --wavelength 1um
expect crystal-file-missing 1 "cannot read '$tmp/none.yaml'" -- index --crystal "$tmp/none.yaml" --wavelength 1um
expect crystal-file-broken 1 "syntax.yaml': line [0-9]+, column" -- crystals tests/data/bad/syntax.yaml
no_out() { "$DK" "$@" >"$tmp/out" 2>/dev/null; [ ! -s "$tmp/out" ] && ok || no "no-output: $*"; }
no_out index --crystal "$tmp/none.yaml" --wavelength 1um --json

echo "$LABEL: $pass passed, $fail failed"
[ "$fail" -eq 0 ]
