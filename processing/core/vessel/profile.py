# SPDX-License-Identifier: GPL-2.0-or-later
"""Vessel profiles: hull particulars, stability, comfort stations; JSON load/save; examples.

A :class:`VesselProfile` holds what the motion models need (waterline length, beam, draught,
block and waterplane coefficients, metacentric height or natural roll period, roll damping,
service speed) plus named :class:`Station` points where people work or rest.

Axes (ship-fixed, origin at midships on the waterline, common practice, no source):
``x_m`` forward of midships, ``y_m`` to starboard, ``z_m`` above the waterline.

File format (our own, versioned JSON; read with :func:`json.load` only, no code execution)::

    {"format": "seaway-comfort-vessel", "format_version": 1,
     "name": "...", "length_wl_m": 12.0, "beam_m": 4.2, "draught_m": 1.1,
     "block_coeff": 0.46, "waterplane_coeff": 0.72, "gm_m": 0.9, "roll_period_s": null,
     "roll_damping_ratio": 0.1, "service_speed_kn": 9.0, "description": "...",
     "rao_table": null, "hull_sections": null, "motion_model": "strip",
     "roll_gyradius_m": null, "pitch_gyradius_m": null,
     "stations": [{"name": "helm", "x_m": 1.0, "y_m": 0.0, "z_m": 2.0,
                   "task": "light_manual_work"}]}

``rao_table`` is an optional path to a response-table CSV (see :mod:`.rao_table`), relative to
the JSON file. ``task`` (optional) selects the default seakeeping criterion of a station
(:mod:`.criteria`). Keys added later, all optional (files without them read as before):
``hull_sections`` a CSV of hull sections (columns x_m, beam_m, draught_m, area_m2, >= 11 rows
sorted by x_m; relative to the JSON file; read by :mod:`..motions.strip.sections`);
``motion_model`` "strip" (default, strip theory) or "closed_form" (the quick fallback);
``roll_gyradius_m`` / ``pitch_gyradius_m`` radii of gyration about G [m] (defaults in
:mod:`..motions.strip_transfer`). ``roll_damping_ratio``: an explicit JSON ``null`` asks the
strip model for Ikeda's component estimate; a missing key keeps the old default 0.10.
"""
from __future__ import annotations

import json
import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Dict, List, Mapping, Optional, Tuple, Union

from ..validation import SeawayInputError, show

__all__ = [
    "FORMAT_NAME",
    "FORMAT_VERSION",
    "Station",
    "VesselProfile",
    "estimate_waterplane_coeff",
    "profile_from_dict",
    "profile_to_dict",
    "load_vessel_profile",
    "save_vessel_profile",
    "builtin_profile_names",
    "builtin_profile",
    "resolve_vessel",
    "BUILTIN_DIR",
]

FORMAT_NAME = "seaway-comfort-vessel"
FORMAT_VERSION = 1
BUILTIN_DIR = Path(__file__).parent / "examples"

DEFAULT_TASK = "light_manual_work"
# Kept in step with criteria.NORDFORSK_TASKS (checked by tests/core/test_vessel.py).
_KNOWN_TASKS = (
    "light_manual_work",
    "heavy_manual_work",
    "intellectual_work",
    "transit_passengers",
    "cruise_liner",
)

MOTION_MODELS = ("strip", "closed_form")
"""Accepted ``motion_model`` values; the first is the default."""
IS_CODE_MIN_LENGTH_M = 24.0
"""IMO 2008 IS Code (Res. MSC.267(85)) applies to ships of 24 m in length and over (Part A 1.2)."""

CB_MIN, CB_MAX = 0.35, 1.0
"""Accepted block-coefficient range (the closed-form motion model is built for this range)."""

