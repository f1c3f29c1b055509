# SPDX-License-Identifier: GPL-2.0-or-later
"""Hull sections: CSV reading with errors naming file and line, generation from coefficients."""
from __future__ import annotations

import numpy as np
import pytest

from seaway_comfort.processing.core.motions.strip import StripInputError
from seaway_comfort.processing.core.motions.strip.sections import (
    read_sections_csv, sections_from_form)


def _write(tmp_path, rows, header="x_m,beam_m,draught_m,area_m2"):
    p = tmp_path / "hull.csv"
    p.write_text("# my hull\n" + header + "\n" + "\n".join(rows) + "\n", encoding="utf-8")
    return p


def _rows(n=11):
    x = np.linspace(-20, 20, n)
    return [f"{xi},{6.0},{2.0},{9.0}" for xi in x]


def test_reads_good_table(tmp_path):
    sec = read_sections_csv(_write(tmp_path, _rows()))
    assert sec.x_m.size == 11 and sec.length_m == pytest.approx(40.0)
    # trapezoid weights integrate a constant exactly (common practice, no source)
    assert np.sum(sec.integration_weights_m() * sec.area_m2) == pytest.approx(9.0 * 40.0)


@pytest.mark.parametrize("mutate,expect", [
    (lambda r: r[:5], "at least 11"),
    (lambda r: r[:3] + ["-18,6,2,abc"] + r[4:], "line 6: area_m2 'abc' is not a number"),
    (lambda r: r[:3] + [r[2]] + r[4:], "row 4: x_m"),
    (lambda r: r[:2] + ["-10,6,2,13"] + r[3:], "exceeds beam_m * draught_m"),
    (lambda r: r[:2] + ["-10,-6,2,1"] + r[3:], "beam_m = -6"),
])
def test_bad_rows_name_file_and_row(tmp_path, mutate, expect):
    with pytest.raises(StripInputError, match="hull.csv") as err:
        read_sections_csv(_write(tmp_path, mutate(_rows())))
    assert expect in str(err.value)


def test_missing_column_and_missing_file(tmp_path):
    with pytest.raises(StripInputError, match="missing column.*area_m2"):
        read_sections_csv(_write(tmp_path, _rows(), header="x_m,beam_m,draught_m,vol"))
    with pytest.raises(StripInputError, match="nofile.csv: cannot be read"):
        read_sections_csv(tmp_path / "nofile.csv")


def test_error_does_not_echo_other_content(tmp_path):
    rows = _rows()
    rows[4] = "0,6,2,SECRET-TOKEN-VALUE-THAT-IS-LONG"
    with pytest.raises(StripInputError) as err:
        read_sections_csv(_write(tmp_path, rows))
    assert "SECRET-TOKEN-VALUE-THAT-IS-LONG" not in str(err.value)
    assert "my hull" not in str(err.value)


def test_form_generation_reproduces_coefficients():
    # the power-law curves integrate to Cb L B T and Cwp L B (module docstring of sections.py;
    # common-practice construction, no source); trapezoid on 201 stations, 0.5 % tolerance
    sec = sections_from_form(100.0, 16.0, 6.0, 0.70, 0.80, 0.98, n_stations=201)
    w = sec.integration_weights_m()
    assert np.sum(w * sec.area_m2) / (100 * 16 * 6) == pytest.approx(0.70, rel=5e-3)
    assert np.sum(w * sec.beam_m) / (100 * 16) == pytest.approx(0.80, rel=5e-3)


@pytest.mark.parametrize("kwargs,expect", [
    (dict(block_coeff=0.9, midship_coeff=0.8), "prismatic"),
    (dict(waterplane_coeff=0.5), "waterplane_coeff = 0.5"),
    (dict(beam_m=float("nan")), "beam_m"),
])
def test_form_generation_rejects_bad_input(kwargs, expect):
    args = dict(length_m=50.0, beam_m=10.0, draught_m=3.0, block_coeff=0.6,
                waterplane_coeff=0.75, midship_coeff=0.95)
    args.update(kwargs)
    with pytest.raises(StripInputError, match=expect):
        sections_from_form(**args)
