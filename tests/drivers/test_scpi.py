"""SCPI over VISA, against pyvisa-sim with an instrument definition of our own invention
(tests/instruments/hv-meter.yaml): values, an unparseable answer, a timeout, identification."""

from pathlib import Path

import pytest
from fake_modbus import free_port
from fakes import Sink, TcpInstrument, wait_for
from strikeline.drivers.hub import Instruments
from strikeline.drivers.reading import Status
from strikeline.profiles.bench import parse_bench
from strikeline.profiles.fields import ProfileError
from strikeline.tui import cli

pytestmark = pytest.mark.timeout(60)
SIM = Path(__file__).resolve().parents[1] / "instruments" / "hv-meter.yaml"
BENCH = '[bench]\ngas = "Ar"\ncathode = "Cu"\ngap = "30 mm"\n'
PORT = f"""
[[port]]
name = "meter"
protocol = "scpi"
resource = "TCPIP::192.0.2.10::5025::SOCKET"
backend = "{SIM}@sim"
poll_interval = "20 ms"
timeout = "100 ms"
lost_after = 2

[[port.channel]]
name = "supply-voltage"
quantity = "voltage"
query = "MEAS:VOLT?"
unit = "V"

[[port.channel]]
name = "supply-current"
quantity = "current"
query = "MEAS:CURR?"
unit = "A"

[[port.channel]]
name = "chamber"
quantity = "pressure"
query = "MEAS:PRES?"
pattern = '^P,(?P<value>[^,]+),(?P<unit>\\w+),(?P<status>\\w+)$'
units = ["mbar", "Torr"]
status = {{ OK = "ok", OVER = "over_range" }}
gauge = "capacitance"

[[port.channel]]
name = "argon-flow"
quantity = "flow"
query = "MEAS:FLOW?"
unit = "sccm"

[[port.channel]]
name = "overload"
quantity = "current"
query = "MEAS:OVLD?"
unit = "A"

[[port.channel]]
name = "temperature-probe"
quantity = "voltage"
query = "MEAS:TEMP?"
unit = "V"
"""


def test_values_garbage_and_timeouts_through_a_simulated_visa_resource():
    ports = parse_bench(BENCH + PORT, "meter.toml", None).ports
    sink = Sink()
    inst = Instruments(ports, sink.emit, sink.event)
    reader = inst.readers[0]
    inst.start()
    try:
        assert wait_for(lambda: sink.last("temperature-probe") is not None and sink.last("argon-flow"), timeout=10)
        assert ("meter", "identified", "Strikeline Test Bench,HV-METER 3,0001,1.0") in sink.events
        assert sink.last("supply-voltage").value == pytest.approx(650.2)
        assert sink.last("supply-current").value == pytest.approx(0.021)
        assert sink.last("chamber").value == pytest.approx(1.5)  # 1.50E-02 mbar, unit named in the answer
        assert sink.last("argon-flow").value == pytest.approx(20.0 * 101325e-6 / 60)
        assert sink.last("chamber").source == "visa"
        # an answer that does not parse is refused, with the raw answer kept
        bad = sink.last("overload")
        assert bad.status is Status.GARBLED and bad.value is None and bad.raw.startswith("OVLD")
        # no answer in time: unanswered, then lost after lost_after polls; the others carry on
        assert wait_for(lambda: sink.last("temperature-probe").status is Status.LOST, timeout=10)
        assert "no answer to 2 polls" in sink.last("temperature-probe").raw
        assert reader.stats.timeouts >= 2 and reader.stats.garbled >= 1
        assert sink.last("supply-voltage").status is Status.OK
    finally:
        inst.stop()
    assert not reader.alive


def test_gauge_verb_reads_a_visa_port(tmp_path, capsys):
    bench = tmp_path / "meter.toml"
    bench.write_text(BENCH + PORT)
    assert cli.main(["gauge", "--bench", str(bench), "--samples", "4"]) == 0
    out, err = capsys.readouterr()
    assert "supply-voltage" in out and "650 V" in out
    assert "# meter: identified Strikeline Test Bench,HV-METER 3,0001,1.0" in err


def _pyvisa_py(port: int) -> str:
    """The profile read through the real pure-Python backend, at a socket on this machine."""
    return (
        (BENCH + PORT)
        .replace("TCPIP::192.0.2.10::5025::SOCKET", f"TCPIP::127.0.0.1::{port}::SOCKET")
        .replace(f"{SIM}@sim", "@py")
    )


def test_the_default_backend_reads_a_socket_instrument():
    # pyvisa-py (the default, no vendor VISA) against a SCPI answering machine on a local socket.
    answers = {b"*IDN?": b"Strikeline Test Bench,HV-METER 3,0002,1.1\n", b"MEAS:VOLT?": b"640.5\n",
               b"MEAS:PRES?": b"P,2.00E-02,MBAR,OK\n"}  # fmt: skip
    dev = TcpInstrument(lambda line: answers.get(line.strip(), b"ERROR\n"), terminator=b"\n")
    sink = Sink()
    inst = Instruments(parse_bench(_pyvisa_py(dev.port), "meter.toml", None).ports, sink.emit, sink.event)
    inst.start()
    try:
        assert wait_for(lambda: sink.last("chamber") is not None and sink.last("supply-voltage") is not None)
        assert sink.last("supply-voltage").value == pytest.approx(640.5)
        assert sink.last("chamber").value == pytest.approx(2.0)
        assert ("meter", "identified", "Strikeline Test Bench,HV-METER 3,0002,1.1") in sink.events
        assert sink.last("supply-current").status is Status.GARBLED  # "ERROR" is not a number
    finally:
        inst.stop()
        dev.stop()


def test_a_resource_that_is_not_there_is_lost_and_retried():
    sink = Sink()
    inst = Instruments(parse_bench(_pyvisa_py(free_port()), "meter.toml", None).ports, sink.emit, sink.event)
    inst.start()
    try:
        assert wait_for(lambda: sink.last("chamber") is not None and inst.readers[0].stats.faults >= 2)
        assert sink.last("chamber").status is Status.LOST and "Connection refused" in sink.last("chamber").raw
        assert len([r for r in sink.readings if r.channel == "chamber"]) == 1  # said once, retried quietly
    finally:
        inst.stop()


@pytest.mark.parametrize(
    ("change", "needle"),
    [
        (("TCPIP::192.0.2.10::5025::SOCKET", "192.0.2.10:5025"), "is not a VISA resource string"),
        ((f"{SIM}@sim", "nivisa"), 'is not "@py" (pyvisa-py)'),
        (('query = "MEAS:VOLT?"\n', ""), "query: missing; give the instrument's command"),
        (("pattern = '^P,", "pattern = '^P,("), "not a valid regular expression"),
        (('protocol = "scpi"', 'protocol = "gpib"'), "protocol: 'gpib' is not one of lines, modbus, scpi"),
        (('timeout = "100 ms"', 'timeout = "5 min"'), "outside 0.001 to 60 s"),
    ],
)
def test_bad_scpi_sections_name_the_field(change, needle):
    with pytest.raises(ProfileError) as e:
        parse_bench(BENCH + PORT.replace(*change, 1), "meter.toml", None)
    assert str(e.value).startswith("meter.toml: [port #1") and needle in str(e.value), str(e.value)
