"""Modbus, against pymodbus's own server (TCP, RTU framing over TCP, and RTU over a serial line).

The device is an invented multi-channel controller whose registers the test fills
(tests/fake_modbus.py); the driver reads it through a bench profile, as on a bench. Decoding is
checked against the standard library's struct and against pymodbus's own converter.
"""

import json
import re
from pathlib import Path

import pytest
from fake_modbus import ModbusDevice, words
from fakes import NullModem, Sink, wait_for
from pymodbus.constants import ExcCodes
from strikeline.drivers.hub import Instruments
from strikeline.drivers.modbus_codec import plan_reads
from strikeline.drivers.reading import Status
from strikeline.profiles.bench import parse_bench
from strikeline.profiles.fields import ProfileError
from strikeline.tui import cli

pytestmark = pytest.mark.timeout(60)
ROOT = Path(__file__).resolve().parents[2]
MBAR = 100.0
SCCM = 101325 * 1e-6 / 60  # Pa m3/s in one standard cm3 per minute (0 C, 1 atm)

# The invented controller's register map (ours, for these tests).
BENCH = '[bench]\ngas = "Ar"\ncathode = "Cu"\ngap = "30 mm"\n'
PORT = """
[[port]]
name = "rack"
protocol = "modbus"
{where}
unit_id = 7
poll_interval = "20 ms"
timeout = "150 ms"
lost_after = 2

[[port.channel]]
name = "chamber"
quantity = "pressure"
table = "input"
address = 0
type = "float32"
unit = "mbar"
status_address = 2
status = {{ "0" = "ok", "1" = "under_range", "2" = "over_range", "3" = "sensor_error" }}
gauge = "capacitance"

[[port.channel]]
name = "supply-voltage"
quantity = "voltage"
table = "holding"
address = 10
type = "int16"
unit = "V"
scale = -1.0

[[port.channel]]
name = "supply-current"
quantity = "current"
table = "holding"
address = 11
type = "int32"
word_order = "little"
unit = "uA"

[[port.channel]]
name = "argon-flow"
quantity = "flow"
table = "input"
address = 20
type = "float32"
word_order = "little"
byte_order = "little"
unit = "sccm"

[[port.channel]]
name = "interlock"
quantity = "state"
table = "discrete"
address = 5
labels = {{ "0" = "open", "1" = "closed" }}
"""


def fill(dev: ModbusDevice, pressure_mbar=1.5e-2, status=0, volts=-650, micro_amps=123456, sccm=20.0, closed=1):
    dev.set("input", 0, words("f", pressure_mbar))
    dev.set("input", 2, [status])
    dev.set("holding", 10, words("h", volts))
    dev.set("holding", 11, words("i", micro_amps, word_order="little"))
    dev.set("input", 20, words("f", sccm, word_order="little", byte_order="little"))
    dev.set("discrete", 5, [closed])


def profile_for(where: str):
    return parse_bench(BENCH + PORT.format(where=where), "rack.toml", None)


@pytest.fixture
def device():
    dev = ModbusDevice(unit=7)
    fill(dev)
    yield dev
    dev.close()


def _check_values(sink):
    assert sink.last("chamber").value == pytest.approx(1.5e-2 * MBAR, rel=1e-6)
    assert sink.last("supply-voltage").value == pytest.approx(650.0)
    assert sink.last("supply-current").value == pytest.approx(0.123456)
    assert sink.last("argon-flow").value == pytest.approx(20.0 * SCCM, rel=1e-6)
    assert sink.last("interlock").value == 1.0 and sink.last("interlock").status is Status.OK


