"""Load and validate gas, cathode and bench profiles (TOML) into the model's types.

Every problem raises :class:`ProfileError` with one line naming the file, the field and
the accepted form or range. Quantities in profiles carry their units as text
("40 mm", "1.5 kV"), read by :mod:`strikeline.model.units`. Nothing in a profile is
evaluated as code.
"""

from __future__ import annotations

import math
import os
import re
import tempfile
import tomllib
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field, replace
from functools import cache
from importlib import resources
from pathlib import Path
from typing import Any

from ..drivers.framing import Analog, ChannelSpec, PortSpec
from ..drivers.reading import QUANTITIES, Status
from ..model import constants as _c
from ..model import units
from ..model.bench import (
    Bench,
    BenchCurve,
    Cathode,
    Chamber,
    Gas,
    NormalGlow,
    StrayGap,
    Supply,
    TownsendConstants,
    UniformFieldLaw,
    Yield,
)
from ..model.gauges import GAUGE_KINDS, GaugeCorrection

__all__ = [
    "BUILTIN_BENCHES",
    "BenchProfile",
    "ProfileError",
    "cathodes",
    "find_cathode",
    "find_gas",
    "gases",
    "load_bench",
    "unsupported_gases",
]

# 1/(cm Torr) -> 1/(Pa m) and V/(cm Torr) -> V/(Pa m)
PER_CM_TORR = 1.0 / (_c.centi * _c.torr)
BUILTIN_BENCHES = ("demo", "demo-magnetron")


class ProfileError(ValueError):
    """A profile (or a gas/cathode name) is not acceptable; the message is one line."""


def _key(name: str) -> str:
    return " ".join(name.replace("_", " ").replace("-", " ").split()).casefold()


class _Table:
    """Typed access to one TOML table, with errors that name file and field."""

    def __init__(self, file: str, where: str, data: Any):
        self.file, self.where = file, where
        if not isinstance(data, dict):
            raise ProfileError(f"{file}: [{where}] must be a table of fields, not {type(data).__name__}")
        self.data: dict[str, Any] = data

    def fail(self, key: str, problem: str) -> ProfileError:
        shown = key if key and key.isprintable() and key.strip() == key else repr(key)
        where = f"[{self.where}] " if self.where else ""
        return ProfileError(" ".join(f"{self.file}: {where}{shown}: {problem}".split()))

    def only(self, allowed: Iterable[str]) -> None:
        allowed = tuple(allowed)
        for key in self.data:
            if key not in allowed:
                raise self.fail(key, f"unknown field; accepted fields are {', '.join(allowed)}")

    def has(self, key: str) -> bool:
        return key in self.data

    def string(self, key: str, *, default: str | None = None, choices: tuple[str, ...] = ()) -> str:
        if key not in self.data:
            if default is None:
                raise self.fail(key, "missing; it is required")
            return default
        v = self.data[key]
        if not isinstance(v, str) or not v.strip():
            raise self.fail(key, f"{v!r} is not a non-empty text")
        if choices and v.strip().casefold() not in choices:
            raise self.fail(key, f"{v!r} is not one of {', '.join(choices)}")
        return v.strip()

    def number(
        self, key: str, lo: float, hi: float, *, default: float | None = None, required: bool = True
    ) -> float | None:
        if key not in self.data:
            if default is None and required:
                raise self.fail(key, f"missing; give a number from {lo:g} to {hi:g}")
            return default
        v = self.data[key]
        if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v) or not lo <= v <= hi:
            raise self.fail(key, f"{v!r} is not a number from {lo:g} to {hi:g}")
        return float(v)

    def pair(self, key: str, lo: float, hi: float) -> tuple[float, float]:
        v = self.data.get(key)
        ok = (
            isinstance(v, list)
            and len(v) == 2
            and all(isinstance(x, int | float) and not isinstance(x, bool) for x in v)
            and all(math.isfinite(x) and lo <= x <= hi for x in v)
            and v[0] < v[1]
        )
        if not ok:
            raise self.fail(key, f"{v!r} is not [low, high] with {lo:g} <= low < high <= {hi:g}")
        return float(v[0]), float(v[1])

    def quantity(
        self,
        key: str,
        kind: str,
        lo: float,
        hi: float,
        *,
        required: bool = True,
        allow_zero: bool = False,
    ) -> float | None:
        if key not in self.data:
            if required:
                raise self.fail(key, f"missing; give {kind} with its unit, e.g. {_example(kind, lo, hi)}")
            return None
        v = self.data[key]
        try:
            value = units.parse(v, kind, name=key, allow_zero=allow_zero)
        except units.QuantityError as e:
            raise ProfileError(f"{self.file}: [{self.where}] {e}") from None
        if not lo <= value <= hi:
            si = units.units_of(kind)[0]
            raise self.fail(key, f"{v!r} is outside the accepted range {lo:g} to {hi:g} {si}")
        return value

    def sub(self, key: str) -> _Table | None:
        if key not in self.data:
            return None
        return _Table(self.file, f"{self.where}.{key}" if self.where else key, self.data[key])


