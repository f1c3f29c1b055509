#!/usr/bin/env bash
# SPDX-License-Identifier: GPL-2.0-or-later
# Install what Seaway Comfort needs on Debian 12 (run as root, or as a user with sudo):
# Debian's QGIS and the numpy/scipy/pyproj/shapely/GDAL it is built against, then a venv made
# with --system-site-packages for test-only tools (.venv, or $SEAWAY_VENV: the chroot tests use
# their own). numpy/GDAL are NEVER pip-installed over
# Debian's (that breaks the compiled bindings): a constraints file pins them to Debian's versions.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$here"

APT_PACKAGES=(qgis python3-qgis qgis-providers python3-gdal gdal-bin python3-numpy python3-scipy
              python3-pyproj python3-shapely python3-matplotlib python3-pytest python3-venv
              python3-pip pyqt5-dev-tools qttools5-dev-tools xvfb xauth)
VENV_PACKAGES=("pytest-qgis==5.0.2" "hypothesis>=6.50" "geographiclib>=2.0" "distributed>=2023.1")

if [ "$(id -u)" -eq 0 ]; then SUDO=(); elif command -v sudo >/dev/null 2>&1; then SUDO=(sudo); else SUDO=(); fi

missing=()
for p in "${APT_PACKAGES[@]}"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ "${#missing[@]}" -gt 0 ]; then
    if ! command -v apt-get >/dev/null 2>&1; then
        echo "bootstrap: missing ${missing[*]} and no apt-get here; see README 'Other platforms'." >&2
        exit 1
    fi
    if [ "$(id -u)" -ne 0 ] && [ "${#SUDO[@]}" -eq 0 ]; then
        echo "bootstrap: need root or sudo to install: ${missing[*]}" >&2
        exit 1
    fi
    echo "bootstrap: installing Debian packages: ${missing[*]}"
    start=$(date +%s)
    export DEBIAN_FRONTEND=noninteractive
    "${SUDO[@]}" apt-get update -qq
    "${SUDO[@]}" apt-get install -y -q --no-install-recommends "${missing[@]}"
    echo "bootstrap: apt finished in $(( $(date +%s) - start )) s"
fi

PY=/usr/bin/python3
VENV="${SEAWAY_VENV:-.venv}"
stamp="$VENV/.seaway-bootstrap"
want="$(printf '%s\n' "${VENV_PACKAGES[@]}" | sha1sum | cut -c1-12)"
if [ ! -x "$VENV/bin/python" ] || [ "$(cat "$stamp" 2>/dev/null)" != "$want" ]; then
    echo "bootstrap: creating $VENV (system site packages) with test tools"
    "$PY" -m venv --system-site-packages "$VENV"
    cons="$(mktemp)"
    "$PY" - > "$cons" <<'PYEOF'
import importlib
for mod, dist in (("numpy", "numpy"), ("scipy", "scipy"), ("pyproj", "pyproj"),
                  ("shapely", "shapely"), ("matplotlib", "matplotlib"), ("pytest", "pytest")):
    try:
        print(f"{dist}=={importlib.import_module(mod).__version__}")
    except Exception:
        pass
PYEOF
    "$VENV/bin/python" -m pip install -q --disable-pip-version-check -c "$cons" "${VENV_PACKAGES[@]}"
    rm -f "$cons"
    echo "$want" > "$stamp"
fi
# pyproj inside a venv looks for PROJ data under the venv prefix: point it at Debian's.
if [ -d /usr/share/proj ] && [ ! -e "$VENV/share/proj" ]; then
    mkdir -p "$VENV/share" && ln -s /usr/share/proj "$VENV/share/proj"
fi
"$VENV/bin/python" - <<'PYEOF'
import numpy, osgeo, qgis.core, scipy, pyproj, shapely
pyproj.CRS("EPSG:3857")  # PROJ database reachable
print(f"bootstrap: ok (QGIS {qgis.core.Qgis.QGIS_VERSION}, numpy {numpy.__version__}, "
      f"scipy {scipy.__version__}, GDAL {osgeo.__version__}, pyproj {pyproj.__version__}, "
      f"shapely {shapely.__version__})")
PYEOF
