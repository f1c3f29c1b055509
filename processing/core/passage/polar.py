# SPDX-License-Identifier: GPL-2.0-or-later
"""What to do out there: motions and comfort for every speed x course at one place and time.

The sea state is read ONCE at the point and time with the passage's own sampler
(:func:`.sample.sample_sea_at`), then every (speed, course) pair is one sample of a
:class:`.plan.Track` answered in one call of the passage's own response step
(:func:`.respond.respond_motions`): the same motions, comfort class, class reasons and IMO
MSC.1/Circ.1228 guidance flags as a passage sample with that speed and course (no second copy
of sampling or response).

Speeds default to 0 .. 1.2 x the vessel's service speed in 5 steps; courses every
``heading_step_deg`` from 0 deg true. Every result carries :data:`..flags.CAUTION`.
"""
from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Optional, Sequence, Tuple

import numpy as np
from numpy.typing import NDArray

from ..flags import CAUTION
from ..units import FloatArray
from ..validation import SeawayInputError, as_float_array, show
from .plan import Track, as_utc_datetime64
from .respond import respond_motions
from .sample import DEFAULT_LAND_SEARCH_KM, DEFAULT_TIME_TOLERANCE_S, SeaAtSamples, check_departure_in_forecast, sample_sea_at

__all__ = ["DEFAULT_SPEED_STEPS", "MAX_CELLS", "default_speeds_kn", "parse_speed_list_kn", "courses_deg", "SpeedHeadingResult", "speed_heading"]

DEFAULT_SPEED_STEPS: int = 5
"""Speeds in the default list (0 .. 1.2 x service speed)."""
MAX_CELLS: int = 20_000
"""More speed x course cells than this are refused (a diagram, not a hindcast)."""


def default_speeds_kn(service_speed_kn: float) -> Tuple[float, ...]:
    """0 to 1.2 x service speed [kn] in :data:`DEFAULT_SPEED_STEPS` equal steps (rounded to 0.1 kn)."""
    v = float(service_speed_kn)
    if not np.isfinite(v) or v <= 0:
        raise SeawayInputError(f"service_speed_kn must be a positive number, got {show(service_speed_kn)}")
    return tuple(float(x) for x in np.round(np.linspace(0.0, 1.2 * v, DEFAULT_SPEED_STEPS), 1))


def parse_speed_list_kn(text: str) -> Tuple[float, ...]:
    """Speeds [kn] from comma-separated text ('0, 4.5, 9'); 0 (stopped, lying to) is allowed."""
    out = []
    for part in str(text).split(","):
        try:
            v = float(part.strip())
        except ValueError:
            raise SeawayInputError(f"SPEEDS_KN must be numbers in kn separated by commas, got {show(text)}") from None
        if not (np.isfinite(v) and 0.0 <= v <= 60.0):
            raise SeawayInputError(f"SPEEDS_KN values must lie in 0..60 kn, got {show(part.strip())}")
        out.append(v)
    return tuple(dict.fromkeys(out))


def courses_deg(heading_step_deg: float) -> FloatArray:
    """Courses 0, step, 2 step ... < 360 deg true; the step must be in (0, 180] and divide 360."""
    step = float(heading_step_deg) if isinstance(heading_step_deg, (int, float)) else float("nan")
    n = 360.0 / step if np.isfinite(step) and step > 0 else float("nan")
    if not (np.isfinite(n) and step <= 180.0 and abs(n - round(n)) < 1e-9):
        raise SeawayInputError(f"HEADING_STEP_DEG must divide 360 and lie in (0, 180] deg, got {show(heading_step_deg)}")
    return np.arange(int(round(n))) * step


@dataclass(frozen=True)
class SpeedHeadingResult:
    """One row per (speed, course), speeds outer: ``speed_kn``, ``course_deg``,
    ``rel_heading_deg`` (ITTC, peak component), ``enc_period_s`` (NaN when overtaking),
    ``msi_pct`` (2 h exposure), ``roll_rms_deg``, ``vacc_rms_m_s2``, ``lacc_rms_m_s2``,
    ``comfort_class`` (-1 not computed), ``class_reason``, ``flags`` (SampleFlag masks);
    the grid ``speeds_kn``, ``courses``; the sea at the point (``hs_m``, ``tp_s``,
    ``wave_from_deg``, partitions, ``depth_m``, ``sea_flags``); vessel and station facts;
    ``current_course_deg`` / ``current_speed_kn`` when given."""

    speed_kn: FloatArray
    course_deg: FloatArray
    rel_heading_deg: FloatArray
    enc_period_s: FloatArray
    msi_pct: FloatArray
    roll_rms_deg: FloatArray
    vacc_rms_m_s2: FloatArray
    lacc_rms_m_s2: FloatArray
    comfort_class: NDArray[np.int64]
    class_reason: Tuple[str, ...]
    flags: NDArray[np.int64]
    speeds_kn: Tuple[float, ...]
    courses: FloatArray
    sea: SeaAtSamples
    lon_deg: float
    lat_deg: float
    time_utc: np.datetime64
    vessel_name: str
    length_m: float
    roll_period_s: float
    station_name: str
    task: str
    current_course_deg: Optional[float] = None
    current_speed_kn: Optional[float] = None
    caution: str = field(default=CAUTION)

    @property
    def n(self) -> int:
        return int(self.speed_kn.size)


