# SPDX-License-Identifier: GPL-2.0-or-later
"""The comfort palette stays distinct over bathymetry blues and for colour-blind readers.

Method (each step written out here, sources beside them):
- sRGB <-> linear light and linear RGB -> CIE XYZ (D65): IEC 61966-2-1:1999 (sRGB).
- XYZ -> CIELAB and the CIE76 colour difference dE*ab: CIE 15:2004, section 8.2.1.
- Colour-vision deficiency: the simulation matrices of Machado, Oliveira & Fernandes (2009), "A
  Physiologically-based Model for Simulation of Color Vision Deficiency", IEEE TVCG 15(6),
  severity 1.0 (deuteranopia, protanopia), applied in linear RGB; the numbers are those of the
  authors' published table (the same values colorspacious 1.1.2 ships, compared when written).
- Depth colours: the 9-step "Blues" sequence of ColorBrewer (Brewer 2002, colorbrewer2.org), the
  ramp QGIS offers as "Blues" and the demo uses for depth, plain and at 55 % opacity over white
  (the demo's depth layer opacity).
Thresholds: dE76 ~ 2.3 is a just-noticeable difference (Sharma 2003, Digital Color Imaging
Handbook, from memory); 10 is common practice for "clearly different at a glance, no source";
we ask 20 against the blues (a line drawn over them) and 12 between classes.
"""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.reports.palette import COMFORT_PALETTE, NOT_COMPUTED_COLOUR

BLUES = ("#f7fbff", "#deebf7", "#c6dbef", "#9ecae1", "#6baed6", "#4292c6", "#2171b5", "#08519c", "#08306b")
MACHADO = {
    "normal": np.eye(3),
    "deuteranopia": np.array([[0.367322, 0.860646, -0.227968],
                              [0.280085, 0.672501, 0.047413],
                              [-0.011820, 0.042940, 0.968881]]),
    "protanopia": np.array([[0.152286, 1.052583, -0.204868],
                            [0.114503, 0.786281, 0.099216],
                            [-0.003882, -0.048116, 1.051998]]),
}
SRGB_TO_XYZ = np.array([[0.4124, 0.3576, 0.1805], [0.2126, 0.7152, 0.0722], [0.0193, 0.1192, 0.9505]])
WHITE_D65 = np.array([0.9505, 1.0, 1.089])


def _rgb(hex_colour: str) -> np.ndarray:
    return np.array([int(hex_colour[i:i + 2], 16) for i in (1, 3, 5)]) / 255.0


def _linear(rgb: np.ndarray) -> np.ndarray:
    return np.where(rgb <= 0.04045, rgb / 12.92, ((rgb + 0.055) / 1.055) ** 2.4)


def _lab(linear_rgb: np.ndarray) -> np.ndarray:
    t = (SRGB_TO_XYZ @ np.clip(linear_rgb, 0.0, 1.0)) / WHITE_D65
    f = np.where(t > (6 / 29) ** 3, np.cbrt(t), t / (3 * (6 / 29) ** 2) + 4 / 29)
    return np.array([116 * f[1] - 16, 500 * (f[0] - f[1]), 200 * (f[1] - f[2])])


def _seen(hex_colour: str, vision: str, opacity: float = 1.0) -> np.ndarray:
    """CIELAB of a colour (blended over white at ``opacity`` in sRGB, as a map renderer does)."""
    rgb = opacity * _rgb(hex_colour) + (1.0 - opacity)
    return _lab(MACHADO[vision] @ _linear(rgb))


def _de(a: np.ndarray, b: np.ndarray) -> float:
    return float(np.linalg.norm(a - b))


def test_lab_of_known_colours():
    # CIE 15:2004: sRGB white is L* 100, a* = b* = 0; pure sRGB red is about L* 53.2, a* 80.1, b* 67.2
    # (the values every sRGB/CIELAB table gives, e.g. Lindbloom's calculator; from memory)
    assert _seen("#ffffff", "normal") == pytest.approx([100.0, 0.0, 0.0], abs=0.05)
    assert _seen("#ff0000", "normal") == pytest.approx([53.24, 80.09, 67.20], abs=0.2)


@pytest.mark.parametrize("vision", list(MACHADO))
def test_classes_stay_off_the_depth_blues(vision):
    for c, colour in enumerate(COMFORT_PALETTE):
        for blue in BLUES:
            for opacity in (1.0, 0.55):
                d = _de(_seen(colour, vision), _seen(blue, vision, opacity))
                assert d >= 20.0, (vision, c, colour, blue, opacity, round(d, 1))


@pytest.mark.parametrize("vision", list(MACHADO))
def test_classes_apart_and_ordered_by_lightness(vision):
    labs = [_seen(c, vision) for c in COMFORT_PALETTE]
    for i in range(len(labs)):
        for j in range(i + 1, len(labs)):
            assert _de(labs[i], labs[j]) >= 12.0, (vision, i, j)
    lightness = [lab[0] for lab in labs]
    assert all(a - b >= 10.0 for a, b in zip(lightness, lightness[1:])), lightness  # light -> dark
    grey = _seen(NOT_COMPUTED_COLOUR, vision)
    assert min(_de(grey, lab) for lab in labs) >= 12.0
