"""Bench calibration: recovery, honest intervals, refusals, CSV, saving.

The fitted curve is the fill's own law with its ionisation (A), field (B) and gamma scaled
(model/calibration.py). The outside checks: the strikes of an invented bench are drawn from argon's
law under known scales with log-normal scatter (numpy's generator), and the fit must find those
scales, state intervals that cover them at their nominal rate (the Student-t quantile from scipy.stats)
and predict held-out strikes to the scatter they were drawn with.
"""

import csv
import io
import json

import numpy as np
import pytest
from strikeline.model.bench import Bench, OperatingPoint
from strikeline.model.calibration import FitRefused, ScaledLaw, fit_curve, prediction_band
from strikeline.model.composition import pure
from strikeline.model.curve import dc_law
from strikeline.model.forecast import forecast
from strikeline.profiles.bench import load_bench, parse_bench
from strikeline.profiles.fields import ProfileError
from strikeline.profiles.gasdata import find_cathode, find_gas
from strikeline.profiles.strikes import parse_strike_csv
from strikeline.tui import cli
from strikeline.tui.session.marks import StrikeMark

LAW = dc_law(Bench("t", pure(find_gas("Ar")), find_cathode("Cu"), 0.03))  # argon on copper, scales 1
TRUE = np.log([1.3, 0.9, 1.0])  # an invented bench: ionisation x1.3, field x0.9 (ln of the scales)
PD_MIN = LAW.minimum()[0]


def synthetic(seed, n=12, noise=0.03, lo=0.45, hi=10.0, truth=TRUE):
    rng = np.random.default_rng(seed)
    pd = np.geomspace(lo, hi, n)
    v = ScaledLaw(LAW).voltage(pd, truth) * np.exp(rng.normal(0, noise, n))
    return pd, v


def _scales(curve):
    return np.log([curve.alpha_scale, curve.field_scale, curve.gamma_scale])


def test_recovers_known_scales_from_noisy_strikes():
    pd, v = synthetic(0, n=40, noise=0.02)
    c = fit_curve(pd, v, LAW, free=("A", "B")).curve
    assert c.alpha_scale == pytest.approx(1.3, rel=0.03) and c.field_scale == pytest.approx(0.9, rel=0.03)
    truth = np.log([1.0, 0.9, 0.6])  # a cathode that emits less: gamma x0.6
    pd, v = synthetic(0, n=40, noise=0.02, lo=0.3, truth=truth)
    c = fit_curve(pd, v, LAW, free=("B", "gamma")).curve
    assert c.gamma_scale == pytest.approx(0.6, rel=0.15) and c.field_scale == pytest.approx(0.9, rel=0.03)
    assert c.alpha_scale == 1.0  # not free: kept at the default


def test_stated_intervals_cover_the_truth_at_about_their_nominal_rate():
    # 95 % intervals over 200 seeds: expect 190; a binomial 3-sigma window is about +/-9.
    hits = np.zeros(2)
    n = 200
    for seed in range(n):
        pd, v = synthetic(seed)
        c = fit_curve(pd, v, LAW, free=("A", "B")).curve
        sig = np.array(c.sigmas[:2])
        hits += np.abs(_scales(c)[:2] - TRUE[:2]) <= c.t_quantile * sig
    rate = hits / n
    assert np.all(rate > 0.89) and np.all(rate < 0.995), rate


def test_prediction_band_covers_new_strikes_at_about_its_nominal_rate():
    # One fit's band can be narrow by chance (its scatter estimate is itself random), so the
    # 95 % claim is checked on average over fits: 40 fits x 200 new strikes each.
    rates = []
    for seed in range(40):
        pd, v = synthetic(seed, n=15)
        c = fit_curve(pd, v, LAW, free=("A", "B")).curve
        new_pd, new_v = synthetic(1000 + seed, n=200)
        _, lo, hi = prediction_band(c, LAW, new_pd)
        rates.append(np.mean((new_v >= lo) & (new_v <= hi)))
    assert 0.92 < np.mean(rates) < 0.98