def _repeat(sea: SeaAtSamples, n: int) -> SeaAtSamples:
    """The one-sample sea repeated n times (every cell meets the same sea)."""
    idx = np.zeros(n, dtype=np.int64)
    arrays = {k: getattr(sea, k)[idx] for k in ("hs_m", "tp_s", "wave_from_deg", "partition_hs_m", "partition_tp_s",
                                                "partition_from_deg", "depth_m", "valid", "flags")}
    return replace(sea, source=tuple(sea.source) * n, **arrays)


def _grid(speeds_kn: Sequence[float], step: float) -> Tuple[Tuple[float, ...], FloatArray]:
    sp = as_float_array("SPEEDS_KN", np.atleast_1d(np.asarray(speeds_kn, dtype=float)))
    if sp.size == 0 or np.any(sp < 0) or np.any(sp > 60.0):
        raise SeawayInputError(f"SPEEDS_KN must hold speeds from 0 to 60 kn, got {show(list(speeds_kn))}")
    crs = courses_deg(step)
    if sp.size * crs.size > MAX_CELLS:
        raise SeawayInputError(f"{sp.size} speeds x {crs.size} courses exceed {MAX_CELLS} cells: "
                               "use fewer speeds or a larger HEADING_STEP_DEG")
    return tuple(float(v) for v in sp), crs


def speed_heading(lon_deg: float, lat_deg: float, time_utc: object, sea_states: Sequence[object], profile: object, *,
                  speeds_kn: Optional[Sequence[float]] = None, heading_step_deg: float = 15.0,
                  station: Optional[str] = None, depth: Optional[object] = None, gamma: float = 3.3,
                  spread_s: float = 4.0, long_crested: bool = False, method: Optional[str] = None,
                  current_course_deg: Optional[float] = None, current_speed_kn: Optional[float] = None,
                  land_search_km: float = DEFAULT_LAND_SEARCH_KM,
                  time_tolerance_s: float = DEFAULT_TIME_TOLERANCE_S) -> SpeedHeadingResult:
    """Motions and comfort for every speed x course at (``lon_deg``, ``lat_deg``, WGS84) and
    ``time_utc`` (module docstring). Bad input raises :class:`SeawayInputError` naming it; a
    point without sea data gives rows without results, flagged."""
    t = as_utc_datetime64("TIME", time_utc)
    check_departure_in_forecast(t, sea_states, time_tolerance_s=time_tolerance_s)
    x, y = (float(as_float_array(k, v)) for k, v in (("POINT longitude", lon_deg), ("POINT latitude", lat_deg)))
    if not -90.0 <= y <= 90.0:
        raise SeawayInputError(f"POINT latitude must lie in -90..90 deg, got {show(lat_deg)}")
    speeds, crs = _grid(default_speeds_kn(profile.service_speed_kn) if speeds_kn is None else speeds_kn,  # type: ignore[attr-defined]
                        heading_step_deg)
    one = Track(lon_deg=np.array([x]), lat_deg=np.array([y]), course_deg=np.zeros(1), speed_kn=np.zeros(1),
                eta_utc=np.array([t], dtype="datetime64[ms]"))
    sea1 = sample_sea_at(one, sea_states, depth=depth, land_search_km=land_search_km, time_tolerance_s=time_tolerance_s)
    sp = np.repeat(np.asarray(speeds), crs.size)
    cr = np.tile(crs, len(speeds))
    n = sp.size
    track = Track(lon_deg=np.full(n, x), lat_deg=np.full(n, y), course_deg=cr, speed_kn=sp,
                  eta_utc=np.full(n, t, dtype="datetime64[ms]"))
    mot = respond_motions(track, _repeat(sea1, n), profile, station=station, gamma=gamma, spread_s=spread_s,
                          long_crested=long_crested, method=method)
    o = mot.outputs
    return SpeedHeadingResult(
        speed_kn=sp, course_deg=cr, rel_heading_deg=mot.rel_heading_deg, enc_period_s=mot.enc_period_s,
        msi_pct=o["msi_pct"], roll_rms_deg=o["roll_rms_deg"], vacc_rms_m_s2=o["vacc_rms_m_s2"],
        lacc_rms_m_s2=o["lacc_rms_m_s2"], comfort_class=mot.comfort_class, class_reason=mot.class_reasons(),
        flags=mot.flags, speeds_kn=speeds, courses=crs, sea=sea1, lon_deg=x, lat_deg=y, time_utc=t,
        vessel_name=str(getattr(profile, "name", "") or ""), length_m=float(profile.length_wl_m),  # type: ignore[attr-defined]
        roll_period_s=float(profile.natural_roll_period_s), station_name=mot.station_name or (station or ""),  # type: ignore[attr-defined]
        task=mot.task, current_course_deg=current_course_deg, current_speed_kn=current_speed_kn,
    )