FIELD_RANGES: Dict[str, Tuple[float, float, str]] = {
    "length_wl_m": (1.0, 500.0, "the longest ships ever built measure about 460 m (from memory)"),
    "beam_m": (0.3, 80.0, "the widest ships measure about 60-70 m (from memory)"),
    "draught_m": (0.1, 30.0, "the deepest-draught tankers draw about 25-30 m (from memory)"),
    "roll_period_s": (1.0, 60.0, "small craft roll in about 2-4 s, large ships in 10-30 s "
                                 "(common practice, no source)"),
    "service_speed_kn": (0.0, 80.0, "the fastest craft in commercial service make about 40-60 kn "
                                    "(common practice, no source)"),
}
"""Impossible outside [low, high] (low excluded for the speed): field -> (low, high, reason)."""
GM_DOUBT_LOW_M = 0.15
"""Doubtful below: the IMO 2008 IS Code, Part A 2.2.4, asks initial GM >= 0.15 m (from memory)."""
FROUDE_DOUBT = 0.6
"""Doubtful above: a service Froude number U / sqrt(g L) beyond about 0.6 is planing, outside
the displacement-hull motion models (common practice, no source)."""


def estimate_waterplane_coeff(block_coeff: float) -> float:
    """Waterplane-area coefficient estimated from the block coefficient.

    Cwp = (1 + 2 Cb) / 3, a common preliminary-design estimate for ships with U-shaped
    sections (as given in Schneekluth & Bertram 1998, "Ship Design for Efficiency and
    Economy", 2nd ed., ch. 1; from memory). Dimensionless; Cb in [0.35, 1] gives Cwp in
    [0.567, 1].
    """
    return (1.0 + 2.0 * float(block_coeff)) / 3.0


def _err(source: str, msg: str) -> SeawayInputError:
    return SeawayInputError(f"{source}: {msg}" if source else msg)


def _num(source: str, fname: str, value: Any) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise _err(source, f"{fname} must be a number, got {show(value)}")
    v = float(value)
    if not math.isfinite(v):
        raise _err(source, f"{fname} must be finite, got {show(value)}")
    return v


@dataclass(frozen=True)
class Station:
    """A named point on board where motions are evaluated.

    ``x_m`` forward of midships, ``y_m`` to starboard, ``z_m`` above the waterline [m];
    ``task`` names the default seakeeping criterion (see :mod:`.criteria`).
    """

    name: str
    x_m: float
    y_m: float = 0.0
    z_m: float = 0.0
    task: str = DEFAULT_TASK

    def __post_init__(self) -> None:
        if not isinstance(self.name, str) or not self.name.strip():
            raise SeawayInputError(f"station name must be a non-empty string, got {show(self.name)}")
        for fname in ("x_m", "y_m", "z_m"):
            object.__setattr__(self, fname, _num("", f"station {show(self.name)} {fname}", getattr(self, fname)))
        if self.task not in _KNOWN_TASKS:
            raise SeawayInputError(
                f"station {show(self.name)} task must be one of {', '.join(_KNOWN_TASKS)}; got {show(self.task)}"
            )


