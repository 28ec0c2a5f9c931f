#!/bin/sh
# What a user installs, as a user meets it: `make install` into a
# temporary prefix, then the installed program (reading the installed
# crystal database, not the source tree), `man deltak`, bash completion,
# a C program built through pkg-config, the Python module against the
# installed library; a staged install (DESTDIR); `make uninstall`.
# Prints "install: N passed, M failed".
#   sh tests/package/install.sh "MAKE" BUILD [PYTHON]
MAKE_CMD=${1:-make}; BUILD=${2:-build}; PY=${3:-/usr/bin/python3}
pass=0; fail=0
tree=$(pwd)
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
prefix=$tmp/usr
unset DELTAK_CRYSTALS DELTAK_LIBRARY PYTHONPATH

ok() { pass=$((pass + 1)); }
no() { fail=$((fail + 1)); echo "not ok: $1"; if [ -n "$2" ] && [ -f "$2" ]; then sed 's/^/    /' "$2" | head -15; fi; }
check() { name=$1; shift; if "$@" >"$tmp/log" 2>&1; then ok; else no "$name" "$tmp/log"; fi; }

if ! $MAKE_CMD --no-print-directory install PREFIX="$prefix" BUILD="$BUILD" >"$tmp/make.log" 2>&1; then
    no "make install" "$tmp/make.log"
    echo "install: $pass passed, $fail failed"; exit 1
fi
ok
version=$(sed -n 's/^VERSION *:= *//p' Makefile)
dk=$prefix/bin/deltak
for f in bin/deltak lib/libdeltak.a "lib/libdeltak.so.$version" lib/libdeltak.so.0 \
         lib/libdeltak.so lib/pkgconfig/deltak.pc include/deltak/command.h \
         include/deltak/crystal.h share/deltak/crystals/bbo.yaml \
         share/deltak/crystals/README.md share/man/man1/deltak.1 \
         share/bash-completion/completions/deltak; do
    [ -e "$prefix/$f" ] && ok || no "installed: $f"
done
[ "$(readlink "$prefix/lib/libdeltak.so.0")" = "libdeltak.so.$version" ] && ok || no "soname link"
objdump -p "$prefix/lib/libdeltak.so.$version" 2>/dev/null | grep -q 'SONAME *libdeltak.so.0$' && ok || no "soname"
pydir=$(find "$prefix/lib" -type d -name deltak -path '*dist-packages*')
[ -f "$pydir/__init__.py" ] && [ -f "$pydir/_installed.py" ] && ok || no "python module installed ($pydir)"

# The installed program reads the installed database, from any folder,
# and nothing of the source tree is compiled into it.
cd "$tmp"
"$dk" crystals MgO:LN >"$tmp/out" 2>"$tmp/err"
grep -q "file  *$prefix/share/deltak/crystals/mgo-linbo3.yaml" "$tmp/out" && ok || no "installed database" "$tmp/err"
for f in "$dk" "$prefix/lib/libdeltak.so.$version" "$prefix/lib/libdeltak.a"; do
    if grep -q "$tree/crystals" "$f"; then no "source tree in $f"; else ok; fi
done
check installed-period "$dk" period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40
[ "$("$dk" --version)" = "deltak $version" ] && ok || no "installed version"
cd "$tree"

# The man page: found by man through MANPATH, read without groff
# warnings, the install folder filled in, every command and option in it.
MANPATH=$prefix/share/man MANWIDTH=80 man -P cat deltak >"$tmp/man.txt" 2>"$tmp/err"
grep -q 'phase-matching designer' "$tmp/man.txt" && ok || no "man deltak" "$tmp/err"
man -l "$prefix/share/man/man1/deltak.1" >/dev/null 2>&1 && ok || no "man -l"
groff -man -ww -z "$prefix/share/man/man1/deltak.1" >"$tmp/groff" 2>&1
[ ! -s "$tmp/groff" ] && ok || no "groff warnings" "$tmp/groff"
grep -q "$prefix/share/deltak/crystals" "$tmp/man.txt" && ok || no "man: crystal folder"
if grep -q '@CRYSTALDIR@' "$tmp/man.txt"; then no "man: placeholder left"; else ok; fi
sh tests/package/man.sh "$dk" "$prefix/share/man/man1/deltak.1" >"$tmp/mancheck" 2>&1 && ok || no "man covers every command and option" "$tmp/mancheck"

# Completion: source the installed file in bash and call its function.
sh tests/package/completion.sh "$prefix/share/bash-completion/completions/deltak" "$dk" >"$tmp/comp" 2>&1 && ok || no "completion" "$tmp/comp"

