"""The real pyserial stack: pty pairs, socket:// terminal servers, loop://, simbench://.

Two invented protocols, configured only through bench-profile text, and the faults a bench
meets: missing port, pulled cable, silent device, garbage, a terminal server that goes away.
"""

import threading
import time

import pytest
from fakes import PtyInstrument, Sink, TcpInstrument, wait_for
from strikeline.drivers.hub import Instruments, Latest
from strikeline.drivers.port import PortReader
from strikeline.drivers.reading import Reading, Status
from strikeline.profiles.bench import parse_bench
from strikeline.profiles.fields import ProfileError

BENCH = '[bench]\ngas = "Ar"\ncathode = "Cu"\ngap = "30 mm"\n'

# Protocol A (invented): polled, CR-terminated, "<status>;<value>;<unit>".
PROTOCOL_A = """
[[port]]
name = "ctl"
url = "{url}"
mode = "polled"
terminator = "\\r"
poll_interval = "20 ms"
timeout = "100 ms"
lost_after = 2

[[port.channel]]
name = "chamber"
quantity = "pressure"
query = "?P\\r"
pattern = '^(?P<status>\\d);(?P<value>\\S+);(?P<unit>\\w+)$'
units = ["mbar", "Torr", "Pa"]
status = {{ "0" = "ok", "1" = "under_range", "2" = "over_range", "3" = "sensor_error" }}
gauge = "capacitance"

[[port.channel]]
name = "hv"
quantity = "voltage"
query = "?V\\r"
pattern = '^(?P<status>\\d);(?P<value>\\S+);V$'
unit = "V"
status = {{ "0" = "ok" }}
"""

# Protocol B (invented): streaming, LF-terminated, "PRESSURE=<v> <unit>" and an analog gauge.
PROTOCOL_B = """
[[port]]
name = "stream"
url = "{url}"
mode = "streaming"
terminator = "\\n"
timeout = "50 ms"

[[port.channel]]
name = "chamber"
quantity = "pressure"
pattern = '^PRESSURE=(?P<value>\\S+) (?P<unit>\\w+)$'

[[port.channel]]
name = "backing"
quantity = "pressure"
pattern = '^AIN1 (?P<value>\\S+)$'
analog = {{ c = 5.5, k = 1.0, unit = "mbar" }}
"""


def ports_of(text: str, **kw):
    return parse_bench(BENCH + text.format(**kw), "test-bench.toml", None).ports


@pytest.fixture
def sink():
    return Sink()


def answer_a(values):
    def respond(line: bytes) -> bytes:
        return values.get(line, b"") + b"\r" if values.get(line) is not None else b""

    return respond


def test_protocol_a_over_a_pty(sink):
    values = {b"?P": b"0;1.5E-2;mbar", b"?V": b"0;650;V"}
    dev = PtyInstrument(answer_a(values), terminator=b"\r")
    (spec,) = ports_of(PROTOCOL_A, url=dev.path)
    r = PortReader(spec, sink.emit, sink.event)
    r.start()
    try:
        assert wait_for(lambda: len(sink.of("chamber")) >= 3 and len(sink.of("hv")) >= 3)
        assert sink.of("chamber")[-1].value == pytest.approx(1.5)
        assert sink.of("hv")[-1].value == pytest.approx(650.0)
        values[b"?P"] = b"2;0;mbar"  # the controller reports over-range
        assert wait_for(lambda: sink.of("chamber")[-1].status is Status.OVER_RANGE)
        assert sink.of("chamber")[-1].value is None
        values[b"?P"] = b"#$%garbage"
        assert wait_for(lambda: r.stats.garbled >= 2)
        assert sink.of("chamber")[-1].status is Status.GARBLED and sink.of("chamber")[-1].value is None
        values[b"?P"] = None  # the device stops answering this channel
        assert wait_for(lambda: sink.of("chamber")[-1].status is Status.LOST)
        assert r.stats.timeouts >= 2
        assert sink.of("hv")[-1].status is Status.OK  # the other channel carries on
    finally:
        r.stop()
        dev.close()
    assert not r.alive


def test_an_answer_in_pieces_is_one_reading_and_a_cut_one_is_none(sink):
    # A slow controller sends half an answer, then the rest 30 ms later (inside the 100 ms timeout):
    # one reading. Later it sends half and falls silent: a timeout, never half a value.
    cut = threading.Event()
    dev: PtyInstrument

    def respond(line: bytes) -> bytes:
        if line != b"?P":
            return b"0;650;V\r"
        dev.write(b"0;1.")
        if cut.is_set():
            return b""
        time.sleep(0.03)  # the device's own pace, not a wait in the test
        return b"5E-2;mbar\r"

    dev = PtyInstrument(respond, terminator=b"\r")
    (spec,) = ports_of(PROTOCOL_A, url=dev.path)
    r = PortReader(spec, sink.emit, sink.event)
    r.start()
    try:
        assert wait_for(lambda: len(sink.of("chamber", Status.OK)) >= 3)
        ok = [x.value for x in sink.of("chamber", Status.OK)]
        assert ok == pytest.approx([1.5] * len(ok))
        assert r.stats.garbled == 0
        cut.set()
        before = r.stats.timeouts
        assert wait_for(lambda: r.stats.timeouts >= before + 2)
        ok = [x.value for x in sink.of("chamber", Status.OK)]
        assert ok == pytest.approx([1.5] * len(ok))
        assert r.stats.garbled == 0
    finally:
        r.stop()
        dev.close()


