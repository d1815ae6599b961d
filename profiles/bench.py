"""Bench profiles: load and validate a bench file (or a built-in bench) into a :class:`BenchProfile`.

A bench file holds [bench], [supply], [[stray_gap]], [chamber], [[port]], [flows], [target],
[strike_detect] and [curve] sections;
every problem is one line naming the file, the section, the field and the accepted form. A
fitted curve is saved back into the file atomically, the rest of the file kept as written.
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path

from ..drivers.specs import PortSpec
from ..model.bench import Bench, BenchCurve, Chamber, StrayGap
from ..model.gauges import GaugeCorrection
from ..model.secondary import MODELS
from .benchcurve import curve_section, with_curve_section
from .fields import ProfileError, Table, read_toml
from .fill import Fill, fill_field, find_film, with_fill
from .gasdata import find_cathode, find_gas
from .gauges import gauge_correction
from .ports import port_sections
from .supply import StrikeDetection, detect_section, supply_section

__all__ = [
    "BUILTIN_BENCHES",
    "BenchProfile",
    "load_bench",
    "parse_bench",
    "save_curve",
    "with_profile_fill",
    "write_atomic",
]

BUILTIN_BENCHES = ("demo", "demo-magnetron", "demo-reactive", "demo-rf")


@dataclass(frozen=True)
class BenchProfile:
    """A loaded bench file: the model's :class:`Bench` plus where it came from."""

    bench: Bench
    path: Path | None
    """The file, or None for a built-in bench."""
    label: str
    """How to name it to the user ("demo" or the path)."""
    description: str = ""
    """The profile's own words about the bench (shown with its name)."""
    ports: tuple[PortSpec, ...] = ()
    """Instrument ports and their channels."""
    gauges: Mapping[str, GaugeCorrection] = field(default_factory=dict)
    """Gas correction by pressure-channel name."""
    flows: Mapping[str, str] = field(default_factory=dict)
    """The flow channel of each gas, by gas key ([flows] channels): the composition follows them."""
    detection: StrikeDetection = field(default_factory=StrikeDetection)
    """When the instruments' readings say the gas broke down ([strike_detect])."""


_BENCH_FIELDS = (
    "name",
    "description",
    "gas",
    "cathode",
    "gap",
    "gas_temperature",
    "gamma",
    "gamma_model",
    "pressure",
    "cathode_area",
    "electrode_radius",
    "magnetic_field",
)
_SECTIONS = ("bench", "supply", "stray_gap", "chamber", "port", "flows", "target", "strike_detect", "curve")