def _example(kind: str, lo: float, hi: float) -> str:
    si = units.units_of(kind)[0]
    return f'"{math.sqrt(lo * hi) if lo > 0 else hi / 10:.3g} {si}"'


def _read_toml(text: str, file: str) -> dict[str, Any]:
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as e:
        raise ProfileError(f"{file}: not valid TOML: {str(e).splitlines()[0]}") from None


def _data_text(name: str) -> str:
    return resources.files("strikeline.profiles").joinpath("data", name).read_text(encoding="utf-8")


@cache
def _gas_tables() -> tuple[dict[str, Gas], dict[str, str], dict[str, str]]:
    """(gases by key, key by any accepted name, reason by any name of an unsupported gas)."""
    file = "gases.toml"
    raw = _read_toml(_data_text(file), file)
    out: dict[str, Gas] = {}
    names: dict[str, str] = {}
    unsupported: dict[str, str] = {}
    for key, data in raw.items():
        t = _Table(file, key, data)
        aliases = (key, t.string("symbol"), *data.get("aliases", ()))
        if t.has("unsupported"):
            for alias in aliases:
                unsupported[_key(alias)] = t.string("unsupported")
            continue
        for alias in aliases:
            names[_key(alias)] = key
        law = None
        if (lt := t.sub("uniform_field_law")) is not None:
            law = UniformFieldLaw(
                a=lt.number("a_kV_per_cm", 0, 1e3) * _c.kilo / _c.centi,
                b=lt.number("b_kV_per_sqrt_cm", 0, 1e3) * _c.kilo / math.sqrt(_c.centi),
                reference_pressure=lt.number("reference_pressure_Torr", 1, 1e4) * _c.torr,
                reference_temperature=lt.number("reference_temperature_K", 1, 1e4),
                blend_from=lt.number("blend_from_cm", 0, 1e3) * _c.centi,
                blend_to=lt.number("blend_to_cm", 0, 1e3) * _c.centi,
                valid_to=lt.number("valid_to_cm", 0, 1e3) * _c.centi,
                source=lt.string("source"),
            )
        lo, hi = t.pair("E_over_p_V_per_cm_Torr", 0, 1e5)
        constants = TownsendConstants(
            A=t.number("A_per_cm_Torr", 0.01, 1e3) * PER_CM_TORR,
            B=t.number("B_V_per_cm_Torr", 1, 1e4) * PER_CM_TORR,
            E_over_p_low=lo * PER_CM_TORR,
            E_over_p_high=hi * PER_CM_TORR,
            reference_temperature=t.number("reference_temperature_K", 1, 1e4),
            source=t.string("source"),
        )
        out[key] = Gas(
            key=key,
            symbol=t.string("symbol"),
            constants=constants,
            law=law,
            ionisation_energy=t.number("ionisation_energy_eV", 1, 100),
            molar_mass=t.number("molar_mass_g_per_mol", 1, 1000) * 1e-3,
            ion_mobility=t.number("ion_mobility_cm2_per_V_s", 0.01, 100) * _c.centi**2,
            ion_mobility_source=t.string("ion_mobility_source"),
            electron_collision_per_Pa=t.number("electron_collision_per_s_Torr", 1e6, 1e12) / _c.torr,
            noble=bool(t.data.get("noble", False)),
        )
    return out, names, unsupported


