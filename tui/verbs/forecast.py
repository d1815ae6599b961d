"""The forecast verbs: ``strike`` (one operating point), ``curve`` (the breakdown curve as CSV), ``gases``."""

from __future__ import annotations

import argparse
import sys
from dataclasses import replace

from ...model import units
from ...model.limits import check, parse_within
from ...model.units import SYSTEMS, QuantityError, to_amplitude
from ..outputs import print_json
from .parser import UsageError, add_gas, add_verb, count, number, quantity

__all__ = ["add_curve", "add_gases", "add_strike", "bench_for"]

UNIT_CHOICES = tuple(SYSTEMS)


def _common_point(s: argparse.ArgumentParser) -> None:
    s.add_argument(
        "--bench", metavar="FILE", help="bench profile (.toml), or 'demo' / 'demo-magnetron' / 'demo-reactive'"
    )
    add_gas(s)
    s.add_argument("--cathode", help="cathode metal, e.g. Cu, Al, stainless (default: the bench's)")
    s.add_argument(
        "--gamma",
        type=number(1e-6, 1.0, "a secondary-electron yield"),
        help="secondary-electron yield to use instead of the cathode data, above 0 and at most 1, e.g. 0.07",
    )
    s.add_argument(
        "--temperature", type=quantity("temperature"), metavar="T", help="gas temperature, e.g. '300 K' or '20 C'"
    )
    s.add_argument(
        "--frequency",
        type=quantity("frequency"),
        metavar="F",
        help="frequency of an alternating (AC or RF) voltage, e.g. '13.56 MHz' or '40 kHz' (default: the bench "
        "supply's if it is AC, else DC); voltages are then amplitudes (peak) across the electrodes",
    )


def add_strike(sub) -> None:
    s = add_verb(
        sub,
        "strike",
        "forecast one operating point",
        "Forecast one operating point. A mixture (--gas argon:80,oxygen:20) is solved by Townsend's criterion "
        "with attachment and linear mixing: alpha/N and eta/N are the mole-fraction sums of the gases', gamma is "
        "each gas's weighted by its share of the ionisation, and the breakdown band is widened by 10 %; Penning "
        "pairs are flagged, not modelled. Given as flows (--gas argon:40sccm,oxygen:8sccm) with --pumping-speed, "
        "the fill also gives the expected partial pressures (steady state, every gas pumped alike) and the target "
        "mode; --film and --current give the charging time of the target's film. With --frequency (or an AC "
        "bench) the voltage is an alternating amplitude: RF breakdown is volume breakdown (ionisation at the "
        "effective field against diffusion over a gap the electrons' swing shrinks, so the curve turns back and "
        "has two branches at low pressure, +/-50 % for the swarm data), and at low frequency each half cycle "
        "breaks down as DC; the regime and both branches are reported.",
    )
    _common_point(s)
    s.add_argument(
        "--pressure", type=quantity("pressure"), metavar="P", help="true gas pressure, e.g. '0.5 Pa', '20 mTorr'"
    )
    s.add_argument("--gap", type=quantity("gap"), metavar="D", help="electrode gap, e.g. 40mm (default: the bench's)")
    s.add_argument(
        "--voltage",
        type=quantity("voltage"),
        metavar="V",
        help="applied voltage, e.g. 600V (default: the bench supply's)",
    )
    s.add_argument(
        "--current",
        type=quantity("current"),
        metavar="I",
        help="discharge current, e.g. '2 A' (default: the load line's), for charging arcs on a target film",
    )
    s.add_argument(
        "--pumping-speed",
        type=quantity("pumping_speed"),
        metavar="S",
        help="pumping speed at the chamber, e.g. '250 l/s' (default: the bench's); with --gas given as flows "
        "it gives the target mode",
    )
    s.add_argument("--film", help="film a reactive process grows on the target: " + ", ".join(_film_names()))
    s.add_argument(
        "--voltage-is",
        choices=("peak", "rms", "pp"),
        help="how --voltage of an alternating supply is quoted: peak (amplitude, the default), rms or pp "
        "(peak-to-peak); the text output quotes all three",
    )
    s.add_argument("--units", choices=UNIT_CHOICES, default="SI", help="units of the text output")
    s.add_argument("--json", action="store_true", help="print the forecast as JSON (SI units)")
    s.set_defaults(run=cmd_strike)


