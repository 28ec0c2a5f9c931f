# deltak - build, test, demo. `make help` lists the targets.
#
# Dependencies come from Debian and are found with pkg-config. A plain
# `make` only checks for them and prints the one apt-get line to run;
# `make deps` installs them (as root), and `make check` and `make demo`
# call it first.

VERSION := 0.1.0
CC      ?= gcc
PKGS    := gsl cairo pangocairo yaml-0.1 json-c fftw3
# The program alone (deltak explore) also serves HTTP; the library does not.
EXPLORE_PKGS := libmicrohttpd
BUILD   := build
DEPCHECK := $(BUILD)/.deps-ok
# `make V=1` shows the full compiler lines.
Q := $(if $(V),,@)

PKG_CFLAGS = $(shell pkg-config --cflags $(PKGS) 2>/dev/null)
PKG_LIBS   = $(shell pkg-config --libs $(PKGS) 2>/dev/null)
EXPLORE_CFLAGS = $(shell pkg-config --cflags $(EXPLORE_PKGS) 2>/dev/null)
EXPLORE_LIBS   = $(shell pkg-config --libs $(EXPLORE_PKGS) 2>/dev/null)

# Warnings are errors in `make check` and CI (WERROR=-Werror), not in a
# user's plain `make`, where a newer compiler's new warning must not stop
# the build.
WERROR   ?=
WARN     := -Wall -Wextra -Wshadow -Wstrict-prototypes -Wformat=2 $(WERROR)
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
LDLIBS_ALL = $(PKG_LIBS) $(OPENMP) -lm

