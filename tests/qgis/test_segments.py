# SPDX-License-Identifier: GPL-2.0-or-later
"""Segments between consecutive samples are drawn the short way across the antimeridian, in
every output that draws them (routecomfort's segments and seasonalclimate's segments share
``adapters.segment_geometry``).

Reference: longitudes are equivalent modulo 360 degrees and two samples a few nautical miles
apart differ by far less than 180 degrees of longitude (common practice, no source); the
geodesic distance of the test pair comes from geographiclib (WGS84, Karney 2013).
"""
from __future__ import annotations

from types import SimpleNamespace

import numpy as np
import pytest

pytestmark = pytest.mark.qgis
qgis = pytest.importorskip("qgis")

from geographiclib.geodesic import Geodesic  # noqa: E402


def _xs(geom):
    return [p.x() for p in geom.asPolyline()]


def test_segment_geometry_unwraps_both_ways(qgis_app):
    from seaway_comfort.processing.adapters import segment_geometry

    assert _xs(segment_geometry(179.9, 0.0, -179.9, 0.0)) == pytest.approx([179.9, 180.1])
    assert _xs(segment_geometry(-179.9, 0.0, 179.9, 0.0)) == pytest.approx([-179.9, -180.1])
    assert _xs(segment_geometry(10.0, 0.0, 10.5, 0.0)) == pytest.approx([10.0, 10.5])  # no change elsewhere
    # the pair really is 0.2 degrees (about 12 NM) apart, not 359.8
    s12_nm = Geodesic.WGS84.Inverse(0.0, 179.9, 0.0, -179.9)["s12"] / 1852.0
    assert s12_nm == pytest.approx(12.02, abs=0.01)


def test_seasonal_segments_cross_the_antimeridian_the_short_way(qgis_app):
    from seaway_comfort.processing.algorithms.seasonal_climate import segment_features, segment_fields

    months = (6, 7)
    share = np.array([[0.5, 0.6], [0.7, 0.8]])  # (months, segments)
    result = SimpleNamespace(
        lon_deg=np.array([179.8, 179.95, -179.9]), lat_deg=np.array([-17.0, -17.0, -17.0]), n=3, months=months,
        segment_ok_share=lambda: share, exceed_share=np.zeros((2, 3)), segment_index=np.array([0, 0]),
        dist_nm=np.array([0.0, 8.6, 17.2]), max_class=1,
    )
    feats = list(segment_features(result, segment_fields()))
    assert len(feats) == 2
    assert _xs(feats[1].geometry()) == pytest.approx([179.95, 180.1])
    for f in feats:
        xs = _xs(f.geometry())
        assert abs(xs[1] - xs[0]) < 1.0
    assert float(feats[1]["ok_m07"]) == pytest.approx(0.8)
    assert float(feats[1]["ok_sel"]) == pytest.approx(0.7)
