"""The gas and cathode data (``profiles/data/*.toml``), loaded once into the model's types.

Every number carries its source in the data files; a name is found by its key, symbol or
any alias, in any case.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import replace
from functools import cache
from pathlib import Path
from typing import Any

from ..model import constants as _c
from ..model.gas import Cathode, Gas, NormalGlow, TownsendConstants, UniformFieldLaw
from ..model.ionisation import Attachment, Segment, ionisation
from ..model.secondary import Yield
from .fields import ProfileError, Table, name_key, read_toml

__all__ = [
    "cite",
    "sources",
    "PER_CM_TORR",
    "cathodes",
    "data_text",
    "find_cathode",
    "find_gas",
    "gases",
]

_HERE = Path(__file__).parent
"""Where the shipped data files are (``profiles/data``)."""
PER_CM_TORR = 1.0 / (_c.centi * _c.torr)
"""1/(cm Torr) in 1/(Pa m), and V/(cm Torr) in V/(Pa m)."""


def data_text(name: str) -> str:
    """The text of one of the shipped data files (``profiles/data/<name>``)."""
    return (_HERE / "data" / name).read_text(encoding="utf-8")


@cache
def sources() -> dict[str, dict[str, Any]]:
    """The keyed bibliography (``profiles/data/sources.toml``): each key's authors, title, year, where
    it appeared, its DOI or ISBN where one exists, and how far it was checked."""
    file = "sources.toml"
    return {k: dict(v) for k, v in read_toml(data_text(file), file).items()}


def cite(source: dict[str, Any]) -> str:
    """One source as a line of text: authors, title, year, venue, DOI or ISBN; how far it was checked."""
    parts = [source["authors"], f"{source['title']}"]
    parts += [x for x in (source.get("venue"), source.get("publisher")) if x]
    parts.append(str(source["year"]))
    if "doi" in source:
        parts.append(f"doi:{source['doi']}")
    if "isbn" in source:
        parts.append(f"ISBN {source['isbn']}")
    return ", ".join(parts) + f" ({source['checked']})"


@cache
def _gas_tables() -> tuple[dict[str, Gas], dict[str, str]]:
    """(gases by key, key by any accepted name)."""
    file = "gases.toml"
    raw = read_toml(data_text(file), file)
    out: dict[str, Gas] = {}
    names: dict[str, str] = {}
    for key, data in raw.items():
        t = Table(file, key, data)
        aliases = (key, t.string("symbol"), *data.get("aliases", ()))
        for alias in aliases:
            names[name_key(alias)] = key
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
        segments, constants = _alpha(t)
        out[key] = Gas(
            key=key,
            symbol=t.string("symbol"),
            constants=constants,
            ionisation=ionisation(segments),
            yield_=yield_table(t.sub("gamma"), required=True),
            law=law,
            ionisation_energy=t.number("ionisation_energy_eV", 1, 100),
            molar_mass=t.number("molar_mass_g_per_mol", 1, 1000) * 1e-3,
            ion_mobility=t.number("ion_mobility_cm2_per_V_s", 0.01, 100) * _c.centi**2,
            ion_mobility_source=t.string("ion_mobility_source"),
            electron_collision_per_Pa=t.number("electron_collision_per_s_Torr", 1e6, 1e12) / _c.torr,
            noble=bool(t.data.get("noble", False)),
            attachment=_attachment(t.sub("attachment"), t.number("reference_temperature_K", 1, 1e4)),
            attaches_unmodelled=bool(t.data.get("attaches_unmodelled", False)),
            minimum_checked=not t.sub("gamma").data.get("unchecked", False),
            metastable_energy=t.number("metastable_energy_eV", 1, 30, required=False),
            reactive=bool(t.data.get("reactive", False)),
            electron_mobility_p=t.number("electron_mobility_cm2_Torr_per_V_s", 1e3, 1e8) * _c.centi**2 * _c.torr,
            characteristic_energy=t.number("characteristic_energy_eV", 0.01, 100),
        )
    return out, names


_FORMS = {"exp": 1.0, "sqrt": 0.5, "power": None}


def _alpha(t: Table) -> tuple[list[Segment], TownsendConstants]:
    """The [[gas.alpha]] segments, and the one marked ``textbook`` as the gas's A, B view."""
    items = t.data.get("alpha")
    if not isinstance(items, list) or not items:
        raise t.fail("alpha", "give at least one [[gas.alpha]] segment")
    T_ref = t.number("reference_temperature_K", 1, 1e4)
    segments, view = [], None
    for i, item in enumerate(items, 1):
        a = Table(t.file, f"{t.where}.alpha #{i}", item)
        lo, hi = a.pair("E_over_p_V_per_cm_Torr", 0, 1e5)
        form = a.string("form", default="exp", choices=tuple(_FORMS))
        power = _FORMS[form] if form != "power" else a.number("power", 0.05, 1.0)
        if form != "power" and a.has("power"):
            raise a.fail("power", 'only a form = "power" segment has a power')
        seg = Segment(
            A=a.number("A_per_cm_Torr", 0.01, 1e3) * PER_CM_TORR,
            B=a.number("B_V_per_cm_Torr", 1, 1e5) * PER_CM_TORR,
            low=lo * PER_CM_TORR,
            high=hi * PER_CM_TORR,
            source=a.string("source"),
            power=power,
        )
        segments.append(seg)
        if a.data.get("textbook") is True:
            if seg.power != 1.0:
                raise a.fail("textbook", "the textbook A, B pair is of the exp form")
            view = TownsendConstants(seg.A, seg.B, seg.low, seg.high, T_ref, seg.source)
    if (v := t.sub("view")) is not None:
        if view is not None:
            raise v.fail("A_per_cm_Torr", "give the A, B view once: a textbook segment or a [view] table")
        lo, hi = v.pair("E_over_p_V_per_cm_Torr", 0, 1e5)
        view = TownsendConstants(
            v.number("A_per_cm_Torr", 0.01, 1e3) * PER_CM_TORR,
            v.number("B_V_per_cm_Torr", 1, 1e5) * PER_CM_TORR,
            lo * PER_CM_TORR,
            hi * PER_CM_TORR,
            T_ref,
            v.string("source"),
        )
    if view is None:
        raise t.fail(
            "alpha",
            "mark one exp segment textbook = true (the gas's A, B as the tables give them), or give a [view] pair",
        )
    return segments, view


