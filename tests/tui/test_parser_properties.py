"""Property tests for every reader of outside input: arbitrary text, bytes and JSON give a value
inside the accepted limits, a counted skip, or our own one-line error, never anything else.

Bounded in CI (tests/conftest.py); HYPOTHESIS_PROFILE=thorough searches far longer.
"""

import argparse
import json
import math

from hypothesis import given
from hypothesis import strategies as st
from strikeline.drivers.logbook import Logbook, read_logbook
from strikeline.drivers.reading import Reading, Status
from strikeline.drivers.records import KINDS, record_problem
from strikeline.model.limits import LIMITS, parse_within
from strikeline.model.units import QuantityError
from strikeline.profiles.bench import load_bench
from strikeline.profiles.strikes import parse_strike_csv
from strikeline.tui.session.session import Session
from strikeline.tui.verbs.parser import quantity

json_values = st.recursive(
    st.none()
    | st.booleans()
    | st.integers(-(10**12), 10**12)
    | st.floats(allow_nan=True, allow_infinity=True)
    | st.text(max_size=20),
    lambda children: st.lists(children, max_size=3) | st.dictionaries(st.text(max_size=10), children, max_size=4),
    max_leaves=10,
)
field_names = st.sampled_from(
    ["kind", "t", "t_unix", "mono", "channel", "quantity", "status", "value", "indicated", "pressure_Pa", "gap_m",
     "voltage_V", "code", "level", "change", "event", "field", "accepted", "raw", "readings"]
)  # fmt: skip
records = st.dictionaries(field_names | st.text(max_size=8), json_values, max_size=8) | json_values
small_records = st.dictionaries(field_names, st.none() | st.floats() | st.text(max_size=8) | st.integers(), max_size=6)
RANGES = {"pressure_Pa": (1e-6, 1e6), "gap_m": (1e-6, 10.0), "voltage_V": (1.0, 1e6)}


@given(st.text(max_size=60), st.sampled_from(sorted(LIMITS)))
def test_limits_give_a_value_inside_or_one_line(text, name):
    try:
        v = parse_within(text, name)
    except QuantityError as e:
        assert "\n" not in str(e) and str(e)
    else:
        lim = LIMITS[name]
        assert (v == 0 and lim.allow_zero) or lim.low <= v <= lim.high


@given(st.text(max_size=40), st.sampled_from(["pressure", "gap", "voltage", "temperature", "duration"]))
def test_command_line_quantities_give_a_value_or_an_argparse_error(text, name):
    read = quantity(name, bare_unit="s" if name == "duration" else None)
    try:
        v = read(text)
    except argparse.ArgumentTypeError as e:
        assert "\n" not in str(e)
    else:
        assert LIMITS[name].low <= v <= LIMITS[name].high


@given(records)
def test_record_check_answers_for_any_json(rec):
    problem = record_problem(rec, RANGES)
    assert problem is None or (isinstance(problem, str) and "\n" not in problem and len(problem) < 300)
    if problem is None:  # what passes is what every reader relies on
        assert rec["kind"] in KINDS and math.isfinite(rec["t_unix"])
        for field, (lo, hi) in RANGES.items():
            if rec["kind"] == "strike":
                assert lo <= rec[field] <= hi


@given(st.lists(small_records | st.text(max_size=30), max_size=6), st.booleans())
def test_any_logbook_file_reads_as_records_and_named_skips(tmp_path_factory, items, torn):
    path = tmp_path_factory.mktemp("log") / "l.jsonl"
    text = "\n".join(x if isinstance(x, str) else json.dumps(x) for x in items) + ("" if torn else "\n")
    path.write_text(text)
    log = read_logbook(path, RANGES)
    assert all(record_problem(r, RANGES) is None for r in log.records)
    assert all(isinstance(line, int) and why for line, why in log.skipped)
    # every non-blank line is a record, a named skip, or the torn tail: none vanishes
    assert len(log.records) + len(log.skipped) + log.torn_tail == sum(1 for x in text.split("\n") if x.strip())


@given(st.binary(max_size=300))
def test_any_bytes_read_as_a_logbook_without_error(tmp_path_factory, blob):
    path = tmp_path_factory.mktemp("log") / "l.jsonl"
    path.write_bytes(blob)
    log = read_logbook(path)
    assert all(isinstance(r, dict) for r in log.records)