def gases() -> dict[str, Gas]:
    """All supported gases by canonical key."""
    return dict(_gas_tables()[0])


def unsupported_gases() -> dict[str, str]:
    """Names of gases listed but not supported by this law, with the reason."""
    return dict(_gas_tables()[2])


def find_gas(name: str) -> Gas:
    """The gas called ``name`` (name, symbol or alias, any case), or a one-line error."""
    table, names, unsupported = _gas_tables()
    k = _key(name)
    if k in names:
        return table[names[k]]
    if k in unsupported:
        raise ProfileError(f"gas {name!r} is not supported: {unsupported[k]}")
    known = ", ".join(f"{g.symbol} ({g.key})" if g.symbol.casefold() != g.key else g.key for g in table.values())
    raise ProfileError(f"gas {name!r}: unknown; use one of {known}")


@cache
def _cathode_tables() -> tuple[dict[str, Cathode], dict[str, str]]:
    file = "cathodes.toml"
    raw = _read_toml(_data_text(file), file)
    gas_names = _gas_tables()[1]
    out: dict[str, Cathode] = {}
    names: dict[str, str] = {}
    for key, data in raw.items():
        t = _Table(file, key, data)
        lo, hi = t.pair("gamma_range", 1e-6, 1)
        default = Yield(t.number("gamma_default", 1e-6, 1), lo, hi, t.string("gamma_source"))
        yields: dict[str, Yield] = {}
        if (gt := t.sub("gamma")) is not None:
            for gas_key in gt.data:
                y = gt.sub(gas_key)
                ylo, yhi = y.pair("range", 1e-6, 1)
                yields[_gas_ref(gas_key, gas_names, y)] = Yield(
                    y.number("value", 1e-6, 1), ylo, yhi, y.string("source")
                )
        glows: dict[str, NormalGlow] = {}
        if (nt := t.sub("normal_glow")) is not None:
            for gas_key in nt.data:
                g = nt.sub(gas_key)
                j = g.number("j_per_p2_uA_per_cm2_Torr2", 1e-3, 1e5, required=False)
                pdn = g.number("pd_Torr_cm", 1e-3, 100, required=False)
                glows[_gas_ref(gas_key, gas_names, g)] = NormalGlow(
                    cathode_fall=g.number("cathode_fall_V", 10, 2000),
                    current_density_per_p2=None if j is None else j * 1e-6 / _c.centi**2 / _c.torr**2,
                    pd_n=None if pdn is None else pdn * _c.torr * _c.centi,
                    source=g.string("source"),
                )
        out[key] = Cathode(
            key=key,
            symbol=t.string("symbol"),
            work_function=t.number("work_function_eV", 1, 10),
            default_yield=default,
            yields=yields,
            normal_glow=glows,
            note=t.string("note", default="") if t.has("note") else "",
        )
        for alias in (key, data["symbol"], *data.get("aliases", ())):
            names[_key(alias)] = key
    return _borrow_iron_glow(out), names


def _borrow_iron_glow(table: dict[str, Cathode]) -> dict[str, Cathode]:
    """Fill normal-glow gaps from the iron rows of the same gas: j_n/p^2 and p d_n depend
    mainly on the gas, V_n strongly on the cathode, so a cathode's own V_n is kept where
    it has one. Every borrowed number says so in its source."""
    iron = table.get("stainless")
    if iron is None:
        return table
    out = {}
    for key, cat in table.items():
        rows = dict(cat.normal_glow)
        if key != "stainless":
            for gas_key, fe in iron.normal_glow.items():
                own = rows.get(gas_key)
                if own is None:
                    rows[gas_key] = replace(fe, source=f"iron values used for {cat.key}: {fe.source}")
                elif own.current_density_per_p2 is None:
                    rows[gas_key] = replace(
                        own,
                        current_density_per_p2=fe.current_density_per_p2,
                        pd_n=fe.pd_n,
                        source=f"{own.source}; j_n/p^2 and p d_n from iron: {fe.source}",
                    )
        out[key] = replace(cat, normal_glow=rows)
    return out


