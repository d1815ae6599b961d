"""The README's profile examples work as written: each is taken from the README's text, pointed at a
device built from the README's own description of it, and read on the first try.

The Modbus device below is set up from the README's prose about the invented gas rack (its
register map), not from the profile; the profile is never edited except for where the device is.
"""

import json
import re
import struct
from pathlib import Path

import pytest
from fake_modbus import ModbusDevice
from fakes import TcpInstrument
from strikeline.tui import cli

ROOT = Path(__file__).resolve().parents[2]
README = (ROOT / "README.md").read_text()
SCCM = 101325 * 1e-6 / 60
pytestmark = pytest.mark.timeout(60)


def toml_blocks() -> list[str]:
    return re.findall(r"```toml\n(.*?)```", README, flags=re.S)


def block_with(needle: str) -> str:
    (found,) = [b for b in toml_blocks() if needle in b]
    return found


def bench_block() -> str:
    """The README's bench example (its [bench] section and the rest, ports aside)."""
    return block_with('name = "my bench"')


def _readings(tmp_path, capsys, text: str, samples: int) -> dict:
    bench = tmp_path / "bench.toml"
    bench.write_text(text)
    code = cli.main(["gauge", "--bench", str(bench), "--samples", str(samples), "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    return {r["channel"]: r for r in map(json.loads, out.splitlines()) if r["kind"] == "reading"}


def test_the_readme_modbus_example_reads_the_device_it_describes(tmp_path, capsys):
    # The README: "input registers 0-1 hold the chamber pressure in mbar as a float32 (high word
    # first), input register 2 the gauge status (0 ok ...), input registers 100-101 the argon flow
    # in sccm as a float32 with the low word first, holding register 200 the supply's voltage
    # read-back in volts as a signed 16-bit number, and discrete input 8 the door interlock (1 closed)."
    dev = ModbusDevice(unit=3)
    try:
        hi, lo = struct.unpack(">HH", struct.pack(">f", 2.5e-2))
        dev.set("input", 0, [hi, lo])
        dev.set("input", 2, [0])
        hi, lo = struct.unpack(">HH", struct.pack(">f", 35.0))
        dev.set("input", 100, [lo, hi])
        dev.set("holding", 200, [struct.unpack(">H", struct.pack(">h", -480))[0]])
        dev.set("discrete", 8, [1])
        port = block_with('protocol = "modbus"')
        port = port.replace('host = "192.0.2.20"', 'host = "127.0.0.1"').replace(
            "tcp_port = 502", f"tcp_port = {dev.port}"
        )
        got = _readings(tmp_path, capsys, bench_block() + "\n" + port, samples=12)
    finally:
        dev.close()
    assert got["chamber"]["value_si"] == pytest.approx(2.5, rel=1e-6)  # 2.5e-2 mbar
    assert got["argon-flow"]["value_si"] == pytest.approx(35.0 * SCCM, rel=1e-6)
    assert got["supply-voltage"]["value_si"] == pytest.approx(-480.0)
    assert got["door"]["state"] == "closed"


def test_the_readme_scpi_example_reads_a_meter_on_a_socket(tmp_path, capsys):
    answers = {b"*IDN?": b"Bench meter of ours,1,1,1\n", b"MEAS:VOLT?": b"+5.200E+02\n", b"MEAS:CURR?": b"0.0125\n"}
    dev = TcpInstrument(lambda line: answers.get(line.strip(), b"ERROR\n"), terminator=b"\n")
    try:
        port = block_with('protocol = "scpi"').replace("192.0.2.30::5025", f"127.0.0.1::{dev.port}")
        got = _readings(tmp_path, capsys, bench_block() + "\n" + port, samples=4)
    finally:
        dev.stop()
    assert got["supply-voltage"]["value_si"] == pytest.approx(520.0)
    assert got["supply-current"]["value_si"] == pytest.approx(0.0125)


def test_the_readme_line_example_loads():
    from strikeline.profiles.bench import parse_bench

    profile = parse_bench(bench_block() + "\n" + block_with('[[port]]\nname = "controller"'), "readme.toml", None)
    assert [c.name for p in profile.ports for c in p.channels] == ["chamber"]


def test_reactive_example_is_the_reactive_demos_own():
    # The README's [flows] and [target] example says what the built-in reactive demo holds, and the
    # demo (with those sections) loads.
    import tomllib

    from strikeline.profiles.bench import load_bench

    example = tomllib.loads(block_with("[flows]"))
    demo_text = (ROOT / "profiles" / "benches" / "demo-reactive.toml").read_text()
    demo = tomllib.loads(demo_text)
    assert example["flows"] == demo["flows"] and example["target"] == demo["target"]
    assert example["bench"]["gas"] == demo["bench"]["gas"]
    assert load_bench("demo-reactive").bench.pumping_speed == pytest.approx(0.25)


def test_ac_supply_and_strike_detect_example_load_and_state_the_defaults():
    # The README's [supply] (AC) and [strike_detect] example loads, and the thresholds it writes out
    # are the defaults it says they are.
    from strikeline.profiles.bench import parse_bench
    from strikeline.profiles.supply import DETECT_DEFAULTS

    block = block_with("[strike_detect]")
    p = parse_bench('[bench]\ngas = "argon"\ncathode = "Cu"\ngap = "25 mm"\n' + block, "readme.toml", None)
    s = p.bench.supply
    assert s.mode == "ac" and s.frequency == pytest.approx(13.56e6) and s.open_circuit_voltage == pytest.approx(200.0)
    assert p.detection == DETECT_DEFAULTS