@given(
    st.lists(
        st.fixed_dictionaries(
            {"channel": st.text(min_size=1, max_size=20), "raw": st.text(max_size=30), "value": st.floats(1e-3, 1e5)}
        ),
        max_size=10,
    )
)
def test_what_the_logbook_writes_reads_back(tmp_path_factory, items):
    path = tmp_path_factory.mktemp("log") / "l.jsonl"
    book = Logbook(path, wall=lambda: 1.8e9)
    book.open(bench="fuzz")
    for x in items:
        book.write("reading", quantity="pressure", status="ok", indicated=x["value"], **x)
    book.close()
    log = read_logbook(path)
    back = [r for r in log.records if r["kind"] == "reading"]
    good = [x for x in items if x["channel"].isprintable() and len(x["channel"]) <= 64]
    assert [(r["channel"], r["raw"], r["value"]) for r in back] == [(x["channel"], x["raw"], x["value"]) for x in good]
    assert len(log.skipped) == len(items) - len(good)  # an unprintable name is skipped on reading, and said


header = st.sampled_from(
    ["pressure_Pa,gap_m,voltage_V", "pressure [mTorr],gap [mm],voltage (kV)", "voltage,gap,pressure", "x,y", ""]
)
cell = st.text(max_size=12) | st.floats(allow_nan=True).map(repr) | st.sampled_from(["20 Pa", "3 cm", "1 kV", ""])


@given(header, st.lists(st.lists(cell, max_size=4), max_size=8))
def test_strike_csv_gives_points_inside_the_limits_or_named_rows(head, rows):
    text = head + "\n" + "\n".join(",".join(r) for r in rows)
    try:
        table = parse_strike_csv(text, "fuzz.csv")
    except ValueError as e:
        assert "\n" not in str(e)
        return
    for p in table.points:
        assert LIMITS["pressure"].low <= p.pressure <= LIMITS["pressure"].high
        assert LIMITS["gap"].low <= p.gap <= LIMITS["gap"].high
        assert LIMITS["voltage"].low <= p.voltage <= LIMITS["voltage"].high
    assert all(x.startswith("line ") and "\n" not in x for x in table.problems)


@given(st.floats(allow_nan=True, allow_infinity=True), st.sampled_from(["pressure", "voltage", "current"]))
def test_the_session_never_uses_a_reading_outside_the_limits(value, quantity_name):
    s = Session(load_bench("demo"), clock=lambda: 0.0)
    channel = {"pressure": "chamber", "voltage": "supply-voltage", "current": "supply-current"}[quantity_name]
    finite = value if math.isfinite(value) else None  # a driver never emits a non-finite value
    s.handle(Reading(channel, quantity_name, finite, Status.OK, "fuzz", 0.0, 1.8e9, "simulated"))
    r = s.latest.get(channel, 0.0)
    if r.usable and quantity_name == "pressure":
        assert LIMITS["pressure"].low <= r.value <= LIMITS["pressure"].high
        assert s.update(0.0).forecast is not None


def _kind_records():
    """Records of a known kind whose fields are often right and sometimes anything."""
    from strikeline.drivers.records import _FIELDS

    likely = st.sampled_from(["ok", "lost", "pressure", "voltage", "chamber", "raised", "watch", "typed", "x" * 70])
    value = json_values | likely | st.floats(1e-3, 1e3) | st.just(1.8e9)

    @st.composite
    def build(draw):
        kind = draw(st.sampled_from(KINDS))
        names = ["t_unix", "mono", "t", *_FIELDS[kind]]
        fields = draw(st.dictionaries(st.sampled_from(names), value, max_size=len(names)))
        if draw(st.booleans()):
            fields["t_unix"] = draw(st.floats(9e8, 8e9) | st.just(1.8e9))
        return {"kind": kind, **fields}

    return build()


@given(_kind_records())
def test_the_compiled_record_check_agrees_with_the_table(rec):
    # drivers/records.py writes each kind's field checks out as one function for speed; the loop over
    # the table stays the reference. Ranges that hold every field with no bound force the loop.
    from strikeline.drivers.records import _FAST, _FIELDS

    everything = {f: (-math.inf, math.inf) for fields in _FIELDS.values() for f in fields}
    assert _FAST[rec["kind"]](rec) == (record_problem(rec, everything) is None)
