# deltak - build, test, demo. `make help` lists the targets.
#
# Dependencies come from Debian and are found with pkg-config;
# .ci/install-deps installs any that are missing (as root) or prints the
# one apt-get line to run.

VERSION := 0.1.0
CC      ?= gcc
PKGS    := gsl cairo pangocairo yaml-0.1 json-c fftw3
BUILD   := build
DEPCHECK := $(BUILD)/.deps-ok
# `make V=1` shows the full compiler lines.
Q := $(if $(V),,@)

PKG_CFLAGS = $(shell pkg-config --cflags $(PKGS) 2>/dev/null)
PKG_LIBS   = $(shell pkg-config --libs $(PKGS) 2>/dev/null)

WARN     := -Wall -Wextra -Werror -Wshadow -Wstrict-prototypes -Wformat=2
CFLAGS   ?= -O2 -g
# Maps and families run on all cores with OpenMP (GCC's libgomp); the hot
# kernels are vectorised with `omp simd`. `make OPENMP=-fopenmp-simd`
# builds a single-threaded library with the same results. The library
# never reads errno after a math function nor enables floating-point traps
# or reads exception flags, so sqrt() may be an instruction and selects may
# be branch-free (-fno-math-errno -fno-trapping-math: IEEE results are
# unchanged; no -ffast-math, and ISO C mode keeps FMA contraction off).
OPENMP   ?= -fopenmp
FPFLAGS  := -fno-math-errno -fno-trapping-math
ALL_CFLAGS = -std=c17 -D_DEFAULT_SOURCE $(WARN) $(CFLAGS) $(OPENMP) $(FPFLAGS) -Iinclude -Isrc \
             $(PKG_CFLAGS) -DDK_VERSION='"$(VERSION)"' \
             -DDK_CRYSTAL_DIR='"$(abspath crystals)"' -MMD -MP
LDLIBS_ALL = $(PKG_LIBS) -lm