@dataclass(frozen=True)
class VesselProfile:
    """Hull particulars and comfort stations of one vessel (SI units, knots for speed).

    Fields
    ------
    name : profile name.
    length_wl_m, beam_m, draught_m : waterline length L, moulded beam B, mean draught T [m].
    block_coeff : Cb in [0.35, 1.0].
    waterplane_coeff : Cwp in [Cb, 1]; ``None`` = :func:`estimate_waterplane_coeff`.
    gm_m : transverse metacentric height GM [m] > 0 (corrected for free surface).
    roll_period_s : natural roll period [s]; ``None`` = IMO 2008 IS Code estimate from GM
        (:func:`.roll_period.imo_roll_period_s`). One of gm_m / roll_period_s is required.
    roll_damping_ratio : roll damping as a fraction of critical, in (0, 1) (default 0.10);
        ``None`` = Ikeda's component estimate (strip model; the closed form then uses 0.10).
    service_speed_kn : service speed through the water [kn], > 0.
    stations : tuple of :class:`Station` (at least one, unique names, inside the hull).
    description : free text.
    rao_table : optional CSV path (relative to ``base_dir`` when that is set).
    hull_sections : optional hull-sections CSV path (relative to ``base_dir``).
    motion_model : "strip" (default) or "closed_form".
    roll_gyradius_m, pitch_gyradius_m : radii of gyration about G [m], > 0, or None.
    base_dir : folder the profile was loaded from (not compared, not saved).

    Validation rules (errors name the field and value): B <= L, T > 0, T <= B, Cb in
    [0.35, 1.0], GM > 0, stations within |x| <= L/2, |y| <= B/2 and -T <= z <= L/2 + B
    (our own plausibility bound for masts/flybridges).
    """

    name: str
    length_wl_m: float
    beam_m: float
    draught_m: float
    block_coeff: float
    stations: Tuple[Station, ...]
    gm_m: Optional[float] = None
    roll_period_s: Optional[float] = None
    waterplane_coeff: Optional[float] = None
    roll_damping_ratio: Optional[float] = 0.10
    service_speed_kn: float = 10.0
    description: str = ""
    rao_table: Optional[str] = None
    hull_sections: Optional[str] = None
    motion_model: str = "strip"
    roll_gyradius_m: Optional[float] = None
    pitch_gyradius_m: Optional[float] = None
    base_dir: Optional[str] = field(default=None, compare=False)

    def __post_init__(self) -> None:
        src = f"vessel {show(self.name)}"
        if not isinstance(self.name, str) or not self.name.strip():
            raise SeawayInputError(f"vessel name must be a non-empty string, got {show(self.name)}")
        for fname in ("length_wl_m", "beam_m", "draught_m", "block_coeff", "service_speed_kn"):
            object.__setattr__(self, fname, _num(src, fname, getattr(self, fname)))
        for fname in ("gm_m", "roll_period_s", "waterplane_coeff", "roll_damping_ratio",
                      "roll_gyradius_m", "pitch_gyradius_m"):
            v = getattr(self, fname)
            if v is not None:
                object.__setattr__(self, fname, _num(src, fname, v))
        self._check_hull(src)
        self._check_stability(src)
        self._check_ranges(src)
        object.__setattr__(self, "stations", tuple(self.stations))
        self._check_stations(src)
        self._check_model(src)

    def _check_model(self, src: str) -> None:
        """File keys are non-empty strings or None; motion model known; radii of gyration > 0."""
        for fname in ("rao_table", "hull_sections"):
            v = getattr(self, fname)
            if v is not None and (not isinstance(v, str) or not v):
                raise _err(src, f"{fname} must be a non-empty path string or null, got {show(v)}")
        if self.motion_model not in MOTION_MODELS:
            raise _err(src, f"motion_model must be one of {', '.join(MOTION_MODELS)}, got {show(self.motion_model)}")
        for fname in ("roll_gyradius_m", "pitch_gyradius_m"):
            v = getattr(self, fname)
            if v is not None and v <= 0:
                raise _err(src, f"{fname} must be > 0 (a radius of gyration in metres) or null, got {show(v)}")

    def _check_ranges(self, src: str) -> None:
        """FIELD_RANGES, and GM no larger than the hydrostatic bound KB + BM with KG >= 0:
        GM <= T + B^2 / (12 Cb T), since KB <= T and BM = I_T / V <= (L B^3 / 12) / (Cb L B T)
        (the waterplane's transverse inertia is at most that of its L x B rectangle; textbook
        hydrostatics, e.g. Rawson & Tupper, Basic Ship Theory, ch. 3, from memory) [m]."""
        for fname, (lo, hi, why) in FIELD_RANGES.items():
            v = getattr(self, fname)
            if v is not None and (v > hi or v < lo or (fname == "service_speed_kn" and v <= lo)):
                raise _err(src, f"{fname} = {show(v)} is not plausible (allowed {lo:g} to {hi:g}: {why})")
        if self.gm_m is not None and self.draught_m > 0 and self.block_coeff > 0:
            gm_max = self.draught_m + self.beam_m ** 2 / (12.0 * self.block_coeff * self.draught_m)
            if self.gm_m > gm_max:
                raise _err(src, f"gm_m = {show(self.gm_m)} is impossible for this hull: GM cannot exceed "
                                f"T + B^2 / (12 Cb T) = {gm_max:.3g} m (KB + BM with G above the keel)")

    def doubts(self) -> List[str]:
        """Possible but doubtful values, one line each (shown as warnings; none refuse the profile)."""
        out = []
        if self.gm_m is not None and self.gm_m < GM_DOUBT_LOW_M:
            out.append(f"gm_m = {self.gm_m:g} m is below the IMO 2008 IS Code minimum of {GM_DOUBT_LOW_M:g} m")
        fn = self.service_speed_kn * 1852.0 / 3600.0 / math.sqrt(9.80665 * self.length_wl_m)
        if fn > FROUDE_DOUBT:
            out.append(f"service speed {self.service_speed_kn:g} kn is a Froude number of {fn:.2f} "
                       f"(> {FROUDE_DOUBT:g}: planing, outside the motion models)")
        if not 2.0 <= self.length_wl_m / self.beam_m <= 12.0:
            out.append(f"L/B = {self.length_wl_m / self.beam_m:.2f} is outside 2-12, common for monohulls "
                       "(common practice, no source)")
        return out

    def _check_hull(self, src: str) -> None:
        """L > 0, 0 < B <= L, 0 < T <= B, Cb in [CB_MIN, CB_MAX], Cwp in [Cb, 1]."""
        L, B, T = self.length_wl_m, self.beam_m, self.draught_m
        if L <= 0:
            raise _err(src, f"length_wl_m must be > 0, got {show(L)}")
        if B <= 0:
            raise _err(src, f"beam_m must be > 0, got {show(B)}")
        if B > L:
            raise _err(src, f"beam_m ({show(B)}) must not exceed length_wl_m ({show(L)})")
        if T <= 0:
            raise _err(src, f"draught_m must be > 0, got {show(T)}")
        if T > B:
            raise _err(src, f"draught_m ({show(T)}) must not exceed beam_m ({show(B)})")
        if not CB_MIN <= self.block_coeff <= CB_MAX:
            raise _err(src, f"block_coeff must lie in [{CB_MIN}, {CB_MAX}], got {show(self.block_coeff)}")
        if self.waterplane_coeff is not None and not (
            self.block_coeff <= self.waterplane_coeff <= 1.0
        ):
            raise _err(
                src,
                f"waterplane_coeff must lie in [block_coeff={show(self.block_coeff)}, 1.0], "
                f"got {show(self.waterplane_coeff)}",
            )

    def _check_stability(self, src: str) -> None:
        """GM or roll period given and > 0, roll damping in (0, 1), service speed > 0."""
        if self.gm_m is None and self.roll_period_s is None:
            raise _err(src, "one of gm_m or roll_period_s is required, got neither")
        if self.gm_m is not None and self.gm_m <= 0:
            raise _err(src, f"gm_m must be > 0 (a vessel with GM <= 0 is unstable), got {show(self.gm_m)}")
        if self.roll_period_s is not None and self.roll_period_s <= 0:
            raise _err(src, f"roll_period_s must be > 0, got {show(self.roll_period_s)}")
        if self.roll_damping_ratio is not None and not 0.0 < self.roll_damping_ratio < 1.0:
            raise _err(src, f"roll_damping_ratio must lie in (0, 1), got {show(self.roll_damping_ratio)}")
        if self.service_speed_kn <= 0:
            raise _err(src, f"service_speed_kn must be > 0, got {show(self.service_speed_kn)}")

    def _check_stations(self, src: str) -> None:
        """At least one Station, unique names, each inside the box of the class docstring."""
        L, B, T = self.length_wl_m, self.beam_m, self.draught_m
        if not self.stations:
            raise _err(src, "stations must list at least one station")
        seen: set = set()
        for st in self.stations:
            if not isinstance(st, Station):
                raise _err(src, f"stations must hold Station objects, got {show(st)}")
            if st.name in seen:
                raise _err(src, f"duplicate station name {show(st.name)}")
            seen.add(st.name)
            if abs(st.x_m) > L / 2:
                raise _err(src, f"station {show(st.name)} x_m={show(st.x_m)} lies outside the hull (|x| <= L/2 = {L / 2:g} m)")
            if abs(st.y_m) > B / 2:
                raise _err(src, f"station {show(st.name)} y_m={show(st.y_m)} lies outside the hull (|y| <= B/2 = {B / 2:g} m)")
            zmax = L / 2 + B
            if not -T <= st.z_m <= zmax:
                raise _err(
                    src,
                    f"station {show(st.name)} z_m={show(st.z_m)} is unreasonable (allowed -draught "
                    f"{-T:g} m to L/2 + B = {zmax:g} m above the waterline)",
                )

    # ------------------------------------------------------------------ derived values
    @property
    def cwp(self) -> float:
        """Waterplane coefficient: given, else :func:`estimate_waterplane_coeff`."""
        if self.waterplane_coeff is not None:
            return float(self.waterplane_coeff)
        return estimate_waterplane_coeff(self.block_coeff)

    @property
    def closed_form_damping_ratio(self) -> float:
        """Roll damping ratio of the closed-form model: given, else 0.10 (the old default)."""
        return 0.10 if self.roll_damping_ratio is None else float(self.roll_damping_ratio)

    @property
    def is_code_roll_period_applies(self) -> bool:
        """True when the IS Code roll-period formula is within its scope (L >= 24 m)."""
        return self.length_wl_m >= IS_CODE_MIN_LENGTH_M

    @property
    def natural_roll_period_s(self) -> float:
        """Natural roll period [s] of the closed-form model: given, else the IMO 2008 IS Code
        estimate from GM (kept for every length so closed-form results do not change; the
        strip model uses the IS Code only from 24 m, see :mod:`..motions.strip_transfer`)."""
        if self.roll_period_s is not None:
            return float(self.roll_period_s)
        from .roll_period import imo_roll_period_s

        return float(imo_roll_period_s(self.beam_m, self.draught_m, self.length_wl_m, self.gm_m))

    @property
    def station_names(self) -> Tuple[str, ...]:
        return tuple(s.name for s in self.stations)

    def station(self, name: Optional[str] = None) -> Station:
        """Station by name (None = the first). Unknown name -> error listing known stations."""
        if name is None:
            return self.stations[0]
        for st in self.stations:
            if st.name == name:
                return st
        raise SeawayInputError(
            f"station {show(name)} is not defined for vessel {show(self.name)}; known stations: "
            f"{', '.join(self.station_names)}"
        )

    def _file_path(self, value: Optional[str]) -> Optional[Path]:
        if value is None:
            return None
        p = Path(value)
        if not p.is_absolute() and self.base_dir is not None:
            p = Path(self.base_dir) / p
        return p

    def rao_table_path(self) -> Optional[Path]:
        """Absolute path of the RAO table CSV, or None."""
        return self._file_path(self.rao_table)

    def hull_sections_path(self) -> Optional[Path]:
        """Absolute path of the hull-sections CSV, or None."""
        return self._file_path(self.hull_sections)