def yield_table(t: Table | None, *, required: bool = False) -> Yield | None:
    """A [*.gamma] table: the effective yield ``value`` at ``reference_E_over_p_V_per_cm_Torr``, its
    ``range``, and optionally its ``knee_E_over_p_V_per_cm_Torr``, ``slope`` and ``cap``."""
    if t is None:
        if required:
            raise ProfileError("a [gamma] table is missing")
        return None
    t.only(("value", "range", "reference_E_over_p_V_per_cm_Torr", "knee_E_over_p_V_per_cm_Torr", "slope", "cap",
            "source", "unchecked"))  # fmt: skip
    lo, hi = t.pair("range", 1e-6, 10)
    value = t.number("value", 1e-6, 10)
    if not lo <= value <= hi:
        raise t.fail("value", f"{value!r} is not inside its range [{lo:g}, {hi:g}]")
    slope = t.number("slope", 0, 0.99, default=0.0)
    ref = t.number("reference_E_over_p_V_per_cm_Torr", 0.1, 1e6, required=bool(slope))
    knee = t.number("knee_E_over_p_V_per_cm_Torr", 0.0, 1e6, default=0.0)
    return Yield(
        value,
        lo,
        hi,
        t.string("source"),
        reference=0.0 if ref is None else ref * PER_CM_TORR,
        knee=knee * PER_CM_TORR,
        slope=slope,
        cap=t.number("cap", 1e-6, 100, required=False),
    )