def test_pty_unplugged_mid_run_is_lost_and_keeps_trying(sink):
    dev = PtyInstrument(answer_a({b"?P": b"0;1.0;mbar", b"?V": b"0;1;V"}), terminator=b"\r")
    (spec,) = ports_of(PROTOCOL_A, url=dev.path)
    r = PortReader(spec, sink.emit, sink.event, backoff=(0.01, 0.05))
    r.start()
    try:
        assert wait_for(lambda: len(sink.of("chamber", Status.OK)) >= 2)
        dev.unplug()
        assert wait_for(lambda: bool(sink.of("chamber", Status.LOST)))
        assert any(kind == "lost" for _, kind, _ in sink.events)
        before = r.stats.faults
        assert wait_for(lambda: r.stats.faults > before + 2)  # reopening with backoff
        assert r.alive
    finally:
        r.stop()
    assert not r.alive


def test_port_missing_at_start(sink):
    (spec,) = ports_of(PROTOCOL_A, url="/dev/strikeline-no-such-port")
    r = PortReader(spec, sink.emit, sink.event, backoff=(0.01, 0.02))
    r.start()
    try:
        assert wait_for(lambda: len(sink.of("chamber", Status.LOST)) == 1 and r.stats.faults >= 3)
        assert len(sink.of("chamber", Status.LOST)) == 1  # reported once, not once per retry
    finally:
        r.stop()
    assert not r.alive


def test_protocol_b_streaming_over_a_terminal_server_that_goes_away(sink):
    push = b"PRESSURE=7.5E-3 Torr\nAIN1 3.5\njunk junk\n"
    server = TcpInstrument(push=push, every=0.05)
    (spec,) = ports_of(PROTOCOL_B, url=server.url)
    r = PortReader(spec, sink.emit, sink.event, backoff=(0.01, 0.05))
    r.start()
    try:
        assert wait_for(lambda: sink.of("chamber") and sink.of("backing"))
        assert sink.of("chamber")[0].value == pytest.approx(7.5e-3 * 101325 / 760)
        assert sink.of("backing")[0].value == pytest.approx(1.0)  # 10^((3.5 - 5.5)/1) mbar
        assert wait_for(lambda: r.stats.garbled >= 1)  # "junk junk": counted, no reading
        port = server.port
        server.stop()
        assert wait_for(lambda: bool(sink.of("chamber", Status.LOST)))
        server = TcpInstrument(push=push, port=port, every=0.05)  # back on the same address
        n = len(sink.of("chamber", Status.OK))
        assert wait_for(lambda: len(sink.of("chamber", Status.OK)) > n, timeout=10)
        assert r.stats.reconnects >= 1
    finally:
        r.stop()
        server.stop()


def test_flood_of_lines_is_counted_not_backed_up(sink):
    push = b"PRESSURE=1.0E-2 mbar\n" * 5000 + b"x" * 100_000 + b"\nPRESSURE=2.0E-2 mbar\n"
    server = TcpInstrument(push=push)
    (spec,) = ports_of(PROTOCOL_B, url=server.url)
    r = PortReader(spec, sink.emit, sink.event)
    r.start()
    try:
        assert wait_for(lambda: len(sink.of("chamber")) >= 5001, timeout=10)
        assert sink.of("chamber")[-1].value == pytest.approx(2.0)
        assert r.stats.overflow >= 1
    finally:
        r.stop()
        server.stop()


def test_loop_url_reads_back_its_own_frame(sink):
    # loop:// echoes what is written; a query that is itself a valid frame reads back as a value,
    # and one that is not is counted as garbled, never taken for a value.
    text = PROTOCOL_A.replace('query = "?P\\r"', 'query = "0;4.2E-1;mbar\\r"')
    (spec,) = ports_of(text, url="loop://")
    r = PortReader(spec, sink.emit, sink.event)
    r.start()
    try:
        assert wait_for(lambda: len(sink.of("chamber", Status.OK)) >= 2)
        assert sink.of("chamber", Status.OK)[0].value == pytest.approx(42.0)
        assert wait_for(lambda: bool(sink.of("hv", Status.GARBLED)))  # "?V" echoed back
        assert not [x for x in sink.of("hv") if x.value is not None]
    finally:
        r.stop()