def test_reads_every_channel_over_tcp(device):
    sink = Sink()
    inst = Instruments(profile_for(f'transport = "tcp"\nhost = "127.0.0.1"\ntcp_port = {device.port}').ports,
                       sink.emit, sink.event)  # fmt: skip
    inst.start()
    try:
        assert wait_for(lambda: all(sink.last(c) for c in ("chamber", "argon-flow", "interlock", "supply-current")))
        _check_values(sink)
        assert sink.last("chamber").source == "modbus" and "input 0:" in sink.last("chamber").raw
        device.set("input", 2, [2])  # the gauge's own status word: over range
        assert wait_for(lambda: sink.last("chamber").status is Status.OVER_RANGE)
    finally:
        inst.stop()


def test_faults_become_channel_states_and_counts(device):
    sink = Sink()
    inst = Instruments(profile_for(f'transport = "tcp"\nhost = "127.0.0.1"\ntcp_port = {device.port}').ports,
                       sink.emit, sink.event)  # fmt: skip
    reader = inst.readers[0]
    inst.start()
    try:
        assert wait_for(lambda: sink.last("chamber") is not None and sink.last("chamber").usable)
        # an exception response: sensor error with the exception named, counted
        device.exception = ExcCodes.DEVICE_FAILURE
        assert wait_for(lambda: sink.last("chamber").status is Status.SENSOR_ERROR)
        assert "modbus exception 4 (device failure)" in sink.last("chamber").raw
        assert reader.stats.exceptions >= 1 and any(e[1] == "exception" for e in sink.events)
        device.exception = None
        assert wait_for(lambda: sink.last("chamber").usable)
        # the device stops answering in time: unanswered, then lost
        device.silent = True
        assert wait_for(lambda: sink.last("chamber").status is Status.LOST, timeout=10)
        assert reader.stats.timeouts >= 2 and "no answer to 2 polls" in sink.last("chamber").raw
        device.silent = False
        assert wait_for(lambda: sink.last("chamber").usable, timeout=10)
        # the connection drops: lost, reconnected with backoff when the device is back
        device.stop()
        assert wait_for(lambda: sink.last("chamber").status is Status.LOST and reader.stats.faults >= 1)
        device.start()
        channels = ("chamber", "supply-voltage", "supply-current", "argon-flow", "interlock")
        assert wait_for(lambda: all(sink.last(c).usable for c in channels) and reader.stats.reconnects >= 1, timeout=10)
        _check_values(sink)
    finally:
        inst.stop()
    assert not reader.alive


def test_rtu_framing_over_a_tcp_gateway():
    dev = ModbusDevice(unit=7, rtu=True)
    fill(dev)
    sink = Sink()
    where = f'transport = "rtu"\ndevice = "socket://127.0.0.1:{dev.port}"'
    inst = Instruments(profile_for(where).ports, sink.emit, sink.event)
    inst.start()
    try:
        assert wait_for(lambda: all(sink.last(c) for c in ("chamber", "argon-flow", "interlock", "supply-current")))
        _check_values(sink)
    finally:
        inst.stop()
        dev.close()


def test_a_port_closed_under_a_read_is_lost_and_reopened_never_a_dead_thread(monkeypatch):
    # pyserial's socket, closed under a read (a stop, a dropped gateway), raises ValueError from
    # select on descriptor -1 deep inside pymodbus's read call: the reader must take it as a lost port.
    from pymodbus.client import ModbusSerialClient

    dev = ModbusDevice(unit=7, rtu=True)
    fill(dev)
    sink = Sink()
    where = f'transport = "rtu"\ndevice = "socket://127.0.0.1:{dev.port}"'
    inst = Instruments(profile_for(where).ports, sink.emit, sink.event)
    reader = inst.readers[0]
    raised = []
    for name in ("read_holding_registers", "read_input_registers"):
        real = getattr(ModbusSerialClient, name)

        def read(self, *a, _real=real, **kw):
            if not raised:
                raised.append(a)
                raise ValueError("file descriptor cannot be a negative integer (-1)")
            return _real(self, *a, **kw)

        monkeypatch.setattr(ModbusSerialClient, name, read)
    inst.start()
    try:
        assert wait_for(lambda: raised and reader.stats.reconnects >= 1 and sink.last("chamber") is not None)
        assert wait_for(lambda: sink.last("chamber").usable)
        assert any(kind == "lost" for _port, kind, _text in sink.events) and reader.alive
    finally:
        inst.stop()
        dev.close()
    assert not reader.alive