# The C example, built through pkg-config against the installed library
# (shared and static), run from another folder.
export PKG_CONFIG_PATH="$prefix/lib/pkgconfig"
[ "$(pkg-config --modversion deltak)" = "$version" ] && ok || no "pkg-config version"
# Every installed header compiles alone, and <deltak/deltak.h> names them
# all.
hdr_ok=1
for h in "$prefix"/include/deltak/*.h; do
    b=$(basename "$h")
    printf '#include <deltak/%s>\n' "$b" |
        ${CC:-cc} -std=c17 -Wall -Wextra -Werror $(pkg-config --cflags deltak) \
            -x c -fsyntax-only - >"$tmp/hdr" 2>&1 || { hdr_ok=0; no "header $b alone" "$tmp/hdr"; }
    [ "$b" = deltak.h ] || grep -q "^#include \"deltak/$b\"" "$prefix/include/deltak/deltak.h" ||
        { hdr_ok=0; no "deltak.h lacks $b"; }
done
[ "$hdr_ok" = 1 ] && ok
check c-example-build make -s -C examples/c-api OUT="$tmp" all static
"$tmp/phase_match" >"$tmp/c.out" 2>"$tmp/err" && ok || no "c-example-run" "$tmp/err"
ldd "$tmp/phase_match" | grep -q "$prefix/lib/libdeltak.so.0" && ok || no "c-example uses the installed libdeltak.so"
"$tmp/phase_match_static" >"$tmp/c2.out" 2>&1 && cmp -s "$tmp/c.out" "$tmp/c2.out" && ok || no "c-example static" "$tmp/c2.out"
# Its numbers are the program's.
n=$("$dk" index --crystal MgO:LN --wavelength 1064nm --temp 40 --dispersion Gayer2008 --json |
    "$PY" -c "import json,sys; print('%.10f' % [a for a in json.load(sys.stdin)['axes'] if a['axis'] == 'e'][0]['n'])")
p=$("$dk" period --crystal MgO:LN --pump 1064nm --idler 3.4um --temp 40 --json |
    "$PY" -c "import json,sys; print(json.load(sys.stdin)['period_um'])")
grep -q "n_e(1.064 um, 40 C) = $n" "$tmp/c.out" && grep -q "\"period_um\": *$p" "$tmp/c.out" &&
    grep -q "database: $prefix/share/deltak/crystals" "$tmp/c.out" && ok || no "c-example numbers (n $n, period $p)" "$tmp/c.out"
unset PKG_CONFIG_PATH

# The Python module from the installed prefix: it must find the installed
# library by itself, and answer as the installed program does.
PYTHONPATH=$pydir/.. DELTAK_PROGRAM=$dk DELTAK_EXPECT_LIBRARY=$prefix/lib/libdeltak.so.0 \
    "$PY" python/tests/run.py python-installed >"$tmp/py" 2>&1
tail -1 "$tmp/py"
grep -q '^python-installed: [0-9]* passed, 0 failed' "$tmp/py" && ok || no "python module against the installed library" "$tmp/py"

# A staged install (DESTDIR): files under the stage, the program compiled
# for the final prefix.
stage=$tmp/stage
$MAKE_CMD --no-print-directory install DESTDIR="$stage" PREFIX=/opt/deltak-test BUILD="$BUILD" >"$tmp/make2.log" 2>&1 && ok || no "make install DESTDIR" "$tmp/make2.log"
[ -x "$stage/opt/deltak-test/bin/deltak" ] && [ ! -e /opt/deltak-test ] && ok || no "staged files"
"$stage/opt/deltak-test/bin/deltak" crystals >/dev/null 2>"$tmp/err"
grep -q "/opt/deltak-test/share/deltak/crystals" "$tmp/err" && ok || no "staged program reads the final prefix" "$tmp/err"
grep -q '^prefix=/opt/deltak-test$' "$stage/opt/deltak-test/lib/pkgconfig/deltak.pc" && ok || no "staged deltak.pc"
grep -rq "$tmp/usr" "$stage" && no "staged install names the first prefix" || ok

# make uninstall leaves nothing behind.
$MAKE_CMD --no-print-directory uninstall PREFIX="$prefix" BUILD="$BUILD" >"$tmp/un.log" 2>&1 && ok || no "make uninstall" "$tmp/un.log"
left=$(find "$prefix" ! -type d | head -5)
[ -z "$left" ] && ok || no "uninstall left: $left"
$MAKE_CMD --no-print-directory uninstall DESTDIR="$stage" PREFIX=/opt/deltak-test BUILD="$BUILD" >/dev/null 2>&1
left=$(find "$stage" ! -type d | head -5)
[ -z "$left" ] && ok || no "staged uninstall left: $left"

echo "install: $pass passed, $fail failed"
[ "$fail" -eq 0 ]