def _gas_ref(name: str, gas_names: Mapping[str, str], t: _Table) -> str:
    k = _key(name)
    if k not in gas_names:
        raise ProfileError(f"{t.file}: [{t.where}]: {name!r} is not a known gas")
    return gas_names[k]


def cathodes() -> dict[str, Cathode]:
    """All cathode materials by canonical key."""
    return dict(_cathode_tables()[0])


def find_cathode(name: str) -> Cathode:
    """The cathode called ``name`` (name, symbol or alias, any case), or a one-line error."""
    table, names = _cathode_tables()
    k = _key(name)
    if k in names:
        return table[names[k]]
    known = ", ".join(f"{c.symbol} ({c.key})" for c in table.values())
    raise ProfileError(f"cathode {name!r}: unknown; use one of {known}")


@dataclass(frozen=True)
class BenchProfile:
    """A loaded bench file: the model's :class:`Bench` plus where it came from."""

    bench: Bench
    path: Path | None
    """The file, or None for a built-in bench."""
    label: str
    """How to name it to the user ("demo" or the path)."""
    description: str = ""
    raw: Mapping[str, Any] = field(default_factory=dict)
    """The parsed TOML, kept so that a save can write the file back whole."""
    ports: tuple[PortSpec, ...] = ()
    """Instrument ports and their channels."""
    gauges: Mapping[str, GaugeCorrection] = field(default_factory=dict)
    """Gas correction by pressure-channel name."""


_BENCH_FIELDS = (
    "name",
    "description",
    "gas",
    "cathode",
    "gap",
    "gas_temperature",
    "gamma",
    "pressure",
    "cathode_area",
    "magnetic_field",
)
_SECTIONS = ("bench", "supply", "stray_gap", "chamber", "port", "curve")
_CURVE_FIELDS = (
    "gas",
    "cathode",
    "fitted_on",
    "n_points",
    "free",
    "A_per_Pa_m",
    "B_V_per_Pa_m",
    "gamma",
    "A_sigma",
    "B_sigma",
    "gamma_sigma",
    "covariance_ln",
    "residual_scale",
    "t_quantile",
    "rms_residual_V",
    "pd_low_Pa_m",
    "pd_high_Pa_m",
)
_PORT_FIELDS = (
    "name",
    "url",
    "mode",
    "baudrate",
    "bytesize",
    "parity",
    "stopbits",
    "terminator",
    "poll_interval",
    "timeout",
    "lost_after",
    "encoding",
    "channel",
)
_CHANNEL_FIELDS = (
    "name",
    "quantity",
    "query",
    "pattern",
    "unit",
    "units",
    "status",
    "scale",
    "offset",
    "over_range_above",
    "under_range_below",
    "analog",
    "stale_after",
    "gauge",
    "gauge_factor",
)
_QUANTITY_KIND = {"pressure": "pressure", "voltage": "voltage", "current": "current"}


def load_bench(ref: str | os.PathLike[str]) -> BenchProfile:
    """Load a bench file, or a built-in bench by name ("demo", "demo-magnetron")."""
    ref_s = os.fspath(ref)
    if ref_s in BUILTIN_BENCHES:
        text = resources.files("strikeline.profiles").joinpath("benches", f"{ref_s}.toml").read_text("utf-8")
        return parse_bench(text, ref_s, None)
    path = Path(ref_s).expanduser()
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise ProfileError(
            f"bench {ref_s!r}: no such file; give a bench profile (.toml) or one of {', '.join(BUILTIN_BENCHES)}"
        ) from None
    except (OSError, UnicodeDecodeError) as e:
        raise ProfileError(f"bench {ref_s!r}: cannot be read ({e.__class__.__name__}: {e})") from None
    return parse_bench(text, str(path), path)