def test_rtu_over_a_serial_line():
    line = NullModem()  # two serial ports and a cable: the device on one end, strikeline on the other
    dev = ModbusDevice(unit=7, serial=line.a)
    fill(dev)
    sink = Sink()
    where = f'transport = "rtu"\ndevice = "{line.b}"\nbaudrate = 19200\nparity = "N"'  # a pty has no parity
    inst = Instruments(profile_for(where).ports,
                       sink.emit, sink.event)  # fmt: skip
    inst.start()
    try:
        assert wait_for(lambda: all(sink.last(c) for c in ("chamber", "argon-flow", "interlock")), timeout=15)
        _check_values(sink)
    finally:
        inst.stop()
        dev.close()
        line.close()


def test_gauge_verb_reads_modbus_and_reports_its_counts(device, tmp_path, capsys):
    bench = tmp_path / "rack.toml"
    bench.write_text(BENCH + PORT.format(where=f'transport = "tcp"\nhost = "127.0.0.1"\ntcp_port = {device.port}'))
    assert cli.main(["gauge", "--bench", str(bench), "--samples", "12", "--json"]) == 0
    rows = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    readings = {r["channel"]: r for r in rows if r["kind"] == "reading"}
    assert readings["interlock"]["state"] == "closed"
    assert readings["argon-flow"]["value_si"] == pytest.approx(20.0 * SCCM, rel=1e-6)
    (counts,) = [r for r in rows if r["kind"] == "counts"]
    assert counts["port"] == "rack" and counts["readings"] >= 12
    assert {"unanswered", "exceptions", "faults", "reconnects"} <= counts.keys()


def test_the_driver_never_writes():
    # Read only: no write function of the library is even named in the driver (the fake device also
    # fails any test in which a request carries values to write).
    for name in ("modbus.py", "modbus_codec.py", "reader.py"):
        text = (ROOT / "drivers" / name).read_text()
        assert not re.findall(r"\b(?:write_\w+|mask_write\w*|readwrite\w*)", text), name
    assert "read_holding_registers" in (ROOT / "drivers" / "modbus.py").read_text()  # the check can see names


@pytest.mark.parametrize(
    ("snippet", "needle"),
    [
        ('transport = "tcp"\nhost = "h"\nunit_id = 7', "[port #1 channel #1] type"),
        ('transport = "tcp"\nunit_id = 7', "host: missing"),
        ('transport = "rtu"\nunit_id = 7', "device: missing"),
        ('transport = "tcp"\nhost = "h"', "unit_id: missing; give the device's id on the bus"),
        ('transport = "tcp"\nhost = "h"\nunit_id = 300', "unit_id: 300 is not a number from 0 to 255"),
        ('transport = "serial"\nhost = "h"\nunit_id = 1', "transport: 'serial' is not one of tcp, rtu"),
        ('transport = "tcp"\nhost = "h"\nunit_id = 1\nbaudrate = 9600', "belongs to a serial RTU port"),
        ('transport = "rtu"\ndevice = "/dev/ttyUSB0"\nunit_id = 1\nhost = "h"', "belongs to a TCP port"),
    ],
)
def test_bad_modbus_port_sections(snippet, needle):
    channel = '[[port.channel]]\nname = "p"\nquantity = "pressure"\ntable = "input"\naddress = 0\n'
    channel += 'type = "float16"\nunit = "mbar"\n'
    with pytest.raises(ProfileError) as e:
        parse_bench(BENCH + f'[[port]]\nprotocol = "modbus"\n{snippet}\n' + channel, "rack.toml", None)
    assert str(e.value).startswith("rack.toml: ") and needle in str(e.value) and "\n" not in str(e.value)