def load_bench(ref: str | os.PathLike[str]) -> BenchProfile:
    """Load a bench file, or a built-in bench by name (:data:`BUILTIN_BENCHES`)."""
    ref_s = os.fspath(ref)
    if ref_s in BUILTIN_BENCHES:
        text = (Path(__file__).with_name("benches") / f"{ref_s}.toml").read_text("utf-8")
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
    raw = read_toml(text, label)
    top = Table(label, "", raw)
    top.only(_SECTIONS)
    b = top.sub("bench")
    if b is None:
        raise ProfileError(f"{label}: [bench] missing; it holds gas, cathode and gap")
    b.only(_BENCH_FIELDS)
    fill = fill_field(b, "gas")
    cathode = b.lookup("cathode", find_cathode)
    supply = None if (s := top.sub("supply")) is None else supply_section(s)
    stray: list[StrayGap] = []
    if "stray_gap" in raw:
        items = raw["stray_gap"]
        if not isinstance(items, list):
            raise ProfileError(f"{label}: [[stray_gap]] must be a list of tables ([[stray_gap]] blocks)")
        for i, item in enumerate(items, 1):
            g = Table(label, f"stray_gap #{i}", item)
            g.only(("name", "length"))
            stray.append(StrayGap(g.string("name"), g.quantity("length", "length")))
    chamber = None
    if (c := top.sub("chamber")) is not None:
        c.only(("radius", "length"))
        chamber = Chamber(c.quantity("radius", "chamber"), c.quantity("length", "chamber"))
    ports, gauges = port_sections(raw, label, fill.composition)
    curve = curve_section(top.sub("curve"), fill.key, cathode)
    flows, speed = _flows_section(top.sub("flows"), ports)
    film, racetrack = None, 1.0
    if (t := top.sub("target")) is not None:
        t.only(("film", "racetrack_fraction"))
        film = t.lookup("film", find_film)
        racetrack = t.number("racetrack_fraction", 1e-3, 1.0, default=1.0)
    bench = Bench(
        name=b.string("name", default=path.stem if path else label),
        fill=fill.composition,
        pumping_speed=speed,
        film=film,
        racetrack_fraction=racetrack,
        cathode=cathode,
        gap=b.quantity("gap", "gap"),
        gas_temperature=b.quantity("gas_temperature", "temperature", required=False) or 293.15,
        gamma=b.number("gamma", 1e-6, 1.0, required=False),
        gamma_model=b.string("gamma_model", default="technical", choices=MODELS).casefold(),
        supply=supply,
        cathode_area=b.quantity("cathode_area", "area", required=False),
        electrode_radius=b.quantity("electrode_radius", "chamber", required=False),
        magnetic_field=b.quantity("magnetic_field", "field", required=False),
        stray_gaps=tuple(stray),
        chamber=chamber,
        pressure=b.quantity("pressure", "pressure", required=False),
        curve=curve,
    )
    description = b.string("description", default="") if b.has("description") else ""
    detection = detect_section(top.sub("strike_detect"))
    return BenchProfile(bench, path, label, description, ports, gauges, flows, detection)


def _flows_section(t: Table | None, ports) -> tuple[dict[str, str], float | None]:
    """[flows]: the pumping speed at the chamber, and the flow channel of each gas."""
    if t is None:
        return {}, None
    t.only(("pumping_speed", "channels"))
    speed = t.quantity("pumping_speed", "pumping_speed", required=False)
    flow_channels = {c.name for p in ports for c in p.channels if c.quantity == "flow"}
    out: dict[str, str] = {}
    if (c := t.sub("channels")) is not None:
        for name in c.data:
            try:
                gas = find_gas(name)  # the key names the gas, the value its channel
            except ProfileError as e:
                raise c.fail(name, str(e)) from None
            channel = c.string(name)
            if channel not in flow_channels:
                known = ", ".join(sorted(flow_channels)) or "none in this profile"
                raise c.fail(name, f'{channel!r} is not a flow channel ([[port.channel]] quantity = "flow": {known})')
            if gas.key in out:
                raise c.fail(name, f"{gas.key} is given twice")
            out[gas.key] = channel
    return out, speed


def with_profile_fill(profile: BenchProfile, fill: Fill) -> BenchProfile:
    """The profile with another gas fill; its gauges' corrections follow (a factor set by hand stays)."""
    gauges = {ch: c if c.overridden else gauge_correction(c.kind, fill.composition) for ch, c in profile.gauges.items()}
    return replace(profile, bench=with_fill(profile.bench, fill), gauges=gauges)


def save_curve(path: str | os.PathLike[str], curve: BenchCurve) -> BenchProfile:
    """Put ``curve`` into the bench file at ``path`` (replacing any [curve] section), keeping
    the rest of the file as written. The result is validated before an atomic write."""
    ref = os.fspath(path)
    if ref in BUILTIN_BENCHES:
        raise ProfileError(f"bench {ref!r} is built in and cannot be changed; copy it to a file and save there")
    p = Path(ref).expanduser()
    try:
        text = p.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as e:
        raise ProfileError(f"bench {ref!r}: cannot be read ({getattr(e, 'strerror', None) or e})") from None
    new = with_curve_section(text, curve)
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