def parse_bench(text: str, label: str, path: Path | None) -> BenchProfile:
    """Validate bench TOML text (``label`` names it in errors)."""
    raw = _read_toml(text, label)
    top = _Table(label, "", raw)
    top.only(_SECTIONS)
    b = top.sub("bench")
    if b is None:
        raise ProfileError(f"{label}: [bench] missing; it holds gas, cathode and gap")
    b.only(_BENCH_FIELDS)
    try:
        gas = find_gas(b.string("gas"))
        cathode = find_cathode(b.string("cathode"))
    except ProfileError as e:
        raise ProfileError(f"{label}: [bench] {e}") from None
    supply = None
    if (s := top.sub("supply")) is not None:
        s.only(("open_circuit_voltage", "current_limit", "ballast", "mode", "frequency", "off_time"))
        mode = s.string("mode", default="dc", choices=("dc", "pulsed")).casefold()
        freq = s.quantity("frequency", "frequency", 1.0, 1e8, required=mode == "pulsed")
        off = s.quantity("off_time", "time", 1e-9, 10.0, required=mode == "pulsed")
        if mode == "pulsed" and off >= 1.0 / freq:
            raise s.fail("off_time", f"{s.data['off_time']!r} is not shorter than one period (1/frequency)")
        supply = Supply(
            open_circuit_voltage=s.quantity("open_circuit_voltage", "voltage", 1.0, 1e6),
            current_limit=s.quantity("current_limit", "current", 1e-9, 1e4, required=False),
            ballast=s.quantity("ballast", "resistance", 0.0, 1e10, required=False, allow_zero=True) or 0.0,
            mode=mode,
            frequency=freq if mode == "pulsed" else None,
            off_time=off if mode == "pulsed" else None,
        )
    stray: list[StrayGap] = []
    if "stray_gap" in raw:
        items = raw["stray_gap"]
        if not isinstance(items, list):
            raise ProfileError(f"{label}: [[stray_gap]] must be a list of tables ([[stray_gap]] blocks)")
        for i, item in enumerate(items, 1):
            g = _Table(label, f"stray_gap #{i}", item)
            g.only(("name", "length"))
            stray.append(StrayGap(g.string("name"), g.quantity("length", "length", 1e-6, 10.0)))
    chamber = None
    if (c := top.sub("chamber")) is not None:
        c.only(("radius", "length"))
        chamber = Chamber(c.quantity("radius", "length", 1e-3, 10.0), c.quantity("length", "length", 1e-3, 10.0))
    ports, gauges = _ports(raw, label, gas)
    curve = _curve(top.sub("curve"), gas, cathode)
    bench = Bench(
        name=b.string("name", default=path.stem if path else label),
        gas=gas,
        cathode=cathode,
        gap=b.quantity("gap", "length", 1e-6, 10.0),
        gas_temperature=b.quantity("gas_temperature", "temperature", 20.0, 3000.0, required=False) or 293.15,
        gamma=b.number("gamma", 1e-6, 1.0, required=False),
        supply=supply,
        cathode_area=b.quantity("cathode_area", "area", 1e-8, 10.0, required=False),
        magnetic_field=b.quantity("magnetic_field", "field", 1e-6, 10.0, required=False),
        stray_gaps=tuple(stray),
        chamber=chamber,
        pressure=b.quantity("pressure", "pressure", 1e-6, 1e6, required=False),
        curve=curve,
    )
    description = b.string("description", default="") if b.has("description") else ""
    return BenchProfile(bench, path, label, description, raw, ports, gauges)