@pytest.mark.parametrize(
    ("channel", "needle"),
    [
        ('type = "float16"', "type: 'float16' is not one of int16, uint16"),
        ("address = 70000", "address: 70000 is not a whole number from 0 to 65534"),
        ("address = -1", "address: -1 is not a whole number"),
        ("address = 65535", "from 0 to 65534 (a float32 takes 2 registers)"),
        ("registers = 1", "registers: 1: a float32 takes 2 registers"),
        ('table = "coil"', "'float32': a coil holds one bit"),
        ('table = "discrete"\ntype = "bit"', 'holds one bit: give quantity = "state"'),
        ('table = "drawer"', "table: 'drawer' is not one of holding"),
        ('word_order = "middle"', "word_order: 'middle' is not one of big, little"),
        ("status_address = 2", "give the status words for the status register"),
        ('unit = "furlong"', "is not a pressure unit"),
    ],
)
def test_bad_modbus_channels_name_the_field_and_the_form(channel, needle):
    base = {"table": '"input"', "address": "0", "type": '"float32"', "unit": '"mbar"'}
    fields = dict(base)
    for line in channel.splitlines():
        k, v = line.split(" = ", 1)
        fields[k] = v
    body = "\n".join(f"{k} = {v}" for k, v in fields.items())
    text = BENCH + '[[port]]\nprotocol = "modbus"\ntransport = "tcp"\nhost = "h"\nunit_id = 1\n'
    text += f'[[port.channel]]\nname = "p"\nquantity = "pressure"\n{body}\n'
    with pytest.raises(ProfileError) as e:
        parse_bench(text, "rack.toml", None)
    assert needle in str(e.value) and "[port #1 channel #1]" in str(e.value), str(e.value)


async def test_the_live_screen_reads_modbus_and_stays_responsive_through_faults(device, tmp_path):
    from strikeline.tui.screen.build import make_app

    profile = profile_for(f'transport = "tcp"\nhost = "127.0.0.1"\ntcp_port = {device.port}')
    app = make_app(profile, log_path=tmp_path / "l.jsonl", show_caution=False)

    def channels():
        return app.query_one("#channels").content.plain

    async with app.run_test(size=(150, 30)) as pilot:

        async def until(pred, limit=200):
            for _ in range(limit):
                await pilot.pause(0.02)
                if pred():
                    return True
            return False

        assert await until(lambda: "interlock CLOSED" in channels() and "argon-flow LIVE" in channels())
        assert "1.50 Pa" in app.readouts_text()  # 1.5e-2 mbar from the float32 input registers
        device.exception = ExcCodes.DEVICE_FAILURE
        assert await until(lambda: "chamber SENSOR ERROR" in channels())
        assert "exception" in channels()  # the port's fault counts on the status line
        device.exception = None
        device.stop()  # the connection drops
        assert await until(lambda: "chamber LOST" in channels())
        await pilot.press("u")  # the screen answers keys while the port reconnects
        assert "mbar" in app.readouts_text() or "mbar" in app.query_one("#title").content.plain
        device.start()
        assert await until(lambda: "chamber LIVE" in channels() and "reconnects" in channels(), limit=400)
    text = (tmp_path / "l.jsonl").read_text()
    assert '"channel":"argon-flow"' in text and '"status":"sensor_error"' in text
    counts = [json.loads(x) for x in text.splitlines() if '"event":"counts"' in x]
    assert len(counts) == 1 and counts[0]["exceptions"] >= 1 and counts[0]["reconnects"] >= 1


def test_contiguous_registers_share_one_request():
    chans = profile_for('transport = "tcp"\nhost = "127.0.0.1"').ports[0].channels
    got = [(b.table, b.start, b.count) for b in plan_reads(chans)]
    assert got == [("holding", 10, 3), ("input", 0, 3), ("input", 20, 2), ("discrete", 5, 1)]
