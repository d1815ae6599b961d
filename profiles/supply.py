"""The [supply] and [strike_detect] sections of a bench profile.

A supply is DC, pulsed DC, or AC (any alternating supply: mid-frequency AC or RF) with a frequency.
An AC supply's voltage is written as its amplitude (``amplitude``, the peak across the electrodes),
``voltage_rms`` or ``voltage_pp`` (peak-to-peak); the model keeps the amplitude.

[strike_detect] holds the thresholds that turn instrument readings into a proposed strike mark;
every one has a default that is common practice (and says so in :data:`DETECT_DEFAULTS`).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..model.bench import Supply
from ..model.units import to_amplitude
from .fields import Table

__all__ = ["DETECT_DEFAULTS", "MODES", "StrikeDetection", "detect_section", "supply_section"]

MODES = ("dc", "pulsed", "ac")
_AC_VOLTAGE = {"amplitude": "peak", "voltage_rms": "rms", "voltage_pp": "pp"}


@dataclass(frozen=True)
class StrikeDetection:
    """When readings say the gas broke down (SI)."""

    dark_current: float = 1e-3
    """A: below this the gap is taken as dark (no discharge)."""
    lit_current: float = 5e-3
    """A: a current rising from dark to above this is ignition."""
    voltage_fall: float = 0.1
    """Share the supply's voltage read-back falls by at ignition (DC)."""
    bias_on: float = 10.0
    """V: a DC self-bias appearing beyond this (from under a fifth of it) is ignition (RF)."""
    reflected_fall: float = 0.5
    """Share the reflected power drops by at ignition (RF)."""
    window: float = 2.0
    """s: the changes count when they happen within this time."""


DETECT_DEFAULTS = StrikeDetection()
"""Common practice: a dark gap draws well under a milliampere and a glow several; the supply's
voltage falls by a tenth or more when it strikes; an RF plasma shows a self-bias of tens of volts
and changes the load the match sees, so reflected power drops sharply (values common practice)."""


def supply_section(s: Table) -> Supply:
    """The [supply] section."""
    mode = s.string("mode", default="dc", choices=MODES).casefold()
    if mode == "ac":
        s.only(("mode", "frequency", "current_limit", *_AC_VOLTAGE))
        given = [k for k in _AC_VOLTAGE if s.has(k)]
        if len(given) != 1:
            raise s.fail(
                "amplitude",
                "give the electrodes' voltage once: amplitude (peak), voltage_rms or voltage_pp, e.g. "
                'amplitude = "400 V"' + (f" (got {', '.join(given)})" if given else ""),
            )
        amplitude = to_amplitude(s.quantity(given[0], "voltage"), _AC_VOLTAGE[given[0]])
        return Supply(
            open_circuit_voltage=amplitude,
            current_limit=s.quantity("current_limit", "current", required=False),
            mode="ac",
            frequency=s.quantity("frequency", "frequency"),
        )
    s.only(("open_circuit_voltage", "current_limit", "ballast", "mode", "frequency", "off_time"))
    freq = s.quantity("frequency", "frequency", required=mode == "pulsed")
    off = s.quantity("off_time", "off_time", required=mode == "pulsed")
    if mode == "pulsed" and off >= 1.0 / freq:
        raise s.fail("off_time", f"{s.data['off_time']!r} is not shorter than one period (1/frequency)")
    return Supply(
        open_circuit_voltage=s.quantity("open_circuit_voltage", "voltage"),
        current_limit=s.quantity("current_limit", "current", required=False),
        ballast=s.quantity("ballast", "resistance", required=False) or 0.0,
        mode=mode,
        frequency=freq if mode == "pulsed" else None,
        off_time=off if mode == "pulsed" else None,
    )


def detect_section(t: Table | None) -> StrikeDetection:
    """The [strike_detect] section (defaults where absent)."""
    if t is None:
        return DETECT_DEFAULTS
    t.only(("dark_current", "lit_current", "voltage_fall", "bias_on", "reflected_fall", "window"))
    d = DETECT_DEFAULTS
    out = StrikeDetection(
        dark_current=t.quantity("dark_current", "current", required=False) or d.dark_current,
        lit_current=t.quantity("lit_current", "current", required=False) or d.lit_current,
        voltage_fall=t.number("voltage_fall", 0.01, 0.99, default=d.voltage_fall),
        bias_on=t.quantity("bias_on", "voltage", required=False) or d.bias_on,
        reflected_fall=t.number("reflected_fall", 0.01, 0.99, default=d.reflected_fall),
        window=t.quantity("window", "duration", required=False) or d.window,
    )
    if not out.dark_current < out.lit_current:
        raise t.fail("lit_current", f"{t.data.get('lit_current')!r} is not above dark_current")
    return out