def _film_names() -> tuple[str, ...]:
    from ...profiles.fill import films

    return tuple(films())


def add_curve(sub) -> None:
    c = add_verb(
        sub,
        "curve",
        "the breakdown curve as CSV",
        "Print the breakdown curve as CSV. With --gap, --from/--to are pressures; without it they are pd "
        "values such as '0.1 Torr cm'. A magnetised bench is swept in pressure at its gap (the crossed-field "
        "effective pressure depends on p), and its reduced_pd column includes that effective pressure. "
        "Default: two decades either side of the minimum. The law column says which law gave each point "
        '(a mixture: "mixture"), the constants column textbook, mixed or bench-curve, the gas column the fill.',
    )
    _common_point(c)
    c.add_argument("--gap", type=quantity("gap"), metavar="D", help="fix the gap and sweep pressure")
    c.add_argument("--from", dest="start", metavar="X", help="start of the sweep (pd, or pressure with --gap)")
    c.add_argument("--to", dest="stop", metavar="X", help="end of the sweep")
    c.add_argument(
        "--points",
        type=count(2, 1_000_000, "a number of points"),
        default=200,
        help="number of points, log-spaced (default 200, at most 1000000)",
    )
    c.set_defaults(run=cmd_curve)


def add_gases(sub) -> None:
    g = add_verb(sub, "gases", "gas and cathode data with sources", "List gas and cathode data with sources.")
    g.add_argument("--json", action="store_true", help="print as JSON (SI units)")
    g.set_defaults(run=cmd_gases)


def bench_for(args: argparse.Namespace, *, need_gap: bool):
    """The bench the verb works on: a profile, or one built from --gas/--cathode."""
    return bench_and_flows(args, need_gap=need_gap)[0]


def bench_and_flows(args: argparse.Namespace, *, need_gap: bool):
    """The bench the verb works on, and the flows --gas gave ((gas, Pa m^3/s), ...; empty for parts)."""
    from ...model.bench import Bench
    from ...profiles.bench import load_bench
    from ...profiles.fill import read_fill, with_fill
    from ...profiles.gasdata import find_cathode

    fill = None if args.gas is None else read_fill(args.gas)
    if args.bench is not None:
        bench = load_bench(args.bench).bench
        if fill is not None:
            bench = with_fill(bench, fill)
        if args.cathode is not None:
            bench = replace(bench, cathode=find_cathode(args.cathode), gamma=None, curve=None)
    else:
        if args.gas is None or args.cathode is None:
            missing = " and ".join(o for o, v in (("--gas", args.gas), ("--cathode", args.cathode)) if v is None)
            raise UsageError(f"strikeline {args.verb}: {missing} needed (or --bench FILE / --bench demo)")
        gap = getattr(args, "gap", None)
        if need_gap and gap is None:
            raise UsageError(f"strikeline {args.verb}: --gap needed without --bench, e.g. --gap 40mm")
        bench = Bench(name="command line", fill=fill.composition, cathode=find_cathode(args.cathode), gap=gap or 1.0)
    gamma = getattr(args, "gamma", None)  # verbs without the option (fit) simply have none
    if gamma is not None:
        bench = replace(bench, gamma=gamma)
    temperature = getattr(args, "temperature", None)
    if temperature is not None:
        bench = replace(bench, gas_temperature=temperature)
    return bench, () if fill is None else fill.flows


def cmd_strike(args: argparse.Namespace) -> int:
    from ...model.bench import OperatingPoint
    from ...model.forecast import forecast
    from ...profiles.fill import find_film
    from ..text import forecast_text

    bench, flows = bench_and_flows(args, need_gap=True)
    if args.pumping_speed is not None:
        bench = replace(bench, pumping_speed=args.pumping_speed)
    if args.film is not None:
        bench = replace(bench, film=find_film(args.film))
    pressure = args.pressure if args.pressure is not None else bench.pressure
    if pressure is None:
        raise UsageError("strikeline strike: --pressure needed, e.g. --pressure '0.5 Pa'")
    gap = args.gap if args.gap is not None else bench.gap
    voltage = args.voltage
    if args.voltage_is is not None:
        ac = args.frequency is not None or (bench.supply is not None and bench.supply.mode == "ac")
        if not ac or voltage is None:
            raise UsageError(
                "strikeline strike: --voltage-is says how the --voltage of an alternating supply is quoted; "
                "give --voltage and --frequency (or an AC bench)"
            )
        voltage = to_amplitude(voltage, args.voltage_is)
    point = OperatingPoint(pressure, gap, voltage, bench.gas_temperature, flows, args.current, args.frequency)
    f = forecast(point, bench)
    if args.json:
        print_json(f.to_json())
    else:
        print(forecast_text(f, args.units))
    return 0


