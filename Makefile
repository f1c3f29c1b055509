# SPDX-License-Identifier: GPL-2.0-or-later
# Seaway Comfort: two commands for a newcomer (`make demo`, `make test`); each installs what is
# missing first (.ci/bootstrap.sh: Debian's QGIS stack + a venv for test-only tools).
SHELL := /bin/bash
# The venv of test tools; the chroot tests (.ci/chroot_test.sh) use their own, .build/venv-SUITE.
SEAWAY_VENV ?= .venv
export SEAWAY_VENV
PY := $(SEAWAY_VENV)/bin/python
PKGROOT := .build/pkgroot
RUNENV := QT_QPA_PLATFORM=offscreen PROJ_DATA=/usr/share/proj PYTHONPATH=$(CURDIR)/$(PKGROOT)
OUT ?= demo_output

.PHONY: help setup test test-core test-trixie test-sid demo bench package i18n clean pkgroot compat

help:
	@echo "make demo     run the invented demo passage end to end (installs what is missing)"
	@echo "make test     run the whole test suite, QGIS tests included (installs what is missing)"
	@echo "make test-trixie  the same suite on Debian 13 / QGIS 3.40 in a chroot (root; CI runs it)"
	@echo "make test-sid     the same suite on Debian unstable in a chroot (root; before a release)"
	@echo "make bench    print benchmark figures against baselines measured in the same run"
	@echo "make package  build dist/seaway_comfort-<version>.zip for 'Install from ZIP'"
	@echo "make i18n     refresh i18n/*.ts from the sources and compile them to .qm"

setup:
	@bash .ci/bootstrap.sh

# The checkout is exposed as the package `seaway_comfort` through a symlink; the repository
# root itself never goes on sys.path (its processing/ would shadow QGIS's own `processing`).
pkgroot:
	@mkdir -p $(PKGROOT) && ln -sfn ../.. $(PKGROOT)/seaway_comfort

test: setup
	SEAWAY_REQUIRE_QGIS=1 QT_QPA_PLATFORM=offscreen PROJ_DATA=/usr/share/proj $(PY) -P -m pytest -q $(PYTEST_ARGS)

# Debian 13 and unstable in a debootstrap chroot under .build/chroot-SUITE (built once, reused).
test-trixie:
	bash .ci/chroot_test.sh trixie

test-sid:
	bash .ci/chroot_test.sh sid

test-core: setup
	QT_QPA_PLATFORM=offscreen PROJ_DATA=/usr/share/proj $(PY) -P -m pytest -q tests/core -p no:pytest_qgis

demo: setup pkgroot
	$(RUNENV) $(PY) -P -m seaway_comfort demo --out "$(OUT)"

# All four algorithms through qgis_process on the demo data (compare folders with
# `tests/compat/four_algorithms.py compare A B`; in the chroot: .ci/chroot_test.sh trixie compat OUT=...).
compat: setup pkgroot
	$(RUNENV) $(PY) -P tests/compat/four_algorithms.py run "$(OUT)"

bench: setup pkgroot
	@set -e; for b in tests/bench/bench_*.py; do \
	  echo "=== $$b"; $(RUNENV) $(PY) -P $$b; done

package:
	/usr/bin/python3 -P .ci/make_package.py --out dist

i18n: setup
	pylupdate5 -noobsolete $$(git ls-files '*.py' | grep -v '^tests/') -ts i18n/seaway_comfort_de.ts
	lrelease i18n/*.ts

# Never delete .build while a chroot test has the checkout or /dev mounted inside it.
clean:
	@if findmnt -rn -o TARGET | grep -qF "$(CURDIR)/.build/"; then \
	  echo "clean: something is mounted under .build (a chroot test running?); not deleting" >&2; \
	  exit 1; fi
	rm -rf .build dist .pytest_cache .qgis-settings