def test_held_out_strikes_are_predicted_to_their_scatter():
    # Fit every other strike of a bench that scatters 2 % about its own curve; the held-out half is
    # predicted with an rms miss under 3 % (the scatter itself plus the fit's own uncertainty).
    misses = []
    for seed in range(20):
        pd, v = synthetic(seed, n=24, noise=0.02, lo=0.4, hi=8.0)
        c = fit_curve(pd[::2], v[::2], LAW, free=("A", "B")).curve
        predicted, _lo, _hi = prediction_band(c, LAW, pd[1::2])
        misses.append(predicted / v[1::2] - 1)
    assert np.sqrt(np.mean(np.square(misses))) < 0.03


@pytest.mark.parametrize(
    ("kw", "needle"),
    [
        ({"n": 3, "free": ("A", "B")}, "too few points: 3 strike(s) for 2 free parameter(s)"),
        ({"n": 12, "free": ("A", "gamma")}, "only A / ln(1 + 1/gamma) counts"),
        ({"n": 12, "free": ("A", "B", "gamma")}, "only A / ln(1 + 1/gamma) counts"),
        ({"n": 12, "free": ("B", "gamma"), "lo": 3.0, "hi": 10.0}, "record strikes on the other side of the minimum"),
        ({"n": 12, "free": ("A", "B"), "lo": 3.0, "hi": 3.2}, "too narrow"),
    ],
)
def test_unsupported_fits_are_refused_with_a_reason(kw, needle):
    free = kw.pop("free")
    pd, v = synthetic(1, **kw)
    with pytest.raises(FitRefused) as e:
        fit_curve(pd, v, LAW, free=free)
    assert needle in str(e.value)


def test_outlier_is_named_and_does_not_drag_the_fit():
    pd, v = synthetic(3, n=15, noise=0.01)
    v[5] *= 1.8
    r = fit_curve(pd, v, LAW, free=("A", "B"))
    assert any("point 6" in w for w in r.warnings)
    assert r.curve.field_scale == pytest.approx(0.9, rel=0.03)


def test_csv_problems_carry_line_numbers():
    t = parse_strike_csv(
        "# my strikes\npressure [Pa],gap [mm],voltage [V]\n20,30,450\n20,,450\nx,30,450\n25,30,400 V\n"
    )
    assert len(t.points) == 2 and [p.line for p in t.points] == [3, 6]
    assert t.problems[0].startswith("line 4: gap is empty") and t.problems[1].startswith("line 5: pressure 'x'")
    with pytest.raises(ValueError, match="line 1: no voltage column"):
        parse_strike_csv("pressure_Pa,gap_m\n1,2\n")
    t = parse_strike_csv("pressure,gap,voltage\n150 mTorr,3 cm,0.45 kV\n20,30,450\n")
    assert t.points[0].voltage == 450.0 and "needs a unit" in t.problems[0]


def _csv(tmp_path, seed=2):
    pd, v = synthetic(seed)
    path = tmp_path / "points.csv"
    T = 293.15
    rows = ["pressure_Pa,gap_m,voltage_V"] + [
        f"{float(x) / 0.03 * T / 273.15!r},0.03,{float(y)!r}" for x, y in zip(pd, v, strict=True)
    ]
    path.write_text("\n".join(rows) + "\n")
    return path


