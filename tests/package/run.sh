#!/bin/sh
# `make package-tests`: what a user installs and meets, in one go.
#   1. the command line's polish (tests/package/cli.sh), on the program
#      and, when make check built it, on the ASan+UBSan program;
#   2. the Python module against the build tree (python/tests/);
#   3. `make install` into a temporary prefix and everything installed
#      (tests/package/install.sh).
# Each prints one "LABEL: N passed, M failed" line.
#   sh tests/package/run.sh "MAKE" BUILD [PYTHON]
MAKE_CMD=$1; BUILD=${2:-build}; PY=${3:-/usr/bin/python3}
status=0
PYTHON=$PY sh tests/package/cli.sh "$BUILD/deltak" package || status=1
if [ -x "$BUILD/asan/deltak" ]; then
    LSAN_OPTIONS=suppressions=$(pwd)/tests/lsan.supp PYTHON=$PY \
        sh tests/package/cli.sh "$BUILD/asan/deltak" package-asan || status=1
fi
$MAKE_CMD --no-print-directory python-tests BUILD="$BUILD" PYTHON="$PY" || status=1
sh tests/package/install.sh "$MAKE_CMD" "$BUILD" "$PY" || status=1
exit $status
