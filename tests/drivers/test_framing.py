"""Framing and parsing fed bytes: split frames, floods, garbage, wrong encodings, fuzzing."""

import math
import re

import pytest
from hypothesis import given
from hypothesis import strategies as st
from strikeline.drivers.framing import Analog, ChannelParser, ChannelSpec, LineFramer, RejectedLine
from strikeline.drivers.reading import Status
from strikeline.drivers.stats import PortStats

MBAR = 100.0
SPEC_A = ChannelSpec(
    name="chamber",
    quantity="pressure",
    pattern=re.compile(r"^(?P<status>\d);(?P<value>[-+0-9.Ee]+);(?P<unit>\w+)$"),
    query=b"?P\r",
    units={"mbar": MBAR, "torr": 133.32236842105263, "pa": 1.0},
    status_map={"0": Status.OK, "1": Status.UNDER_RANGE, "2": Status.OVER_RANGE, "3": Status.SENSOR_ERROR},
    over_above=1100 * MBAR,
)


def parse(spec, line: bytes):
    return ChannelParser(spec).parse(line, 1.0, 2.0)


def test_framer_splits_joins_and_keeps_partial_lines():
    f = LineFramer(b"\r")
    assert f.feed(b"0;1.0E-2;mbar\r0;2.0E") == [b"0;1.0E-2;mbar"]
    assert f.feed(b"-2;mbar\r0;3") == [b"0;2.0E-2;mbar"]
    assert f.feed(b"") == []
    f.reset()
    assert f.feed(b".0;mbar\r") == [b".0;mbar"]


def test_framer_handles_a_terminator_split_across_reads():
    f = LineFramer(b"\r\n")
    assert f.feed(b"abc\r") == []
    assert f.feed(b"\ndef\r\n") == [b"abc", b"def"]


def test_framer_drops_and_counts_floods_without_terminator():
    stats = PortStats()
    f = LineFramer(b"\n", max_line=32, stats=stats)
    assert f.feed(b"x" * 10_000) == []
    assert f.feed(b"x" * 10_000 + b"\nok\n") == [b"ok"]
    assert stats.overflow == 1 and stats.lines == 1


def test_parser_reads_values_units_and_statuses():
    r = parse(SPEC_A, b"0;1.5E-2;mbar")
    assert r.value == pytest.approx(1.5) and r.status is Status.OK and r.raw == "0;1.5E-2;mbar"
    assert parse(SPEC_A, b"0;7.5;Torr").value == pytest.approx(7.5 * 101325 / 760, rel=1e-12)  # torr = atm/760
    assert parse(SPEC_A, b"2;9.9E+9;mbar").status is Status.OVER_RANGE
    assert parse(SPEC_A, b"1;0;mbar").status is Status.UNDER_RANGE
    r = parse(SPEC_A, b"3;0;mbar")
    assert r.status is Status.SENSOR_ERROR and r.value is None
    assert parse(SPEC_A, b"0;1200;mbar").status is Status.OVER_RANGE  # the profile's over-range value


@pytest.mark.parametrize(
    "line",
    [
        b"",
        b"garbage",
        b"0;abc;mbar",
        b"0;1.0;furlongs",
        b"7;1.0;mbar",
        b"0;nan;mbar",
        b"0;inf;mbar",
        b"0;-5;mbar",
        b"0;1,0;mbar",
        "0;1.0;mb\u00e4r".encode("latin-1"),
        b"\xff\xfe\x00",
    ],
)
def test_parser_rejects_what_is_not_a_reading(line):
    with pytest.raises(RejectedLine):
        parse(SPEC_A, line)


def test_analog_log_linear_characteristic():
    # p = 10^((U - c)/k) in mbar, the profile's coefficients (ours, for the test).
    spec = ChannelSpec(
        "gauge-volts",
        "pressure",
        re.compile(r"^AIN1 (?P<value>\S+)$"),
        analog=Analog(c=5.5, k=1.0, unit_factor=MBAR, unit="mbar"),
    )
    assert parse(spec, b"AIN1 5.5").value == pytest.approx(1.0 * MBAR)
    assert parse(spec, b"AIN1 3.5").value == pytest.approx(1e-2 * MBAR)


def test_scale_and_offset():
    spec = ChannelSpec("hv", "voltage", re.compile(r"^HV=(?P<value>\S+)$"), unit_factor=1.0, scale=-1.0, offset=0.0)
    assert parse(spec, b"HV=-650").value == pytest.approx(650.0)


FRAMES = st.builds(
    lambda st_, v, u: f"{st_};{v:.4E};{u}".encode(),
    st.sampled_from("0123"),
    st.floats(min_value=1e-9, max_value=1e6),
    st.sampled_from(["mbar", "Torr", "Pa"]),
)


@given(st.lists(FRAMES, min_size=1, max_size=20), st.data())
def test_random_splits_of_valid_frames_give_the_same_readings(frames, data):
    stream = b"".join(f + b"\r" for f in frames)
    cuts = sorted(data.draw(st.lists(st.integers(0, len(stream)), max_size=10)))
    f = LineFramer(b"\r")
    lines = []
    prev = 0
    for c in [*cuts, len(stream)]:
        lines += f.feed(stream[prev:c])
        prev = c
    assert lines == frames


@given(st.binary(max_size=2000), st.integers(1, 64))
def test_fuzz_random_bytes_give_only_well_formed_readings_or_rejects(blob, chunk):
    stats = PortStats()
    f = LineFramer(b"\r", max_line=64, stats=stats)
    p = ChannelParser(SPEC_A)
    lines = []
    for i in range(0, len(blob), chunk):
        lines += f.feed(blob[i : i + chunk])
    assert stats.lines == len(lines)  # every line handed on is counted, and none is longer than allowed
    assert all(len(line) <= 64 and b"\r" not in line for line in lines)
    for line in lines:
        try:
            r = p.parse(line, 0.0, 0.0)
        except RejectedLine:
            continue
        assert r.status in Status
        if r.value is not None:
            assert math.isfinite(r.value) and r.value > 0 and r.status is Status.OK


_UNIT = {b"mbar": 100.0, b"Torr": 101325 / 760, b"Pa": 1.0}


def _in_range_ok(frame: bytes) -> bool:
    status, number, unit = frame.split(b";")
    return status == b"0" and float(number) * _UNIT[unit] < SPEC_A.over_above


# A frame the parser must read back exactly (status ok, in range), or garbage without a terminator.
TAGGED = st.tuples(st.just(True), FRAMES.filter(_in_range_ok)) | st.tuples(
    st.just(False), st.binary(max_size=30).filter(lambda b: b"\r" not in b)
)


@given(st.lists(TAGGED, max_size=60))
def test_fuzz_floods_mixed_with_garbage(items):
    stream = b"".join(item + b"\r" for _, item in items)
    lines = LineFramer(b"\r").feed(stream)
    assert lines == [item for _, item in items]  # framing neither drops, splits nor joins a line
    p = ChannelParser(SPEC_A)
    for is_frame, line in zip((t for t, _ in items), lines, strict=True):
        if is_frame:  # a valid frame reads back as the number and unit that were written
            _st, number, unit = line.split(b";")
            assert p.parse(line, 0.0, 0.0).value == pytest.approx(float(number) * _UNIT[unit], rel=1e-12)