def test_fit_verb_json_contract_and_save(tmp_path, capsys):
    bench = tmp_path / "bench.toml"
    bench.write_text(
        '# my bench\n[bench]\ngas = "Ar"\ncathode = "Cu"\ngap = "30 mm"\ngas_temperature = "293.15 K"\n'
        '[supply]\nopen_circuit_voltage = "600 V"\n'
    )
    assert cli.main(["fit", str(_csv(tmp_path)), "--bench", str(bench), "--json", "--save", str(bench)]) == 0
    d = json.loads(capsys.readouterr().out)
    for k in ("A_per_Pa_m", "B_V_per_Pa_m", "gamma"):
        assert k in d and f"{k}_sigma" in d
    assert d["n_points"] == 12 and len(d["residuals"]) == 12 and isinstance(d["warnings"], list)
    assert d["rms_residual_V"] < d["textbook"]["rms_residual_V"]
    text = bench.read_text()
    assert text.startswith("# my bench") and "[curve]" in text  # the user's file is kept, the curve added
    b = load_bench(bench).bench
    assert b.curve is not None and b.curve.alpha_scale == pytest.approx(d["scales"]["alpha"])
    f = forecast(OperatingPoint(60.0, 0.03, 600.0, 293.15), b)
    assert any(x.code == "bench_curve" for x in f.flags) and "bench curve" in f.constants_source
    textbook = forecast(
        OperatingPoint(60.0, 0.03, 600.0, 293.15), load_bench(bench).bench.__class__(**{**b.__dict__, "curve": None})
    )
    width = lambda fc: fc.breakdown_band[1] - fc.breakdown_band[0]  # noqa: E731
    assert width(f) < width(textbook) / 2  # a fitted curve narrows the margin's uncertainty
    # curve follows the fitted constants too, and says so
    capsys.readouterr()
    assert (
        cli.main(
            ["curve", "--bench", str(bench), "--gap", "30 mm", "--from", "60 Pa", "--to", "61 Pa", "--points", "2"]
        )
        == 0
    )
    (row,) = [r for r in csv.DictReader(io.StringIO(capsys.readouterr().out))][:1]
    assert row["constants"] == "bench-curve" and row["gas"] == "argon"
    assert float(row["breakdown_V"]) == pytest.approx(f.breakdown_voltage, rel=0.02)
    # saving twice replaces the section rather than adding another
    assert cli.main(["fit", str(_csv(tmp_path, seed=5)), "--bench", str(bench), "--save", str(bench)]) == 0
    assert bench.read_text().count("[curve]") == 1


def test_fit_verb_refusals_exit_2(tmp_path, capsys):
    path = _csv(tmp_path)
    assert cli.main(["fit", str(path), "--gas", "Ar", "--cathode", "Cu", "--free", "A,gamma"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("strikeline fit: refused:") and err.count("\n") == 1
    assert cli.main(["fit", str(path), "--gas", "Ar", "--cathode", "Cu", "--free", "A,Q"]) == 2
    assert "'Q' is not one of A, B, gamma" in capsys.readouterr().err
    assert cli.main(["fit", str(path), "--bench", "demo", "--save", "demo"]) == 2
    assert "built-in" in capsys.readouterr().err


def test_curve_for_another_gas_is_refused_on_load(tmp_path):
    base = '[bench]\ngas = "Ar"\ncathode = "Cu"\ngap = "30 mm"\n'
    from strikeline.model.calibration import fit_curve as fc
    from strikeline.profiles.benchcurve import curve_toml

    pd, v = synthetic(1)
    cv = fc(pd, v, LAW, gas="nitrogen", cathode="copper", fitted_on="2026-12-01").curve
    with pytest.raises(ProfileError, match="fitted for nitrogen on copper, but the bench is argon"):
        parse_bench(base + curve_toml(cv), "b.toml", None)


async def test_screen_calibration_view_fits_the_strike_marks():
    from strikeline.tui.screen.build import make_app

    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    pd, v = synthetic(4, n=8)
    for x, y in zip(pd, v, strict=True):
        app.session.strikes.append(StrikeMark(0.0, x / 0.03 * 293.0 / 273.15, 0.03, y, 293.0, "manual"))
    async with app.run_test(size=(100, 36)) as pilot:
        await pilot.press("k")
        await pilot.pause()
        assert app.screen.__class__.__name__ == "CalibrationScreen"
        assert "bench curve for argon on copper: 8 strikes" in app.screen.query_one("#calib-text").content.plain
        await pilot.press("3")  # gamma alone
        await pilot.press("1", "a")
        await pilot.pause()
        assert app.session.bench.curve is not None and app.session.bench.curve.n_points == 8
        assert "bench_curve" in app.query_one("#flags").content.plain