# ---------------------------------------------------------------------- dict / JSON
_REQUIRED = ("name", "length_wl_m", "beam_m", "draught_m", "block_coeff", "stations")
_OPTIONAL = ("gm_m", "roll_period_s", "waterplane_coeff", "roll_damping_ratio",
             "service_speed_kn", "description", "rao_table", "hull_sections", "motion_model",
             "roll_gyradius_m", "pitch_gyradius_m")
_ALLOWED = ("format", "format_version") + _REQUIRED + _OPTIONAL
_STATION_KEYS = ("name", "x_m", "y_m", "z_m", "task")


def profile_from_dict(d: Mapping[str, Any], *, source: str = "<dict>", base_dir: Optional[str] = None) -> VesselProfile:
    """Build a validated :class:`VesselProfile` from a mapping in our JSON layout.

    Errors (SeawayInputError) name ``source``, the field and the value: wrong ``format`` or
    ``format_version``, unknown keys (the allowed keys are listed), missing required keys,
    wrong types, and every rule of :class:`VesselProfile`.
    """
    if not isinstance(d, Mapping):
        raise _err(source, f"a vessel profile must be a JSON object, got {type(d).__name__}")
    fmt = d.get("format")
    if fmt != FORMAT_NAME:
        raise _err(source, f"format must be {show(FORMAT_NAME)}, got {show(fmt)}")
    ver = d.get("format_version")
    if ver != FORMAT_VERSION or isinstance(ver, bool):
        raise _err(source, f"format_version {show(ver)} is not supported (this version reads {FORMAT_VERSION})")
    unknown = [k for k in d if k not in _ALLOWED]
    if unknown:
        raise _err(source, f"unknown key(s) {', '.join(map(repr, unknown))}; allowed keys: {', '.join(_ALLOWED)}")
    missing = [k for k in _REQUIRED if k not in d]
    if missing:
        raise _err(source, f"missing required key(s): {', '.join(missing)}")
    raw_st = d["stations"]
    if not isinstance(raw_st, list):
        raise _err(source, f"stations must be a list, got {type(raw_st).__name__}")
    stations: List[Station] = []
    for i, s in enumerate(raw_st):
        if not isinstance(s, Mapping):
            raise _err(source, f"stations[{i}] must be an object, got {show(s)}")
        bad = [k for k in s if k not in _STATION_KEYS]
        if bad:
            raise _err(source, f"stations[{i}]: unknown key(s) {', '.join(map(repr, bad))}; allowed keys: {', '.join(_STATION_KEYS)}")
        if "name" not in s or "x_m" not in s:
            raise _err(source, f"stations[{i}] needs at least 'name' and 'x_m', got {show(dict(s))}")
        try:
            stations.append(Station(
                name=s["name"], x_m=s["x_m"], y_m=s.get("y_m", 0.0), z_m=s.get("z_m", 0.0),
                task=s.get("task", DEFAULT_TASK),
            ))
        except SeawayInputError as exc:
            raise _err(source, f"stations[{i}]: {exc}") from None
    kwargs: Dict[str, Any] = {k: d[k] for k in _REQUIRED if k != "stations"}
    for k in _OPTIONAL:
        if k in d and d[k] is not None:
            kwargs[k] = d[k]
    if "roll_damping_ratio" in d and d["roll_damping_ratio"] is None:
        kwargs["roll_damping_ratio"] = None  # explicit null: Ikeda estimate (module docstring)
    desc = kwargs.get("description", "")
    if not isinstance(desc, str):
        raise _err(source, f"description must be a string, got {show(desc)}")
    try:
        return VesselProfile(stations=tuple(stations), base_dir=base_dir, **kwargs)
    except SeawayInputError as exc:
        raise _err(source, str(exc)) from None