def test_simbench_url_runs_the_demo_through_the_real_driver(sink):
    demo_port = parse_bench(
        BENCH
        + """
[[port]]
name = "sim"
url = "simbench://demo?seed=3&speed=200&gauge_factor=1.6&drop_after=30"
poll_interval = "5 ms"
timeout = "50 ms"
lost_after = 2
[[port.channel]]
name = "chamber"
quantity = "pressure"
query = "MEAS P1\\r\\n"
pattern = '^P1,(?P<status>\\w+),(?P<value>\\S+)$'
unit = "mbar"
status = { OK = "ok" }
""",
        "t.toml",
        None,
    ).ports
    r = PortReader(demo_port[0], sink.emit, sink.event)
    r.start()
    try:
        assert wait_for(lambda: len(sink.of("chamber", Status.OK)) >= 5)
        ok = sink.of("chamber", Status.OK)
        assert ok[0].source == "simulated"
        assert ok[0].value > ok[-1].value  # pump-down
        assert wait_for(lambda: bool(sink.of("chamber", Status.LOST)), timeout=10)  # went silent
    finally:
        r.stop()


def test_stale_after_the_channel_limit_with_a_replaced_clock():
    latest = Latest({"chamber": 1.0})
    latest.update(Reading("chamber", "pressure", 5.0, Status.OK, "5", 100.0, 0.0))
    assert latest.get("chamber", 100.5).status is Status.OK
    assert latest.get("chamber", 101.5).status is Status.STALE
    assert not latest.get("chamber", 101.5).usable
    latest.update(Reading("chamber", "pressure", 6.0, Status.OK, "6", 101.6, 0.0))
    assert latest.get("chamber", 101.7).usable


def test_instruments_start_and_stop_every_thread(sink):
    before = threading.active_count()
    dev = PtyInstrument(answer_a({b"?P": b"0;1.0;mbar", b"?V": b"0;1;V"}), terminator=b"\r")
    inst = Instruments(ports_of(PROTOCOL_A, url=dev.path), sink.emit, sink.event)
    inst.start()
    assert wait_for(lambda: len(sink.readings) >= 2)
    inst.stop()
    dev.close()
    assert wait_for(lambda: threading.active_count() <= before)


def _port(port: str = "", channel: str | None = None) -> str:
    text = f'[[port]]\nurl = "loop://"\n{port}'
    if channel is not None:
        text += f'[[port.channel]]\nname = "p"\n{channel}'
    return text


_VALUE = 'pattern = "(?P<value>.*)"\n'
_STREAM = 'mode = "streaming"\n'


@pytest.mark.parametrize(
    ("snippet", "needle"),
    [
        (_port(), "give at least one [[port.channel]]"),
        (_port("", 'quantity = "pressure"\npattern = "("\n'), "not a valid regular"),
        (_port("", 'quantity = "pressure"\npattern = "x"\n'), "(?P<value>...)"),
        (_port("", 'quantity = "pressure"\n' + _VALUE + 'unit = "mbar"\n'), "query: missing"),
        (_port(_STREAM, 'quantity = "pressure"\n' + _VALUE), "unit: missing"),
        (_port(_STREAM, 'quantity = "flux"\n' + _VALUE), "'flux' is not one of"),
        (
            _port(_STREAM, 'quantity = "pressure"\n' + _VALUE + 'unit = "mbar"\nstatus = { X = "fine" }\n'),
            "'fine' is not one of ok",
        ),
        (
            _port(_STREAM, 'quantity = "voltage"\n' + _VALUE + 'unit = "V"\ngauge = "thermal"\n'),
            "only a pressure channel",
        ),
    ],
)
def test_bad_port_sections_name_file_and_field(snippet, needle):
    with pytest.raises(ProfileError) as e:
        parse_bench(BENCH + snippet, "test-bench.toml", None)
    assert str(e.value).startswith("test-bench.toml:") and needle in str(e.value)


def test_a_consumer_that_raises_is_reported_and_the_port_stays_up(sink, caplog):
    # One reading path: a bug in what consumes readings (a TypeError on every call) is never counted as
    # an instrument fault. The port is not lost, does not reconnect, the readings keep coming, and the
    # error is reported once per call with its traceback in the log.
    dev = PtyInstrument(answer_a({b"?P": b"0;1.0;mbar", b"?V": b"0;1;V"}), terminator=b"\r")
    errors = []

    def broken(r):
        sink.emit(r)
        raise TypeError("a bug in the consumer")

    inst = Instruments(ports_of(PROTOCOL_A, url=dev.path), broken, sink.event, on_error=errors.append)
    inst.start()
    try:
        assert wait_for(lambda: len(sink.readings) >= 6 and len(errors) >= 6)
    finally:
        inst.stop()
        dev.close()
    (stats,) = inst.stats().values()
    assert stats.faults == 0 and stats.reconnects == 0 and stats.readings >= 6
    assert not any(kind == "lost" for _port, kind, _text in sink.events)
    assert inst.consumer_errors >= 6 and "TypeError: a bug in the consumer" in errors[0]
    assert "Traceback" in caplog.text or any(r.exc_info for r in caplog.records)
