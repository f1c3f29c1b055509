# SPDX-License-Identifier: GPL-2.0-or-later
"""The standard-library special functions of numerics.py against scipy.special (reference
library, test-time only): Phi(x) against scipy.special.ndtr, log Gamma against
scipy.special.gammaln; the default path imports no scipy (checked in a fresh interpreter)."""
from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import numpy as np
from scipy.special import gammaln, ndtr

from seaway_comfort.processing.core.numerics import log_gamma, normal_cdf


def test_normal_cdf_matches_scipy_ndtr():
    """Relative 2e-14 for -8 <= x <= 9 (conditioning 2 x**2 eps = 1.4e-14 at -8); in the far lower tail the rounding of x itself is
    amplified by the conditioning 2 x**2 (about 3e-13 at x = -37), so 5e-13 there."""
    x = np.concatenate([np.linspace(-37.0, 9.0, 20001), [-np.inf, np.inf, 0.0]])
    ref = ndtr(x)
    got = normal_cdf(x)
    rel = np.abs(got - ref) / np.where(ref > 0, ref, 1.0)
    assert np.max(rel[x >= -8.0]) < 2e-14
    assert np.max(rel[ref > 0]) < 5e-13
    assert got[x == -np.inf][0] == 0.0 and got[x == np.inf][0] == 1.0 and got[x == 0][0] == 0.5


def test_normal_cdf_keeps_shape_and_tabulated_values():
    # Abramowitz & Stegun 1964, Table 26.1: Phi(1) = 0.8413447461, Phi(1.96) = 0.9750021048
    got = normal_cdf(np.array([[1.0, 1.96]]))
    assert got.shape == (1, 2)
    np.testing.assert_allclose(got[0], [0.8413447461, 0.9750021048], rtol=0, atol=1e-10)
    assert normal_cdf(1.0).shape == ()


def test_log_gamma_matches_scipy_gammaln():
    """|difference| <= 1e-14 max(1, |log Gamma|) for 0.5 <= x <= 1e4 (absolute near the zeros
    of log Gamma at x = 1 and 2, relative for large x)."""
    x = np.concatenate([np.linspace(0.5, 50.0, 5001), np.geomspace(50.0, 1e4, 500), [1.0, 2.0, 1.0005]])
    ref = gammaln(x)
    got = log_gamma(x)
    assert np.max(np.abs(got - ref) / np.maximum(1.0, np.abs(ref))) < 1e-14


def test_default_path_imports_no_scipy(tmp_path):
    """api, passage and climate import and assess without pulling in scipy (fresh interpreter),
    once the vessel's strip-theory RAO set is in the cache: building that set (once per profile)
    uses scipy's complex exponential integral; the first run may import scipy, the second not."""
    import seaway_comfort

    pkg_parent = str(Path(seaway_comfort.__file__).resolve().parent.parent)
    link_parent = next((p for p in sys.path if (Path(p or ".") / "seaway_comfort").exists()), pkg_parent)
    code = (
        "import sys\n"
        "from seaway_comfort.processing.core.api import assess_motions\n"
        "from seaway_comfort.processing.core.vessel.profile import builtin_profile\n"
        "import seaway_comfort.processing.core.passage.pipeline\n"
        "import seaway_comfort.processing.core.climate.engine\n"
        "r = assess_motions(builtin_profile('harbour_workboat_12m'), hs_m=[1.0], tp_s=[6.0],\n"
        "                   wave_from_deg=[0.0], course_deg=0.0, speed_m_s=3.0)\n"
        "print('scipy' in sys.modules, float(r.msi_pct[0]) > 0)\n"
    )
    env = {"PYTHONPATH": link_parent, "PATH": "/usr/bin:/bin", "SEAWAY_CACHE_DIR": str(tmp_path / "tables"),
           "SEAWAY_COMFORT_RAO_CACHE": str(tmp_path / "rao")}
    outs = [subprocess.run([sys.executable, "-P", "-c", code], capture_output=True, text=True, env=env, check=False)
            for _ in range(2)]
    assert outs[0].stdout.split()[1:] == ["True"], outs[0].stdout + outs[0].stderr
    assert outs[1].stdout.split() == ["False", "True"], outs[1].stdout + outs[1].stderr