def _curve(t: _Table | None, gas: Gas, cathode: Cathode) -> BenchCurve | None:
    """The fitted bench curve, as ``strikeline fit --save`` writes it."""
    if t is None:
        return None
    t.only(_CURVE_FIELDS)
    try:
        fitted_gas, fitted_cathode = find_gas(t.string("gas")), find_cathode(t.string("cathode"))
    except ProfileError as e:
        raise ProfileError(f"{t.file}: [curve] {e}") from None
    if fitted_gas.key != gas.key or fitted_cathode.key != cathode.key:
        raise t.fail(
            "gas",
            f"the curve was fitted for {fitted_gas.key} on {fitted_cathode.key}, but the bench is {gas.key} on "
            f"{cathode.key}: refit it, or delete the [curve] section",
        )
    cov = t.data.get("covariance_ln")
    ok = (
        isinstance(cov, list)
        and len(cov) == 3
        and all(
            isinstance(r, list) and len(r) == 3 and all(isinstance(x, int | float) and math.isfinite(x) for x in r)
            for r in cov
        )
    )
    if not ok:
        raise t.fail("covariance_ln", "is not a 3 x 3 list of numbers")
    free = t.data.get("free", ["A", "B"])
    if not isinstance(free, list) or not set(free) <= {"A", "B", "gamma"}:
        raise t.fail("free", f"{free!r} is not a list drawn from A, B, gamma")
    return BenchCurve(
        A=t.number("A_per_Pa_m", 1e-3, 1e4),
        B=t.number("B_V_per_Pa_m", 1e-1, 1e5),
        gamma=t.number("gamma", 1e-6, 1.0),
        A_sigma=t.number("A_sigma", 0, 1e6),
        B_sigma=t.number("B_sigma", 0, 1e7),
        gamma_sigma=t.number("gamma_sigma", 0, 10),
        covariance=tuple(tuple(float(x) for x in r) for r in cov),
        rms_residual=t.number("rms_residual_V", 0, 1e6),
        n_points=int(t.number("n_points", 1, 1e6)),
        pd_low=t.number("pd_low_Pa_m", 1e-9, 1e6),
        pd_high=t.number("pd_high_Pa_m", 1e-9, 1e6),
        gas=gas.key,
        cathode=cathode.key,
        fitted_on=t.string("fitted_on"),
        residual_scale=t.number("residual_scale", 0, 10),
        t_quantile=t.number("t_quantile", 0.5, 1000),
        free=tuple(free),
    )


def curve_toml(c: BenchCurve) -> str:
    """The ``[curve]`` section for a fitted bench curve."""
    cov = ", ".join("[" + ", ".join(repr(x) for x in row) + "]" for row in c.covariance)
    return (
        "[curve]\n"
        "# Fitted by strikeline fit: Paschen's law on this bench's strike marks. Do not edit by hand.\n"
        f'gas = "{c.gas}"\ncathode = "{c.cathode}"\nfitted_on = "{c.fitted_on}"\nn_points = {c.n_points}\n'
        f"free = [{', '.join(repr(p).replace(chr(39), chr(34)) for p in c.free)}]\n"
        f"A_per_Pa_m = {c.A!r}\nB_V_per_Pa_m = {c.B!r}\ngamma = {c.gamma!r}\n"
        f"A_sigma = {c.A_sigma!r}\nB_sigma = {c.B_sigma!r}\ngamma_sigma = {c.gamma_sigma!r}\n"
        f"covariance_ln = [{cov}]\nresidual_scale = {c.residual_scale!r}\nt_quantile = {c.t_quantile!r}\n"
        f"rms_residual_V = {c.rms_residual!r}\npd_low_Pa_m = {c.pd_low!r}\npd_high_Pa_m = {c.pd_high!r}\n"
    )


def save_curve(path: str | os.PathLike[str], curve: BenchCurve) -> BenchProfile:
    """Put ``curve`` into the bench file at ``path`` (replacing any [curve] section), keeping
    the rest of the file as written. The result is validated before an atomic write."""
    ref = os.fspath(path)
    if ref in BUILTIN_BENCHES:
        raise ProfileError(f"bench {ref!r} is built in and cannot be changed; copy it to a file and save there")
    p = Path(ref).expanduser()
    try:
        text = p.read_text(encoding="utf-8")
    except OSError as e:
        raise ProfileError(f"bench {ref!r}: cannot be read ({e.strerror or e})") from None
    kept: list[str] = []
    skipping = False
    for line in text.splitlines():
        stripped = line.strip()
        if stripped.startswith("["):
            skipping = stripped.replace(" ", "") == "[curve]"
        if not skipping:
            kept.append(line)
    new = "\n".join(kept).rstrip() + "\n\n" + curve_toml(curve)
    profile = parse_bench(new, str(p), p)  # never write a file that would not load
    try:
        write_atomic(p, new)
    except OSError as e:
        raise ProfileError(f"bench {ref!r}: cannot be written ({e.strerror or e}); the file is unchanged") from None
    return profile