def cmd_curve(args: argparse.Namespace) -> int:
    import numpy as np

    from ...model.curve import curve_of, frequency_of
    from ...model.forecast import law_name

    bench = bench_for(args, need_gap=args.frequency is not None)
    freq = frequency_of(bench, args.frequency)
    gap = args.gap  # a pd sweep unless --gap is given, even with a bench...
    if gap is None and (bench.magnetic_field is not None or freq is not None):
        gap = bench.gap  # ...but a magnetised cathode's effective pressure needs p itself, and an AC curve w d
    c = curve_of(bench, frequency=freq, gap=gap if gap is not None else bench.gap)
    pd_min, _ = c.minimum
    what = "pressure" if gap is not None else "pd"

    def read(text: str | None, default: float, option: str) -> float:
        if text is None:
            return default
        if gap is not None:
            return parse_within(text, "pressure", label=option)
        try:
            pd = units.parse_pd(text, name=option)
        except QuantityError as e:
            raise QuantityError(f"{e} (without --gap the sweep is in pd; add --gap to sweep pressure)") from None
        return check(pd, "pd", label=option, text=text)

    # Defaults span two decades either side of the minimum, in actual (not reduced) units.
    lo_default, hi_default = pd_min / 100, pd_min * 100
    if gap is not None:
        lo_default, hi_default = lo_default / gap, hi_default / gap
    lo = read(args.start, lo_default, "--from")
    hi = read(args.stop, hi_default, "--to")
    if not lo < hi:
        raise UsageError(
            f"strikeline curve: --from must be below --to (got {lo:g} and {hi:g} {'Pa' if gap else 'Pa m'})"
        )
    xs = np.geomspace(lo, hi, args.points)
    pd = xs * gap if gap is not None else xs
    rpd = c.reduced(xs, gap)[0] if gap is not None else pd * c.scale
    vb, w = c.law.voltage(rpd)
    br = c.law.branch(rpd)
    if c.alternating:
        regimes, upper = c.law.regimes(rpd), c.law.upper(rpd)
    else:
        regimes, upper = np.full(np.shape(vb), "dc"), np.full(np.shape(vb), np.nan)
    fixed_name = "alternating" if c.alternating else None
    out = sys.stdout
    cols = (["pressure_Pa", "gap_m"] if what == "pressure" else []) + [
        "pd_Pa_m",
        "reduced_pd_Pa_m",
        "breakdown_V",
        "branch",
        "law",
        "constants",
        "gas",
        "regime",
        "upper_V",
    ]
    source = "bench-curve" if c.fitted is not None else ("mixed" if not bench.fill.pure else "textbook")
    gas = f'"{bench.composition}"' if "," in bench.composition else bench.composition  # CSV quoting
    out.write(",".join(cols) + "\n")
    for i in range(len(xs)):
        v = "" if not np.isfinite(vb[i]) else f"{vb[i]:.10g}"
        row = ([f"{xs[i]:.10g}", f"{gap:.10g}"] if what == "pressure" else []) + [
            f"{pd[i]:.10g}",
            f"{rpd[i]:.10g}",
            v,
            str(br[i]),
            fixed_name or law_name(w[i], bench.fill.pure),
            source,
            gas,
            str(regimes[i]),
            "" if not np.isfinite(upper[i]) else f"{upper[i]:.10g}",
        ]
        out.write(",".join(row) + "\n")
    return 0


def cmd_gases(args: argparse.Namespace) -> int:
    from ..gastext import gases_json, gases_text

    if args.json:
        print_json(gases_json())
    else:
        print(gases_text())
    return 0
