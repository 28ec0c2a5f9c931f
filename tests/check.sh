#!/bin/sh
# make check: unit tests, command-line tests, the explore server and page
# (tests/explore/), then unit, command-line and explore tests again under
# AddressSanitizer + UndefinedBehaviorSanitizer, then what a user
# installs (tests/package/run.sh). Prints one closing line
# "checks: N passed, M failed".
MAKE_CMD=$1; BUILD=$2
log=$BUILD/check.log
: > "$log"
status=0
$MAKE_CMD --no-print-directory unit >>"$log" 2>&1 || status=1
$MAKE_CMD --no-print-directory cli-tests >>"$log" 2>&1 || status=1
$MAKE_CMD --no-print-directory explore-tests >>"$log" 2>&1 || status=1
$MAKE_CMD --no-print-directory asan >>"$log" 2>&1 || status=1
$MAKE_CMD --no-print-directory asan-cli >>"$log" 2>&1 || status=1
$MAKE_CMD --no-print-directory explore-asan >>"$log" 2>&1 || status=1
$MAKE_CMD --no-print-directory package-tests >>"$log" 2>&1 || status=1
grep -E '^(unit|cli|cli-asan|explore|explore-asan|browser|package|package-asan|python|python-installed|install): [0-9]+ passed' "$log" > "$BUILD/check.sum"
grep -E '^browser: skipped' "$log"
grep -E 'FAILED|^not ok|error:|Error|runtime error|AddressSanitizer' "$log" | head -40
pass=$(awk '{s+=$2} END{print s+0}' "$BUILD/check.sum")
fail=$(awk '{s+=$4} END{print s+0}' "$BUILD/check.sum")
sed 's/^/  /' "$BUILD/check.sum"
if [ "$status" -ne 0 ] && [ "$fail" -eq 0 ]; then fail=1; fi
echo "checks: $pass passed, $fail failed"
[ "$status" -eq 0 ] && [ "$fail" -eq 0 ]