def write_atomic(path: Path, text: str) -> None:
    """Write ``text`` through a temporary file in the same folder and a rename, so a crash
    leaves the old file or the new one, never half of either."""
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as f:
            f.write(text)
            f.flush()
            os.fsync(f.fileno())
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


@cache
def _gauge_data() -> dict[str, Any]:
    return _read_toml(_data_text("gauges.toml"), "gauges.toml")


def gauge_correction(kind: str, gas: Gas, override: float | None = None) -> GaugeCorrection:
    """The correction of a ``kind`` gauge's reading in ``gas`` (``override``: true = f x indicated)."""
    d = _gauge_data()[kind]
    limit = d.get("linear_below_Pa")
    if override is not None:
        return GaugeCorrection(kind, override, limit, "bench profile gauge_factor", overridden=True)
    if kind == "capacitance":
        return GaugeCorrection(kind, 1.0, None, d["source"])
    if kind == "thermal":
        f = d["factor"].get(gas.key)
        return GaugeCorrection(kind, f, limit, d["source"] if f else f"no thermal-gauge factor for {gas.key}")
    s = d["sensitivity"].get(gas.key)
    return GaugeCorrection(
        kind,
        None if s is None else 1.0 / s,
        limit,
        d["source"] if s else f"no ionisation-gauge sensitivity for {gas.key}",
    )


def _ascii(t: _Table, key: str) -> bytes:
    """A field taken byte for byte (no stripping: a query keeps its line ending)."""
    raw = t.data[key]
    if not isinstance(raw, str) or not raw or not raw.isascii():
        raise t.fail(key, f'{raw!r} is not a non-empty ASCII text such as "MEAS P1\\r\\n"')
    return raw.encode("ascii")


def _ports(raw: dict[str, Any], label: str, gas: Gas) -> tuple[tuple[PortSpec, ...], dict[str, GaugeCorrection]]:
    items = raw.get("port", [])
    if not isinstance(items, list):
        raise ProfileError(f"{label}: [[port]] must be a list of tables ([[port]] blocks)")
    ports: list[PortSpec] = []
    gauges: dict[str, GaugeCorrection] = {}
    names: set[str] = set()
    for i, item in enumerate(items, 1):
        t = _Table(label, f"port #{i}", item)
        t.only(_PORT_FIELDS)
        mode = t.string("mode", default="polled", choices=("polled", "streaming")).casefold()
        url = t.string("url")
        parity = t.string("parity", default="N", choices=("n", "e", "o", "m", "s")).upper()
        term = _ascii(t, "terminator") if t.has("terminator") else b"\r\n"
        channels: list[ChannelSpec] = []
        chan_items = t.data.get("channel", [])
        if not isinstance(chan_items, list) or not chan_items:
            raise t.fail("channel", "give at least one [[port.channel]] block")
        for j, citem in enumerate(chan_items, 1):
            c = _Table(label, f"port #{i} channel #{j}", citem)
            spec, corr = _channel(c, mode, gas, t.string("encoding", default="ascii"))
            if spec.name in names:
                raise c.fail("name", f"{spec.name!r} is used by another channel")
            names.add(spec.name)
            channels.append(spec)
            if corr is not None:
                gauges[spec.name] = corr
        ports.append(
            PortSpec(
                name=t.string("name", default=f"port{i}"),
                url=url,
                channels=tuple(channels),
                mode=mode,
                baudrate=int(t.number("baudrate", 50, 4_000_000, default=9600)),
                bytesize=int(t.number("bytesize", 5, 8, default=8)),
                parity=parity,
                stopbits=t.number("stopbits", 1, 2, default=1),
                terminator=term,
                poll_interval=t.quantity("poll_interval", "time", 1e-3, 3600.0, required=False) or 0.5,
                timeout=t.quantity("timeout", "time", 1e-3, 60.0, required=False) or 0.5,
                lost_after=int(t.number("lost_after", 1, 1000, default=3)),
                source="simulated" if url.lower().startswith("simbench://") else "serial",
            )
        )
    return tuple(ports), gauges


