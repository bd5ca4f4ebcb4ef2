# headroom — build, test, demo and benchmark.
#
#   make          build build/headroom (installs missing Debian packages first)
#   make demo     build and render the demo calc packages in examples/
#   make check    build with AddressSanitizer + UBSan and run every test
#   make bench    benchmarks (not tests): timing and peak memory
#   make fuzz     libFuzzer targets, FUZZ_SECONDS (300) each; fuzz-short: 30 s
#   make install  PREFIX=/usr/local DESTDIR=

PREFIX  ?= /usr/local
VERSION := 0.1.0
CC      ?= cc
BUILD   := build

# Debian packages the build, the tests and the reference checks need.
DEB_PACKAGES := libcmark-gfm-dev libcmark-gfm-extensions-dev libhpdf-dev libyaml-dev \
                libjansson-dev nettle-dev fonts-dejavu-core libcmocka-dev pkg-config \
                units python3-fluids python3-iapws python3-scipy poppler-utils qpdf \
                icc-profiles-free python3-pikepdf \
                clang libclang-rt-14-dev neovim vim zsh fish libsuitesparse-dev

PKGS    := libcmark-gfm jansson nettle yaml-0.1
WARN    := -std=c11 -Wall -Wextra -Wshadow -Wconversion -Wstrict-prototypes \
           -Wno-sign-conversion -Wmissing-prototypes -Werror=implicit-function-declaration
CFLAGS  ?= -O2 -g
ALL_CFLAGS = $(WARN) $(CFLAGS) -D_POSIX_C_SOURCE=200809L -DHEADROOM_VERSION='"$(VERSION)"' \
             -Iinclude -Isrc $(shell pkg-config --cflags $(PKGS) 2>/dev/null)
# CHOLMOD (SuiteSparse) has no pkg-config file in Debian 12: its headers are
# included as <suitesparse/cholmod.h>. libharu and CHOLMOD (with BLAS, LAPACK
# and the Fortran run-time behind it) are not linked: src/dynload.c loads
# them at the first PDF build or network solve, by the shared-object names
# (SONAME) of the libraries the compiler would link, so a `check` starts
# without them. The small libraries every run needs (cmark-gfm, libyaml,
# jansson, nettle) are linked statically, which saves mapping and relocating
# them at start-up.
soname   = $(shell f=$$($(CC) -print-file-name=$(1)); readelf -d "$$f" 2>/dev/null | sed -n 's/.*SONAME.*\[\(.*\)\]/\1/p')
HPDF_SONAME    := $(call soname,libhpdf.so)
CHOLMOD_SONAME := $(call soname,libcholmod.so)
ALL_CFLAGS += $(if $(HPDF_SONAME),-DHPDF_SONAME='"$(HPDF_SONAME)"') \
              $(if $(CHOLMOD_SONAME),-DCHOLMOD_SONAME='"$(CHOLMOD_SONAME)"')
LIBS    = -Wl,-Bstatic -lcmark-gfm-extensions -lcmark-gfm -lyaml -ljansson -lnettle -Wl,-Bdynamic \
          -lm -ldl -lpthread

# The program is linked at a fixed address: a position-independent one has
# 4,300 relocations to apply (its tables are mostly pointers) and copies the
# pages they touch, a fifth of the start-up of a check of a one-line calc
# (issue 17). The libraries it loads are still placed at random.
NO_PIE  := -fno-pie
SAN     := -fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined
# Linked as a fixed-address executable with the sanitizer run-times inside:
# the tests start the sanitizer build thousands of times, and linked as a
# position-independent one with the run-times as shared libraries, a short
# run spent about a quarter of its CPU time more, on 2 MB of relocations and
# loading the libraries.
SAN_LINK := $(SAN) -no-pie -static-libasan -static-libubsan