# The commands are part of the library too (deltak/command.h); only
# main.c is the program's own.
LIB_SRC := $(filter-out src/cli/main.c,$(wildcard src/*/*.c))
CLI_SRC := src/cli/main.c
LIB_OBJ := $(LIB_SRC:%.c=$(BUILD)/%.o)
CLI_OBJ := $(CLI_SRC:%.c=$(BUILD)/%.o)
TEST_SRC := $(wildcard tests/test_*.c)
TEST_BIN := $(TEST_SRC:tests/%.c=$(BUILD)/tests/%)

.PHONY: all deps check unit cli-tests asan asan-cli demo bench plots fuzz clean help

all: $(BUILD)/deltak

help:
	@echo "make            build build/deltak and build/libdeltak.a"
	@echo "make check      build and run every test (also under ASan+UBSan)"
	@echo "make demo       run the demo scenarios on the shipped database"
	@echo "make bench      measure speed (benchmarks never run in check)"
	@echo "make plots      regenerate the figures in plots/"
	@echo "make fuzz       fuzz parsers and loaders (needs clang; FUZZ_RUNS=1000000)"

$(DEPCHECK): .ci/install-deps
	@sh .ci/install-deps
	@mkdir -p $(BUILD) && touch $@

deps: $(DEPCHECK)

$(BUILD)/%.o: %.c | $(DEPCHECK)
	@mkdir -p $(dir $@)
	@echo "  CC      $<"
	$(Q)$(CC) $(ALL_CFLAGS) -c $< -o $@

$(BUILD)/libdeltak.a: $(LIB_OBJ)
	@rm -f $@
	@echo "  AR      $@"
	$(Q)ar rcs $@ $^

$(BUILD)/deltak: $(CLI_OBJ) $(BUILD)/libdeltak.a
	@echo "  LINK    $@"
	$(Q)$(CC) $(ALL_CFLAGS) -o $@ $(CLI_OBJ) $(BUILD)/libdeltak.a $(LDLIBS_ALL)

$(BUILD)/tests/%: tests/%.c $(BUILD)/libdeltak.a tests/testutil.h
	@mkdir -p $(dir $@)
	@echo "  TEST    $@"
	$(Q)$(CC) $(ALL_CFLAGS) -DDK_TEST_DATA='"$(abspath tests/data)"' \
	    -DDK_REFERENCE_DIR='"$(abspath ../shared/reference)"' \
	    -o $@ $< $(BUILD)/libdeltak.a $(LDLIBS_ALL) \
	    $(shell pkg-config --libs cmocka)

unit: $(TEST_BIN)
	@sh tests/run-unit.sh $(TEST_BIN)

cli-tests: $(BUILD)/deltak
	@sh tests/cli/run.sh $(BUILD)/deltak

# The unit tests once more, built with AddressSanitizer and UBSan.
asan: | $(DEPCHECK)
	@$(MAKE) --no-print-directory BUILD=$(BUILD)/asan \
	    CFLAGS="-O1 -g -fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=all" \
	    DEPCHECK=$(DEPCHECK) unit

# Every test: unit tests, command-line tests, unit tests under sanitizers.
# Ends with one line "checks: N passed, M failed".
# The command-line tests once more against a sanitized program.
asan-cli: | $(DEPCHECK)
	@$(MAKE) --no-print-directory BUILD=$(BUILD)/asan \
	    CFLAGS="-O1 -g -fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=all" \
	    DEPCHECK=$(DEPCHECK) $(BUILD)/asan/deltak
	@LSAN_OPTIONS=suppressions=$(abspath tests/lsan.supp) \
	    sh tests/cli/run.sh $(BUILD)/asan/deltak > $(BUILD)/asan/cli.log; \
	    rc=$$?; sed 's/^cli:/cli-asan:/' $(BUILD)/asan/cli.log; exit $$rc

check: $(BUILD)/deltak $(TEST_BIN)
	@sh tests/check.sh "$(MAKE)" $(BUILD)

demo: $(BUILD)/deltak
	@sh examples/demo.sh $(BUILD)/deltak

$(BUILD)/bench_%: tests/bench/bench_%.c $(BUILD)/libdeltak.a
	$(Q)$(CC) $(ALL_CFLAGS) -o $@ $< $(BUILD)/libdeltak.a $(LDLIBS_ALL)

# Speed on this machine: engine throughput against a NumPy/SciPy script of
# the same jobs, latency of whole commands, figure rendering.
bench: $(BUILD)/deltak $(BUILD)/bench_index $(BUILD)/bench_speed \
       $(BUILD)/bench_run $(BUILD)/bench_simulate
	@sh tests/bench/run.sh $(BUILD)/deltak

plots: $(BUILD)/deltak
	@sh examples/plots.sh $(BUILD)/deltak plots

# Fuzzing (not part of make check). Needs clang with libFuzzer (Debian:
# apt-get install clang). Four targets (tests/fuzz/fuzz_*.c): units (unit
# and option parsing, text escaping), crystal (one crystal file), index
# (index evaluation of fuzzed crystal files: poles, n^2 < 0, extremes),
# folder (the crystal-folder loader with FIFOs, links, hidden files).
# Built with ASan and UBSan set to halt; each runs FUZZ_RUNS inputs (at
# most FUZZ_SECONDS), inputs up to FUZZ_MAX_LEN bytes (beyond the
# loader's 256 kB limit, so slow large inputs are found), 10 s per input
# at most. Corpus in build/fuzz/corpus-NAME/, findings in
# build/fuzz/findings-NAME/. `make fuzz FUZZ_TARGETS=units` runs one.
FUZZ_TARGETS ?= units crystal index folder
FUZZ_RUNS    ?= 1000000
FUZZ_SECONDS ?= 3600
FUZZ_MAX_LEN ?= 1048576
FUZZ_CC      ?= clang
FUZZ_CFLAGS   = -std=c17 -D_DEFAULT_SOURCE -g -O1 -Wall -Wextra \
                -fsanitize=address,undefined -fno-sanitize-recover=all \
                -fno-omit-frame-pointer -Iinclude -Isrc $(PKG_CFLAGS) \
                -DDK_VERSION='"$(VERSION)"' \
                -DDK_CRYSTAL_DIR='"$(abspath crystals)"'
FUZZ_OBJ     := $(LIB_SRC:%.c=$(BUILD)/fuzz/obj/%.o)

$(BUILD)/fuzz/obj/%.o: %.c | $(DEPCHECK)
	@command -v $(FUZZ_CC) >/dev/null || { echo "error: make fuzz needs clang (apt-get install clang)"; exit 1; }
	@mkdir -p $(dir $@)
	@echo "  FUZZCC  $<"
	$(Q)$(FUZZ_CC) $(FUZZ_CFLAGS) -fsanitize=fuzzer-no-link -c $< -o $@

$(BUILD)/fuzz/fuzz_%: tests/fuzz/fuzz_%.c tests/fuzz/fuzz_common.h $(FUZZ_OBJ)
	@echo "  FUZZLD  $@"
	$(Q)$(FUZZ_CC) $(FUZZ_CFLAGS) -fsanitize=fuzzer -o $@ $< $(FUZZ_OBJ) \
	    $(LDLIBS_ALL)

fuzz: $(FUZZ_TARGETS:%=$(BUILD)/fuzz/fuzz_%)
	@sh tests/fuzz/run.sh $(BUILD)/fuzz "$(FUZZ_TARGETS)" $(FUZZ_RUNS) \
	    $(FUZZ_SECONDS) $(FUZZ_MAX_LEN)

clean:
	rm -rf $(BUILD)

-include $(LIB_OBJ:.o=.d) $(CLI_OBJ:.o=.d)