def _channel(c: _Table, mode: str, gas: Gas, encoding: str) -> tuple[ChannelSpec, GaugeCorrection | None]:
    c.only(_CHANNEL_FIELDS)
    name = c.string("name")
    quantity = c.string("quantity", choices=QUANTITIES).casefold()
    kind = _QUANTITY_KIND[quantity]
    try:
        pattern = re.compile(c.string("pattern"))
    except re.error as e:
        raise c.fail("pattern", f"not a valid regular expression ({e})") from None
    if "value" not in pattern.groupindex:
        raise c.fail("pattern", "needs a named group (?P<value>...) for the number")
    query = None
    if mode == "polled":
        if "query" not in c.data:
            raise c.fail("query", "missing; a polled port sends it to ask for this channel")
        query = _ascii(c, "query")
    analog = None
    unit_factor = None
    if (a := c.sub("analog")) is not None:
        a.only(("c", "k", "unit"))
        unit = a.string("unit")
        try:
            f = units.parse(f"1 {unit}", kind)
        except units.QuantityError:
            raise a.fail("unit", f"{unit!r} is not a {kind} unit ({', '.join(units.units_of(kind))})") from None
        k = a.number("k", -1e6, 1e6)
        if k == 0:
            raise a.fail("k", "must not be zero")
        analog = Analog(a.number("c", -1e6, 1e6), k, f, unit)
    elif "unit" in c.data:
        unit = c.string("unit")
        try:
            unit_factor = units.parse(f"1 {unit}", kind)
        except units.QuantityError:
            raise c.fail("unit", f"{unit!r} is not a {kind} unit ({', '.join(units.units_of(kind))})") from None
    elif "unit" not in pattern.groupindex:
        raise c.fail("unit", "missing; give the unit of the answers or a (?P<unit>...) group in the pattern")
    accepted = c.data.get("units", list(units.units_of(kind)))
    if not isinstance(accepted, list) or not all(isinstance(u, str) for u in accepted):
        raise c.fail("units", f"{accepted!r} is not a list of unit names")
    unit_map: dict[str, float] = {}
    for u in accepted:
        try:
            unit_map[u.casefold()] = units.parse(f"1 {u}", kind)
        except units.QuantityError:
            raise c.fail("units", f"{u!r} is not a {kind} unit") from None
    status_map: dict[str, Status] = {}
    if (st := c.sub("status")) is not None:
        for text, ours in st.data.items():
            if not isinstance(ours, str) or ours not in [s.value for s in Status]:
                raise st.fail(text, f"{ours!r} is not one of {', '.join(s.value for s in Status)}")
            status_map[text.casefold()] = Status(ours)
    corr = None
    if "gauge" in c.data:
        if quantity != "pressure":
            raise c.fail("gauge", "only a pressure channel has a gauge kind")
        corr = gauge_correction(
            c.string("gauge", choices=GAUGE_KINDS).casefold(), gas, c.number("gauge_factor", 1e-3, 1e3, required=False)
        )
    elif "gauge_factor" in c.data:
        raise c.fail("gauge_factor", "needs gauge = capacitance, thermal or ionisation beside it")
    spec = ChannelSpec(
        name=name,
        quantity=quantity,
        pattern=pattern,
        query=query,
        unit_factor=unit_factor,
        units=unit_map,
        status_map=status_map,
        scale=c.number("scale", -1e12, 1e12, default=1.0),
        offset=c.number("offset", -1e12, 1e12, default=0.0),
        over_above=c.quantity("over_range_above", kind, 1e-12, 1e12, required=False),
        under_below=c.quantity("under_range_below", kind, 1e-15, 1e12, required=False),
        analog=analog,
        stale_after=c.quantity("stale_after", "time", 1e-3, 3600.0, required=False) or 2.0,
        encoding=encoding,
    )
    return spec, corr