SRC      := $(wildcard src/*.c src/methods/*.c src/report/*.c)
LIB_SRC  := $(filter-out src/main.c,$(SRC))
OBJ      := $(SRC:%.c=$(BUILD)/obj/%.o)
SAN_OBJ  := $(SRC:%.c=$(BUILD)/san/%.o)
SAN_LIB_OBJ := $(LIB_SRC:%.c=$(BUILD)/san/%.o)
UNIT_TESTS := $(patsubst tests/unit/%.c,$(BUILD)/tests/%,$(wildcard tests/unit/test_*.c))

# libFuzzer targets (fuzz/fuzz_NAME.c -> build/fuzz/fuzz_NAME), built with clang.
FUZZ_CC      ?= clang
FUZZ_SECONDS ?= 300
FUZZ_SAN     := -fsanitize=address,undefined -fno-sanitize-recover=undefined -fno-omit-frame-pointer
FUZZ_OBJ     := $(LIB_SRC:%.c=$(BUILD)/fuzz/obj/%.o)
FUZZ_NAMES   := $(patsubst fuzz/fuzz_%.c,%,$(wildcard fuzz/fuzz_*.c))
FUZZ_BINS    := $(FUZZ_NAMES:%=$(BUILD)/fuzz/fuzz_%)
# The same targets linked with fuzz/replay.c and the sanitizer objects above
# (gcc, no libFuzzer): `make check` replays the seeds and regression inputs
# through these, so it does not compile the tree a third time.
REPLAY_OBJ   := $(BUILD)/san/fuzz/replay.o
REPLAY_BINS  := $(FUZZ_NAMES:%=$(BUILD)/san/replay-%)

.PHONY: all deps demo check unit-tests bench install clean
all: $(BUILD)/headroom

# Install what is missing, once. As root with apt it installs; otherwise it
# prints the one command to run.
$(BUILD)/.deps:
	@mkdir -p $(BUILD)
	@missing=""; for p in $(DEB_PACKAGES); do \
	  dpkg-query -W -f='$${Status}' $$p 2>/dev/null | grep -q 'install ok installed' || missing="$$missing $$p"; \
	done; \
	if [ -n "$$missing" ]; then \
	  if [ "$$(id -u)" = 0 ] && command -v apt-get >/dev/null; then \
	    echo "installing:$$missing"; \
	    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends $$missing; \
	  else \
	    echo "missing Debian packages; run:"; echo "  sudo apt-get install$$missing"; exit 1; \
	  fi; \
	fi
	@touch $@
deps: $(BUILD)/.deps

$(BUILD)/obj/%.o: %.c | $(BUILD)/.deps
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) $(NO_PIE) -MMD -MP -c $< -o $@

$(BUILD)/san/%.o: %.c | $(BUILD)/.deps
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -O1 $(SAN) -MMD -MP -c $< -o $@

$(BUILD)/headroom: $(OBJ)
	$(CC) $(CFLAGS) -no-pie $^ -o $@ $(LIBS)

$(BUILD)/san/headroom: $(SAN_OBJ)
	$(CC) $(SAN_LINK) $^ -o $@ $(LIBS)

$(BUILD)/san/replay-%: $(BUILD)/san/fuzz/fuzz_%.o $(REPLAY_OBJ) $(SAN_LIB_OBJ)
	$(CC) $(SAN_LINK) $^ -o $@ $(LIBS)

$(BUILD)/tests/%: tests/unit/%.c $(SAN_LIB_OBJ)
	@mkdir -p $(dir $@)
	$(CC) $(ALL_CFLAGS) -O1 $(SAN_LINK) $< $(SAN_LIB_OBJ) -o $@ $(LIBS) -lcmocka

# The report's fixed texts, compiled in from templates/ (the output is committed).
src/starters.inc: $(wildcard templates/starters/*.calc.md templates/starters/package/*.calc.md) templates/gen-starters.sh
	templates/gen-starters.sh > $@

src/report/pdf_texts.inc: templates/cautions.md templates/gen-texts.sh
	sh templates/gen-texts.sh > $@

# The objects that include them say so here: on a first build there is no .d
# file yet to say it, so the committed .inc would be compiled in even where
# its templates are newer, and the next make (make install in the tests,
# while other suites run the program) would make it again and relink.
$(BUILD)/obj/src/main.o $(BUILD)/san/src/main.o: src/starters.inc
$(BUILD)/obj/src/report/cautions.o $(BUILD)/san/src/report/cautions.o \
  $(BUILD)/fuzz/obj/src/report/cautions.o: src/report/pdf_texts.inc

unit-tests: $(UNIT_TESTS)
	@set -e; for t in $(UNIT_TESTS); do echo "== $$t"; $$t; done

# Each example: the text listing, the PDF report and PNG previews of its
# sheets (pdftoppm), all under build/demo/.
demo: $(BUILD)/headroom
	@mkdir -p $(BUILD)/demo
	@set -e; for f in examples/*.calc.md examples/*/index.calc.md; do \
	  base=$$(basename $$f .calc.md); \
	  [ "$$base" != index ] || base=$$(basename $$(dirname $$f)); \
	  echo "== $$f"; \
	  $(BUILD)/headroom check $$f || [ $$? -eq 1 ]; \
	  $(BUILD)/headroom build $$f --format text -o $(BUILD)/demo/$$base.txt; \
	  $(BUILD)/headroom build $$f -o $(BUILD)/demo/$$base.pdf; \
	  rm -f $(BUILD)/demo/$$base-*.png; \
	  pdftoppm -png -r 80 $(BUILD)/demo/$$base.pdf $(BUILD)/demo/$$base 2>/dev/null; \
	  echo "   $(BUILD)/demo/$$base.txt, $(BUILD)/demo/$$base.pdf ($$(ls $(BUILD)/demo/$$base-*.png | wc -l) page previews)"; \
	done

check: $(BUILD)/headroom $(BUILD)/san/headroom $(UNIT_TESTS) $(REPLAY_BINS)
	@HEADROOM=$(BUILD)/san/headroom HEADROOM_FAST=$(BUILD)/headroom BUILD=$(BUILD) tests/run-all

bench: $(BUILD)/headroom
	@BUILD=$(BUILD) bench/run

install: $(BUILD)/headroom
	install -d $(DESTDIR)$(PREFIX)/bin
	install -m 755 $(BUILD)/headroom $(DESTDIR)$(PREFIX)/bin/headroom
	install -d $(DESTDIR)$(PREFIX)/share/man/man1
	install -m 644 doc/headroom.1 $(DESTDIR)$(PREFIX)/share/man/man1/headroom.1
	install -d $(DESTDIR)$(PREFIX)/share/bash-completion/completions \
	  $(DESTDIR)$(PREFIX)/share/zsh/site-functions $(DESTDIR)$(PREFIX)/share/fish/vendor_completions.d
	install -m 644 editors/completion/headroom.bash $(DESTDIR)$(PREFIX)/share/bash-completion/completions/headroom
	install -m 644 editors/completion/_headroom $(DESTDIR)$(PREFIX)/share/zsh/site-functions/_headroom
	install -m 644 editors/completion/headroom.fish $(DESTDIR)$(PREFIX)/share/fish/vendor_completions.d/headroom.fish
	for d in share/vim/vimfiles share/nvim/site; do \
	  install -d $(DESTDIR)$(PREFIX)/$$d/syntax $(DESTDIR)$(PREFIX)/$$d/ftdetect && \
	  install -m 644 editors/vim/syntax/headroom.vim $(DESTDIR)$(PREFIX)/$$d/syntax/headroom.vim && \
	  install -m 644 editors/vim/ftdetect/headroom.vim $(DESTDIR)$(PREFIX)/$$d/ftdetect/headroom.vim || exit 1; \
	done
	install -d $(DESTDIR)$(PREFIX)/share/headroom/textmate
	install -m 644 editors/textmate/headroom-calc.tmLanguage.json $(DESTDIR)$(PREFIX)/share/headroom/textmate/

clean:
	rm -rf $(BUILD)

# ---- fuzzing (fuzz/): libFuzzer targets built with clang ---------------------
# The library sources are compiled again with clang into build/fuzz/obj with
# coverage for libFuzzer, AddressSanitizer and UBSan; each target links them.
# tests/fuzz/run seeds build/fuzz/corpus-NAME from the examples and the test
# corpora, runs each target and replays tests/fuzz-regress/.

$(BUILD)/fuzz/obj/%.o: %.c | $(BUILD)/.deps
	@mkdir -p $(dir $@)
	$(FUZZ_CC) $(ALL_CFLAGS) -O1 -g $(FUZZ_SAN) -fsanitize=fuzzer-no-link -MMD -MP -c $< -o $@

$(BUILD)/fuzz/fuzz_%: fuzz/fuzz_%.c $(FUZZ_OBJ)
	$(FUZZ_CC) $(ALL_CFLAGS) -O1 -g $(FUZZ_SAN) -fsanitize=fuzzer $< $(FUZZ_OBJ) -o $@ $(LIBS)

.PHONY: fuzz fuzz-short fuzz-build
.SECONDARY: $(FUZZ_OBJ) $(FUZZ_NAMES:%=$(BUILD)/san/fuzz/fuzz_%.o) $(REPLAY_OBJ)
fuzz-build: $(FUZZ_BINS)
fuzz: $(FUZZ_BINS) $(BUILD)/san/headroom
	@FUZZ_SECONDS=$(FUZZ_SECONDS) BUILD=$(BUILD) HEADROOM=$(BUILD)/san/headroom tests/fuzz/run
fuzz-short: $(FUZZ_BINS) $(BUILD)/san/headroom
	@FUZZ_SECONDS=30 BUILD=$(BUILD) HEADROOM=$(BUILD)/san/headroom tests/fuzz/run

-include $(FUZZ_OBJ:.o=.d)

-include $(OBJ:.o=.d) $(SAN_OBJ:.o=.d) $(FUZZ_NAMES:%=$(BUILD)/san/fuzz/fuzz_%.d) $(REPLAY_OBJ:.o=.d)