# The commands are part of the library too (deltak/command.h); only
# main.c is the program's own.
# `deltak explore` (src/cli/explore.c, src/explore/) is the program's
# only: the library's command table reaches it through a hook that main.c
# sets, so that libdeltak needs no HTTP library.
LIB_SRC := $(filter-out src/cli/main.c src/cli/explore.c src/explore/%,$(wildcard src/*/*.c))
CLI_SRC := src/cli/main.c src/cli/explore.c
# The page (web/) is compiled in (explore_assets.c, generated).
WEB_FILES := web/index.html web/explore.css web/explore.js
ASSETS_C := $(BUILD)/gen/explore_assets.c
EXPLORE_OBJ := $(patsubst %.c,$(BUILD)/%.o,$(wildcard src/explore/*.c)) \
               $(BUILD)/gen/explore_assets.o
LIB_OBJ := $(LIB_SRC:%.c=$(BUILD)/%.o)
CLI_OBJ := $(CLI_SRC:%.c=$(BUILD)/%.o) $(EXPLORE_OBJ)
TEST_SRC := $(wildcard tests/test_*.c tests/explore/test_*.c)
TEST_BIN := $(TEST_SRC:tests/%.c=$(BUILD)/tests/%)

.PHONY: all deps check unit cli-tests asan asan-cli demo bench plots fuzz clean help \
        install uninstall python-tests package-tests install-tests strict-prep \
        explore-tests explore-load explore-asan

all: $(BUILD)/deltak

help:
	@echo "make            build build/deltak, build/libdeltak.a and libdeltak.so"
	@echo "make deps       install the Debian packages deltak needs (as root)"
	@echo "make check      build and run every test (also under ASan+UBSan)"
	@echo "make install    install into PREFIX (default /usr/local; DESTDIR too)"
	@echo "make uninstall  remove what make install installed"
	@echo "make demo       run the demo scenarios on the shipped database"
	@echo "make bench      measure speed (benchmarks never run in check)"
	@echo "make explore-load  load-test the page's server on loopback (needs wrk)"
	@echo "make plots      regenerate the figures in plots/"
	@echo "make fuzz       fuzz parsers and loaders (needs clang; FUZZ_RUNS=1000000)"

$(DEPCHECK): .ci/install-deps
	@sh .ci/install-deps --check
	@mkdir -p $(BUILD) && touch $@

deps:
	@sh .ci/install-deps
	@mkdir -p $(BUILD) && touch $(DEPCHECK) $(BUILD)/.testdeps-ok

$(BUILD)/%.o: %.c | $(DEPCHECK)
	@mkdir -p $(dir $@)
	@echo "  CC      $<"
	$(Q)$(CC) $(ALL_CFLAGS) -c $< -o $@
	@$(LENIENT_MARK)

$(ASSETS_C): $(WEB_FILES) src/explore/embed_assets.sh
	@mkdir -p $(dir $@)
	@echo "  EMBED   $@"
	$(Q)sh src/explore/embed_assets.sh $@ $(WEB_FILES)

$(BUILD)/gen/explore_assets.o: $(ASSETS_C) src/explore/explore.h | $(DEPCHECK)
	@echo "  CC      $<"
	$(Q)$(CC) $(ALL_CFLAGS) -c $< -o $@
	@$(LENIENT_MARK)

$(BUILD)/libdeltak.a: $(LIB_OBJ)
	@rm -f $@
	@echo "  AR      $@"
	$(Q)ar rcs $@ $^

$(BUILD)/deltak: $(CLI_OBJ) $(BUILD)/libdeltak.a
	@echo "  LINK    $@"
	$(Q)$(CC) $(ALL_CFLAGS) -o $@ $(CLI_OBJ) $(BUILD)/libdeltak.a $(LDLIBS_ALL) \
	    $(EXPLORE_LIBS)

$(EXPLORE_OBJ): ALL_CFLAGS += $(EXPLORE_CFLAGS)

# The explore test links the server's objects beside the library.
$(BUILD)/tests/explore/test_explore: tests/explore/test_explore.c $(EXPLORE_OBJ) \
        $(BUILD)/libdeltak.a tests/testutil.h
	@mkdir -p $(dir $@)
	@echo "  TEST    $@"
	$(Q)$(CC) $(ALL_CFLAGS) -o $@ $< $(EXPLORE_OBJ) $(BUILD)/libdeltak.a \
	    $(LDLIBS_ALL) $(EXPLORE_LIBS) $(shell pkg-config --libs cmocka)
	@$(LENIENT_MARK)

$(BUILD)/tests/%: tests/%.c $(BUILD)/libdeltak.a tests/testutil.h
	@mkdir -p $(dir $@)
	@echo "  TEST    $@"
	$(Q)$(CC) $(ALL_CFLAGS) -DDK_TEST_DATA='"$(abspath tests/data)"' \
	    -DDK_REFERENCE_DIR='"$(abspath ../shared/reference)"' \
	    -o $@ $< $(BUILD)/libdeltak.a $(LDLIBS_ALL) \
	    $(shell pkg-config --libs cmocka)
	@$(LENIENT_MARK)

unit: $(TEST_BIN)
	@sh tests/run-unit.sh $(TEST_BIN)

cli-tests: $(BUILD)/deltak
	@sh tests/cli/run.sh $(BUILD)/deltak

# `deltak explore` over HTTP: the API against the command line, bad
# requests, concurrency, deadline (tests/explore/api.py); then the page in
# headless Chromium when chromium and node are there (tests/explore/
# browser.sh; screenshots in build/explore/). Prints "explore: ..." and
# "browser: ..." lines.
explore-tests: $(BUILD)/deltak
	@python3 tests/explore/api.py $(BUILD)/deltak
	@sh tests/explore/browser.sh $(BUILD)/deltak $(BUILD)/explore

# Load on loopback with wrk: requests per second and latency percentiles
# of a period query and a tuning-curve SVG (measures; not in check).
explore-load: $(BUILD)/deltak
	@sh tests/explore/load.sh $(BUILD)/deltak $(or $(LOAD_SECONDS),10) $(or $(LOAD_CONNECTIONS),4)

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

# The explore server's HTTP tests once more against the sanitized program.
explore-asan: | $(DEPCHECK)
	@$(MAKE) --no-print-directory BUILD=$(BUILD)/asan \
	    CFLAGS="-O1 -g -fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=all" \
	    DEPCHECK=$(DEPCHECK) $(BUILD)/asan/deltak
	@LSAN_OPTIONS=suppressions=$(abspath tests/lsan.supp) \
	    python3 tests/explore/api.py $(BUILD)/asan/deltak > $(BUILD)/asan/explore.log; \
	    rc=$$?; sed 's/^explore:/explore-asan:/' $(BUILD)/asan/explore.log; exit $$rc

# Installs what is missing first, rebuilds whatever was built without
# -Werror, then runs everything with -Werror.
check: deps
	@$(MAKE) --no-print-directory strict-prep
	@sh tests/check.sh "$(MAKE) WERROR=-Werror" $(BUILD)

demo: deps
	@$(MAKE) --no-print-directory $(BUILD)/deltak
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
FUZZ_TARGETS ?= units crystal index folder design command
FUZZ_RUNS    ?= 1000000
FUZZ_SECONDS ?= 3600
FUZZ_MAX_LEN ?= 1048576
FUZZ_CC      ?= clang
FUZZ_CFLAGS   = -std=c17 -D_DEFAULT_SOURCE -g -O1 -Wall -Wextra \
                -fsanitize=address,undefined -fno-sanitize-recover=all \
                -fno-omit-frame-pointer -Iinclude -Isrc $(PKG_CFLAGS) \
                -DDK_VERSION='"$(VERSION)"' \
                -DDK_CRYSTAL_DIR='"$(abspath crystals)"' -MMD -MP
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

# ---------------------------------------------------------------------------
# Package: shared library, install/uninstall, pkg-config, and the tests of
# what a user installs (tests/package/, python/tests/). Kept in one block.

# Objects built without -Werror carry a marker file, so that `make check`
# (strict-prep) rebuilds exactly those, with it.
LENIENT_MARK = $(if $(findstring -Werror,$(WERROR)),rm -f $@.lenient,touch $@.lenient)

# The test programs need cmocka too (checked, not installed: `make deps`).
$(TEST_BIN): | $(BUILD)/.testdeps-ok
$(BUILD)/.testdeps-ok: .ci/install-deps
	@sh .ci/install-deps --check-all
	@mkdir -p $(BUILD) && touch $@

strict-prep:
	@find $(BUILD) -name '*.lenient' 2>/dev/null | while read -r m; do \
	    rm -f "$${m%.lenient}" "$$m"; done

# The same position-independent objects make libdeltak.a, libdeltak.so
# and the program.
ALL_CFLAGS += -fPIC

# Objects are rebuilt when the compiler flags change (-fPIC, OpenMP, a
# new CFLAGS); -Werror alone does not count (see LENIENT_MARK).
FLAGS_STAMP := $(BUILD)/.cflags
FLAGS_TEXT   = $(subst ','\'',$(CC) $(filter-out -Werror,$(ALL_CFLAGS)))
$(LIB_OBJ) $(CLI_OBJ) $(TEST_BIN): $(FLAGS_STAMP)
$(FLAGS_STAMP): FORCE
	@mkdir -p $(BUILD)
	@printf '%s\n' '$(FLAGS_TEXT)' | cmp -s - $@ 2>/dev/null || \
	    printf '%s\n' '$(FLAGS_TEXT)' > $@

PREFIX        ?= /usr/local
BINDIR        ?= $(PREFIX)/bin
LIBDIR        ?= $(PREFIX)/lib
INCLUDEDIR    ?= $(PREFIX)/include
DATADIR       ?= $(PREFIX)/share
MANDIR        ?= $(DATADIR)/man
COMPLETIONDIR ?= $(DATADIR)/bash-completion/completions
CRYSTALDIR     = $(DATADIR)/deltak/crystals
PYTHON        ?= /usr/bin/python3
# Where Debian's python3 looks for modules: /usr/lib/python3/dist-packages
# under /usr, PREFIX/lib/python3.X/dist-packages under other prefixes.
PYTHONDIR     ?= $(if $(filter /usr,$(PREFIX)),$(PREFIX)/lib/python3/dist-packages,$(PREFIX)/lib/python$(shell $(PYTHON) -c 'import sys; print("%d.%d" % sys.version_info[:2])' 2>/dev/null || echo 3)/dist-packages)

# libdeltak.so.0 -> libdeltak.so.0.1.0. It exports the names of the public
# headers only (the version script lists them); the rest stays internal.
SO_MAJOR := $(firstword $(subst ., ,$(VERSION)))
SONAME   := libdeltak.so.$(SO_MAJOR)
SOFILE   := libdeltak.so.$(VERSION)
HEADERS  := $(wildcard include/deltak/*.h)

all: $(BUILD)/$(SOFILE)

$(BUILD)/libdeltak.map: $(HEADERS)
	@mkdir -p $(BUILD)
	@{ echo '{'; echo '  global:'; grep -oh 'dk_[a-z0-9_]*' $(HEADERS) | \
	    sort -u | sed 's/.*/    &;/'; echo '  local: *;'; echo '};'; } > $@

define link_shared
	@echo "  SHLIB   $@"
	$(Q)$(CC) -shared -Wl,-soname,$(SONAME) \
	    -Wl,--version-script=$(BUILD)/libdeltak.map -Wl,-z,defs $(LDFLAGS) \
	    -o $@ $(filter %.o,$^) $(LDLIBS_ALL)
	$(Q)ln -sf $(SOFILE) $(dir $@)$(SONAME)
	$(Q)ln -sf $(SONAME) $(dir $@)libdeltak.so
endef

$(BUILD)/$(SOFILE): $(LIB_OBJ) $(BUILD)/libdeltak.map
	$(link_shared)

# The installed build differs from the tree's in one object: the shipped
# crystal folder compiled into src/data/shipped_dir.c. It is rebuilt when
# the install folders change (the stamp holds them).
INST          := $(BUILD)/install
INST_DIR_OBJ  := $(INST)/shipped_dir.o
INST_LIB_OBJ  := $(filter-out $(BUILD)/src/data/shipped_dir.o,$(LIB_OBJ)) $(INST_DIR_OBJ)
INST_DIRS      = $(PREFIX) $(LIBDIR) $(INCLUDEDIR) $(CRYSTALDIR)

.PHONY: FORCE
FORCE:

$(INST)/dirs.stamp: FORCE
	@mkdir -p $(INST)
	@case '$(INST_DIRS)' in *[\'\"\\]*) \
	    echo "error: install folders must not contain quotes or backslashes: $(INST_DIRS)" >&2; exit 1;; esac
	@echo '$(INST_DIRS)' | cmp -s - $@ 2>/dev/null || echo '$(INST_DIRS)' > $@

$(INST_DIR_OBJ): src/data/shipped_dir.c $(INST)/dirs.stamp $(FLAGS_STAMP) | $(DEPCHECK)
	@echo "  CC      $< (crystals in $(CRYSTALDIR))"
	$(Q)$(CC) $(filter-out -DDK_CRYSTAL_DIR=%,$(ALL_CFLAGS)) \
	    -DDK_CRYSTAL_DIR='"$(CRYSTALDIR)"' -c $< -o $@
	@$(LENIENT_MARK)

$(INST)/libdeltak.a: $(INST_LIB_OBJ)
	@rm -f $@
	@echo "  AR      $@"
	$(Q)ar rcs $@ $^

$(INST)/$(SOFILE): $(INST_LIB_OBJ) $(BUILD)/libdeltak.map
	$(link_shared)

# The installed program carries the library in itself (no run-time path
# to PREFIX/lib needed); C programs and Python use libdeltak.so.
$(INST)/deltak: $(CLI_OBJ) $(INST)/libdeltak.a
	@echo "  LINK    $@"
	$(Q)$(CC) $(ALL_CFLAGS) $(LDFLAGS) -o $@ $(CLI_OBJ) $(INST)/libdeltak.a $(LDLIBS_ALL) \
	    $(EXPLORE_LIBS)

$(INST)/deltak.pc: deltak.pc.in $(INST)/dirs.stamp
	@sed -e 's|@PREFIX@|$(PREFIX)|' -e 's|@LIBDIR@|$(LIBDIR)|' \
	    -e 's|@INCLUDEDIR@|$(INCLUDEDIR)|' -e 's|@CRYSTALDIR@|$(CRYSTALDIR)|' \
	    -e 's|@VERSION@|$(VERSION)|' -e 's|@REQUIRES_PRIVATE@|$(PKGS)|' $< > $@

$(INST)/deltak.1: man/deltak.1 $(INST)/dirs.stamp
	@sed -e 's|@CRYSTALDIR@|$(CRYSTALDIR)|g' $< > $@

PY_FILES := $(wildcard python/deltak/*.py)
CRYSTAL_FILES := $(wildcard crystals/*.yaml) crystals/README.md

install: $(INST)/deltak $(INST)/libdeltak.a $(INST)/$(SOFILE) $(INST)/deltak.pc \
         $(INST)/deltak.1
	@echo "  INSTALL $(DESTDIR)$(PREFIX)"
	$(Q)install -d $(DESTDIR)$(BINDIR) $(DESTDIR)$(LIBDIR)/pkgconfig \
	    $(DESTDIR)$(INCLUDEDIR)/deltak $(DESTDIR)$(CRYSTALDIR) \
	    $(DESTDIR)$(MANDIR)/man1 $(DESTDIR)$(COMPLETIONDIR) \
	    $(DESTDIR)$(PYTHONDIR)/deltak
	$(Q)install -m 755 $(INST)/deltak $(DESTDIR)$(BINDIR)/deltak
	$(Q)install -m 644 $(CRYSTAL_FILES) $(DESTDIR)$(CRYSTALDIR)/
	$(Q)install -m 644 $(INST)/deltak.1 $(DESTDIR)$(MANDIR)/man1/deltak.1
	$(Q)install -m 644 completion/deltak.bash $(DESTDIR)$(COMPLETIONDIR)/deltak
	$(Q)install -m 644 $(HEADERS) $(DESTDIR)$(INCLUDEDIR)/deltak/
	$(Q)install -m 644 $(INST)/libdeltak.a $(DESTDIR)$(LIBDIR)/libdeltak.a
	$(Q)install -m 755 $(INST)/$(SOFILE) $(DESTDIR)$(LIBDIR)/$(SOFILE)
	$(Q)ln -sf $(SOFILE) $(DESTDIR)$(LIBDIR)/$(SONAME)
	$(Q)ln -sf $(SONAME) $(DESTDIR)$(LIBDIR)/libdeltak.so
	$(Q)install -m 644 $(INST)/deltak.pc $(DESTDIR)$(LIBDIR)/pkgconfig/deltak.pc
	$(Q)install -m 644 $(PY_FILES) $(DESTDIR)$(PYTHONDIR)/deltak/
	$(Q)printf '# Written by make install: where libdeltak.so was installed.\nLIBDIR = %s\n' \
	    "'$(LIBDIR)'" > $(DESTDIR)$(PYTHONDIR)/deltak/_installed.py
	$(Q)if [ -z "$(DESTDIR)" ] && [ "$$(id -u)" = 0 ] && command -v ldconfig >/dev/null; then ldconfig; fi
	@echo "  python module in $(PYTHONDIR)"

uninstall:
	@echo "  UNINSTALL $(DESTDIR)$(PREFIX)"
	$(Q)rm -f $(DESTDIR)$(BINDIR)/deltak $(DESTDIR)$(MANDIR)/man1/deltak.1 \
	    $(DESTDIR)$(COMPLETIONDIR)/deltak $(DESTDIR)$(LIBDIR)/libdeltak.a \
	    $(DESTDIR)$(LIBDIR)/$(SOFILE) $(DESTDIR)$(LIBDIR)/$(SONAME) \
	    $(DESTDIR)$(LIBDIR)/libdeltak.so $(DESTDIR)$(LIBDIR)/pkgconfig/deltak.pc \
	    $(addprefix $(DESTDIR)$(CRYSTALDIR)/,$(notdir $(CRYSTAL_FILES))) \
	    $(addprefix $(DESTDIR)$(INCLUDEDIR)/deltak/,$(notdir $(HEADERS))) \
	    $(addprefix $(DESTDIR)$(PYTHONDIR)/deltak/,$(notdir $(PY_FILES)) _installed.py)
	$(Q)rm -rf $(DESTDIR)$(PYTHONDIR)/deltak/__pycache__
	$(Q)for d in $(DESTDIR)$(CRYSTALDIR) $(DESTDIR)$(DATADIR)/deltak \
	    $(DESTDIR)$(INCLUDEDIR)/deltak $(DESTDIR)$(PYTHONDIR)/deltak; do \
	    if [ -d "$$d" ]; then rmdir "$$d" 2>/dev/null || echo "  kept $$d (not empty)"; fi; done

# The Python module against the build tree (python/tests/).
python-tests: $(BUILD)/$(SOFILE) $(BUILD)/deltak
	@DELTAK_LIBRARY=$(abspath $(BUILD))/$(SONAME) PYTHONPATH=$(abspath python) \
	    DELTAK_PROGRAM=$(abspath $(BUILD))/deltak DELTAK_EXPECT_LIBRARY= \
	    $(PYTHON) python/tests/run.py python

# What a user installs: the command-line polish, then `make install` into
# a temporary prefix with the program, man page, completion, the C
# example through pkg-config and the Python module (tests/package/).
package-tests: $(BUILD)/deltak $(BUILD)/$(SOFILE)
	@sh tests/package/run.sh "$(MAKE)" $(BUILD) $(PYTHON)

clean:
	rm -rf $(BUILD)

-include $(LIB_OBJ:.o=.d) $(CLI_OBJ:.o=.d) $(FUZZ_OBJ:.o=.d)
