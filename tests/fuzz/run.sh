#!/bin/sh
# make fuzz: run each libFuzzer target in turn on its corpus in
# build/fuzz/corpus-NAME/ (seeded from the shipped crystal files and the
# test fixtures on first use), with UBSan halting, inputs up to MAX_LEN
# bytes and a per-input timeout, so that slow inputs count as findings.
# Findings go to build/fuzz/findings-NAME/. Prints one line per target:
# "fuzz: NAME N executions, no finding" (or the finding) and exits
# non-zero if any target found something.
# Usage: run.sh BUILD_FUZZ_DIR "TARGETS" RUNS SECONDS MAX_LEN
B=$1; TARGETS=$2; RUNS=$3; SECONDS_MAX=$4; MAX_LEN=$5
here=$(dirname "$0")
status=0
for t in $TARGETS; do
    corpus=$B/corpus-$t
    findings=$B/findings-$t
    mkdir -p "$corpus" "$findings"
    if [ -z "$(ls -A "$corpus")" ]; then
        case $t in
        units) cp "$here"/seeds/units/* "$corpus"/ ;;
        *) cp crystals/*.yaml tests/data/*/*.yaml "$corpus"/ ;;
        esac
    fi
    dict=
    [ -f "$here/$t.dict" ] && dict="-dict=$here/$t.dict"
    [ "$t" = index ] || [ "$t" = folder ] && [ -f "$here/crystal.dict" ] && dict="-dict=$here/crystal.dict"
    log=$B/fuzz-$t.log
    "$B/fuzz_$t" -runs="$RUNS" -max_total_time="$SECONDS_MAX" \
        -max_len="$MAX_LEN" -len_control=0 -timeout=10 -rss_limit_mb=2048 \
        -print_final_stats=1 -artifact_prefix="$findings/" $dict \
        "$corpus" > "$log" 2>&1
    rc=$?
    execs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$log" | tail -1)
    if [ "$rc" -eq 0 ]; then
        echo "fuzz: $t ${execs:-?} executions, no finding (log $log)"
    else
        status=1
        echo "fuzz: $t FINDING after ${execs:-?} executions (exit $rc):"
        grep -E 'ERROR|runtime error|broken promise|Test unit written' "$log" | head -5 | sed 's/^/    /'
    fi
done
exit $status