def profile_to_dict(p: VesselProfile) -> Dict[str, Any]:
    """JSON-ready mapping of a profile (inverse of :func:`profile_from_dict`)."""
    out: Dict[str, Any] = {"format": FORMAT_NAME, "format_version": FORMAT_VERSION}
    for k in _REQUIRED:
        if k != "stations":
            out[k] = getattr(p, k)
    for k in _OPTIONAL:
        out[k] = getattr(p, k)
    out["stations"] = [
        {"name": s.name, "x_m": s.x_m, "y_m": s.y_m, "z_m": s.z_m, "task": s.task} for s in p.stations
    ]
    return out


def load_vessel_profile(path: Union[str, Path]) -> VesselProfile:
    """Read a profile JSON file (plain :func:`json.load`, no code execution)."""
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except OSError as exc:
        raise SeawayInputError(f"cannot read vessel profile {show(str(p))}: {exc}") from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise SeawayInputError(f"{p}: not valid JSON ({exc})") from None
    return profile_from_dict(data, source=str(p), base_dir=str(p.resolve().parent))


def save_vessel_profile(p: VesselProfile, path: Union[str, Path], *, overwrite: bool = False) -> Path:
    """Write a profile as JSON; refuses to overwrite an existing file unless ``overwrite``."""
    out = Path(path)
    if out.exists() and not overwrite:
        raise SeawayInputError(f"{show(str(out))} exists already; pass overwrite=True to replace it")
    out.write_text(json.dumps(profile_to_dict(p), indent=2) + "\n", encoding="utf-8")
    return out


def builtin_profile_names() -> List[str]:
    """Names of the example profiles shipped with the plugin (invented vessels)."""
    return sorted(f.stem for f in BUILTIN_DIR.glob("*.json"))


def builtin_profile(name: str) -> VesselProfile:
    """Load a shipped example profile by name (see :func:`builtin_profile_names`)."""
    names = builtin_profile_names()
    if name not in names:
        raise SeawayInputError(f"unknown built-in vessel {show(name)}; known: {', '.join(names)}")
    return load_vessel_profile(BUILTIN_DIR / f"{name}.json")


def resolve_vessel(name_or_path: Union[str, Path, VesselProfile]) -> VesselProfile:
    """A profile from a built-in name, a JSON file path, or a profile (returned as is)."""
    if isinstance(name_or_path, VesselProfile):
        return name_or_path
    s = str(name_or_path)
    if s in builtin_profile_names():
        return builtin_profile(s)
    p = Path(s)
    if p.suffix.lower() == ".json" or p.exists():
        return load_vessel_profile(p)
    raise SeawayInputError(
        f"vessel {show(s)} is neither a built-in profile ({', '.join(builtin_profile_names())}) "
        "nor an existing JSON file"
    )