def _attachment(t: Table | None, T_ref: float) -> Attachment | None:
    if t is None:
        return None
    lo, hi = t.pair("E_over_p_V_per_cm_Torr", 0, 1e5)
    c3 = t.number("three_body_cm5", 0, 1e-40, default=0.0)
    n3 = t.number("three_body_exponent", -5, 5, default=0.0)
    return Attachment(
        k1_high=t.number("k1_high_per_V", 0, 1),
        k0_high=t.number("k0_high_per_cm_Torr", -10, 10) * PER_CM_TORR,
        k1_low=t.number("k1_low_per_V", 0, 1),
        k0_low=t.number("k0_low_per_cm_Torr", -10, 10) * PER_CM_TORR,
        switch=t.number("switch_V_per_cm_Torr", 0, 1e5) * PER_CM_TORR,
        valid_low=lo * PER_CM_TORR,
        valid_high=hi * PER_CM_TORR,
        source=t.string("source"),
        three_body=three_body_si(c3, n3, T_ref),
        three_body_exponent=n3,
        three_body_source=t.string("three_body_source") if c3 else "",
    )


def three_body_si(c_cm5: float, n: float, T_ref: float) -> float:
    """c3 in eta3/p = c3 y^n p (y = E/p in V/(Pa m), p in Pa, both at the reference density) from the
    published form eta3/N = c (E/N)^n N in cm^2, E/N in V cm^2, N in cm^-3 ([morrow-lowke-1997]):
    eta3/p = (eta3/N)(N/p) with E/N = y k T_ref and N = p / (k T_ref), the centimetres converted."""
    if not c_cm5:
        return 0.0
    kT = _c.k * T_ref  # J = Pa m^3
    # eta3/N [m^2] = 1e-4 c (1e4 kT y)^n (1e-6 p / kT), and eta3/p = (eta3/N) / kT
    return 1e-4 * c_cm5 * (1e4 * kT) ** n * 1e-6 / kT**2


def gases() -> dict[str, Gas]:
    """All gases by canonical key."""
    return dict(_gas_tables()[0])


def find_gas(name: str) -> Gas:
    """The gas called ``name`` (name, symbol or alias, any case), or a one-line error."""
    table, names = _gas_tables()
    k = name_key(name)
    if k in names:
        return table[names[k]]
    known = ", ".join(f"{g.symbol} ({g.key})" if g.symbol.casefold() != g.key else g.key for g in table.values())
    raise ProfileError(f"gas {name!r}: unknown; use one of {known}")


@cache
def _cathode_tables() -> tuple[dict[str, Cathode], dict[str, str]]:
    file = "cathodes.toml"
    raw = read_toml(data_text(file), file)
    gas_names = _gas_tables()[1]
    out: dict[str, Cathode] = {}
    names: dict[str, str] = {}
    for key, data in raw.items():
        t = Table(file, key, data)
        yields: dict[str, Yield] = {}
        if (gt := t.sub("gamma")) is not None:
            for gas_key in gt.data:
                y = gt.sub(gas_key)
                yields[_gas_ref(gas_key, gas_names, y)] = yield_table(y)
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
            yields=yields,
            normal_glow=glows,
            note=t.string("note", default="") if t.has("note") else "",
        )
        for alias in (key, data["symbol"], *data.get("aliases", ())):
            names[name_key(alias)] = key
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


def _gas_ref(name: str, gas_names: Mapping[str, str], t: Table) -> str:
    k = name_key(name)
    if k not in gas_names:
        raise ProfileError(f"{t.file}: [{t.where}]: {name!r} is not a known gas")
    return gas_names[k]


def cathodes() -> dict[str, Cathode]:
    """All cathode materials by canonical key."""
    return dict(_cathode_tables()[0])


def find_cathode(name: str) -> Cathode:
    """The cathode called ``name`` (name, symbol or alias, any case), or a one-line error."""
    table, names = _cathode_tables()
    k = name_key(name)
    if k in names:
        return table[names[k]]
    known = ", ".join(f"{c.symbol} ({c.key})" for c in table.values())
    raise ProfileError(f"cathode {name!r}: unknown; use one of {known}")
