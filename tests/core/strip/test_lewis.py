# SPDX-License-Identifier: GPL-2.0-or-later
"""2-D Lewis-form coefficients (Ursell-Tasai multipoles): exact limits, energy and Haskind
relations, and recalled published values (marked)."""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.motions.strip import lewis

NU = np.array([0.02, 0.2, 0.5, 1.0, 1.5, 2.0, 4.0])


@pytest.fixture(scope="module")
def forms():
    # semicircle R = 1; rectangle B/T = 4 (sigma 1); Wigley-like midship B/T 1.6 sigma 2/3;
    # a fine U-section B/T 2.5 sigma 0.9
    return lewis.lewis_forms([2.0, 12.0, 10.0, 15.0], [1.0, 3.0, 6.25, 6.0],
                             [np.pi / 2, 36.0, 10 * 6.25 * 2 / 3, 0.9 * 90.0])


@pytest.fixture(scope="module")
def coeffs(forms):
    return lewis.section_coefficients(forms, NU)


def test_lewis_forms_keep_beam_draught_area(forms):
    # Lewis (1929) relations B/2 = Ms (1+a1+a3), T = Ms (1-a1+a3),
    # sigma = pi/4 (1 - a1^2 - 3 a3^2)/((1+a3)^2 - a1^2)
    ms, a1, a3 = forms.scale_m, forms.a1, forms.a3
    np.testing.assert_allclose(2 * ms * (1 + a1 + a3), [2, 12, 10, 15], rtol=1e-12)
    np.testing.assert_allclose(ms * (1 - a1 + a3), [1, 3, 6.25, 6], rtol=1e-12)
    sigma = np.pi / 4 * (1 - a1 ** 2 - 3 * a3 ** 2) / ((1 + a3) ** 2 - a1 ** 2)
    np.testing.assert_allclose(sigma, forms.area_coeff, rtol=1e-10)
    assert not forms.clipped.any()


def test_invalid_lewis_form_is_clipped_and_reported():
    # a section with sigma 0.3 at B/T 2 is re-entrant as a Lewis form (conformality check)
    f = lewis.lewis_forms([4.0], [2.0], [0.3 * 8.0])
    assert f.clipped[0] and f.area_coeff[0] > 0.3


def test_semicircle_roll_is_zero(coeffs):
    # every normal of a circle passes through its centre (exact): no roll radiation
    assert np.max(np.abs(coeffs.a44[0])) < 1e-8 and np.max(np.abs(coeffs.b44[0])) < 1e-8
    assert np.max(np.abs(coeffs.a24[0])) < 1e-8


def test_semicircle_high_frequency_heave_limit():
    # omega -> inf: phi = 0 on the free surface, the double body is a full circle in vertical
    # translation: a33 = rho pi R^2 / 2 (exact, e.g. Newman 1977 "Marine Hydrodynamics" ch. 4)
    c = lewis.section_coefficients(lewis.lewis_forms([2.0], [1.0], [np.pi / 2]), [30.0])
    assert c.a33[0, 0] / (np.pi / 2) == pytest.approx(1.0, abs=0.03)


def test_semicircle_low_frequency_sway_limit():
    # omega -> 0: rigid free surface, double body a full circle in horizontal translation:
    # a22 = rho pi R^2 / 2 (exact, same argument)
    c = lewis.section_coefficients(lewis.lewis_forms([2.0], [1.0], [np.pi / 2]), [1e-4])
    assert c.a22[0, 0] / (np.pi / 2) == pytest.approx(1.0, abs=0.03)


def test_lewis_high_frequency_heave_formula(forms):
    # Lewis (1929): a33(inf) = rho (pi/2) Ms^2 ((1 + a1)^2 + 3 a3^2) [from memory, as quoted in
    # Journee & Adegeest 2003]; our value at nu = 30 within 3 %
    c = lewis.section_coefficients(forms, [30.0])
    expected = np.pi / 2 * ((1 + forms.a1) ** 2 + 3 * forms.a3 ** 2)
    np.testing.assert_allclose(c.a33[:, 0], expected, rtol=0.03)


def test_energy_relation(coeffs):
    # b = rho g^2 Abar^2 / omega^3 (radiated power, both sides), non-dimensional b = far^2
    for b, far in ((coeffs.b33, coeffs.far3), (coeffs.b22, coeffs.far2),
                   (coeffs.b44, coeffs.far4)):
        np.testing.assert_allclose(b, far ** 2, rtol=0.01, atol=2e-4)


def test_haskind_relation_beam_seas(coeffs, forms):
    # 2-D Haskind / energy relation (e.g. Newman 1977 ch. 6): b_jj = omega |X_j|^2 / (rho g^2)
    # with X_j the beam-sea exciting force per unit amplitude (Froude-Krylov + diffraction).
    # Non-dimensional (rho = g = Ms = 1, k = nu = omega^2): b_hat = |X_hat|^2.
    nu = NU[None, :, None]
    y, z, wy, wz = (getattr(coeffs, n)[:, None, :] for n in ("y_hat", "z_hat", "wy", "wz"))
    e = np.exp(nu * z + 1j * nu * y)            # mu = 90: e^{kz} e^{i k y}
    omega = np.sqrt(nu)
    kern = e * (-1j * wy - wz)
    fk = {"3": np.sum(e * wy, -1), "2": -np.sum(e * wz, -1),
          "4": np.sum(e * (y * wy + z * wz), -1)}
    for j, b in (("3", coeffs.b33), ("2", coeffs.b22), ("4", coeffs.b44)):
        h = -1j * omega[..., 0] * omega[..., 0] * np.sum(getattr(coeffs, "phi" + j) * kern, -1)
        x = fk[j] + h
        top = np.max(b, axis=1)
        for row in np.flatnonzero(top > 1e-8):   # the semicircle does not roll
            np.testing.assert_allclose(b[row], np.abs(x[row]) ** 2, rtol=0.03,
                                       atol=0.01 * top[row], err_msg=f"mode {j} row {row}")


def test_convergence_in_multipoles(forms):
    # numerical check (no source): 16 vs 30 multipoles agree to 2 % of each curve's maximum
    # (curves that vanish, e.g. the semicircle's roll, are skipped)
    a = lewis.section_coefficients(forms, NU)
    b = lewis.section_coefficients(forms, NU, n_multipoles=30, n_collocation=90)
    for name in ("a33", "b33", "a22", "b22", "a44", "b44"):
        x, y = getattr(a, name), getattr(b, name)
        top = np.max(np.abs(y), axis=1, keepdims=True)
        keep = top[:, 0] > 1e-8
        assert np.max((np.abs(x - y) / top)[keep]) < 2e-2, name
