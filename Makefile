# SPDX-License-Identifier: GPL-2.0-or-later
# Seaway Comfort: two commands for a newcomer (`make demo`, `make test`); each installs what is
# missing first (.ci/bootstrap.sh: Debian's QGIS stack + a venv for test-only tools).
SHELL := /bin/bash
PY := .venv/bin/python
PKGROOT := .build/pkgroot
RUNENV := QT_QPA_PLATFORM=offscreen PROJ_DATA=/usr/share/proj PYTHONPATH=$(CURDIR)/$(PKGROOT)
OUT ?= demo_output

.PHONY: help setup test test-core demo bench package i18n clean pkgroot

help:
	@echo "make demo     run the invented demo passage end to end (installs what is missing)"
	@echo "make test     run the whole test suite, QGIS tests included (installs what is missing)"
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
	SEAWAY_REQUIRE_QGIS=1 QT_QPA_PLATFORM=offscreen PROJ_DATA=/usr/share/proj $(PY) -P -m pytest -q

test-core: setup
	QT_QPA_PLATFORM=offscreen PROJ_DATA=/usr/share/proj $(PY) -P -m pytest -q tests/core -p no:pytest_qgis

demo: setup pkgroot
	$(RUNENV) $(PY) -P -m seaway_comfort demo --out "$(OUT)"

bench: setup pkgroot
	@set -e; for b in tests/bench/bench_*.py; do \
	  echo "=== $$b"; $(RUNENV) $(PY) -P $$b; done

package:
	/usr/bin/python3 -P .ci/make_package.py --out dist

i18n: setup
	pylupdate5 -noobsolete $$(git ls-files '*.py' | grep -v '^tests/') -ts i18n/seaway_comfort_de.ts
	lrelease i18n/*.ts

clean:
	rm -rf .build dist .pytest_cache .qgis-settings
