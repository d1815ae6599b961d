"""Hostile inputs shared by tests/tui/test_hostile.py: the bench, port and logbook texts it builds on,
and the bench-profile and logbook-record cases (each with the line the tool must answer with)."""

import json

BENCH = '[bench]\ngas = "Ar"\ncathode = "Cu"\ngap = "30 mm"\n'
PORT = (
    '[[port]]\nurl = "loop://"\nmode = "streaming"\n[[port.channel]]\nname = "p"\nquantity = "pressure"\n'
    'pattern = "(?P<value>.*)"\nunit = "Pa"\n'
)
T = 1.8e9  # a time in 2027, inside what a logbook may hold
SESSION = {"kind": "session", "t": "2027-01-15T08:00:00Z", "t_unix": T, "mono": 0, "format": "strikeline-logbook/1"}
READING = {"kind": "reading", "t_unix": T, "mono": 1, "channel": "chamber", "quantity": "pressure", "status": "ok",
           "value": 16.0, "indicated": 10.0}  # fmt: skip
STRIKE = {"kind": "strike", "t_unix": T + 1, "mono": 2, "pressure_Pa": 20.0, "gap_m": 0.03, "voltage_V": 450.0}


def logbook(*bad: object, raw: str | None = None) -> str:
    """A valid logbook with ``bad`` records (dicts, or raw text lines) in the middle."""
    lines = [json.dumps(SESSION), json.dumps(READING)]
    lines += [b if isinstance(b, str) else json.dumps(b) for b in bad]
    lines += [json.dumps(STRIKE)]
    return (raw if raw is not None else "\n".join(lines)) + "\n"


def with_(base: dict, **changes) -> dict:
    out = dict(base)
    for k, v in changes.items():
        if v is ...:
            out.pop(k, None)
        else:
            out[k] = v
    return out


# (id, argv, {file name: text or bytes}, exit status, a piece of the one stderr line)

MODBUS = (
    '[[port]]\nprotocol = "modbus"\ntransport = "tcp"\nhost = "192.0.2.20"\nunit_id = 3\n'
    '[[port.channel]]\nname = "p"\nquantity = "pressure"\ntable = "input"\naddress = 0\ntype = "float32"\n'
    'unit = "mbar"\n'
)
SCPI = (
    '[[port]]\nprotocol = "scpi"\nresource = "TCPIP::192.0.2.30::5025::SOCKET"\n'
    '[[port.channel]]\nname = "v"\nquantity = "voltage"\nquery = "MEAS:VOLT?"\nunit = "V"\n'
)

PROFILES = [
    ("gap missing", '[bench]\ngas = "Ar"\ncathode = "Cu"\n', "[bench] gap: missing"),
    ("gap huge", BENCH.replace("30 mm", "1e9 m"), "outside 1e-06 to 10 m"),
    ("gap bare", BENCH.replace('"30 mm"', '"30"'), "needs a unit"),
    ("gap number", BENCH.replace('"30 mm"', "30"), "needs a unit"),
    ("gas missing", '[bench]\ncathode = "Cu"\ngap = "3 mm"\n', "[bench] gas: missing"),
    ("gas unknown", BENCH.replace('"Ar"', '"Arr"'), "gas 'Arr': unknown"),
    ("gas list", BENCH.replace('"Ar"', '["Ar"]'), "is not a non-empty text"),
    ("cathode unknown", BENCH.replace('"Cu"', '"gold"'), "cathode 'gold': unknown"),
    ("pressure huge", BENCH + 'pressure = "1e30 Pa"\n', "outside 1e-06 to 1e+06 Pa"),
    ("temperature cold", BENCH + 'gas_temperature = "5 K"\n', "outside 20 to 3000 K"),
    ("gamma two", BENCH + "gamma = 2\n", "is not a number from 1e-06 to 1"),
    ("gamma text", BENCH + 'gamma = "high"\n', "is not a number from 1e-06 to 1"),
    ("field huge", BENCH + 'magnetic_field = "1e3 T"\n', "outside 1e-06 to 10 T"),
    ("area zero", BENCH + 'cathode_area = "0 cm2"\n', "must be above zero"),
    ("unknown field", BENCH + 'colour = "red"\n', "colour: unknown field"),
    ("unknown section", BENCH + "[other]\n", "other: unknown field"),
    ("toml broken", "[bench\n", "not valid TOML"),
    ("bench not table", "bench = 5\n", "[bench] must be a table"),
    ("supply volts huge", BENCH + '[supply]\nopen_circuit_voltage = "1e300 V"\n', "outside 1 to 1e+06 V"),
    ("supply volts missing", BENCH + "[supply]\n", "open_circuit_voltage: missing"),
    ("supply mode", BENCH + '[supply]\nopen_circuit_voltage = "1 kV"\nmode = "steam"\n', "is not one of"),
    (
        "pulsed no frequency",
        BENCH + '[supply]\nopen_circuit_voltage = "1 kV"\nmode = "pulsed"\noff_time = "1 us"\n',
        "frequency: missing",
    ),
    (
        "off-time too long",
        BENCH + '[supply]\nopen_circuit_voltage = "1 kV"\nmode = "pulsed"\nfrequency = "10 kHz"\noff_time = "1 ms"\n',
        "is not shorter than one period",
    ),
    (
        "ballast negative",
        BENCH + '[supply]\nopen_circuit_voltage = "1 kV"\nballast = "-5 ohm"\n',
        "must be zero or more",
    ),
    (
        "current huge",
        BENCH + '[supply]\nopen_circuit_voltage = "1 kV"\ncurrent_limit = "1e9 A"\n',
        "outside 1e-09 to 10000 A",
    ),
    ("stray not list", 'stray_gap = "shield"\n' + BENCH, "must be a list of tables"),
    ("stray no length", BENCH + '[[stray_gap]]\nname = "shield"\n', "length: missing"),
    ("stray tiny", BENCH + '[[stray_gap]]\nname = "shield"\nlength = "1 nm"\n', "outside 1e-06 to 10 m"),
    ("chamber bare", BENCH + "[chamber]\nradius = 3\n", "radius 3: needs a unit"),
    ("chamber tiny", BENCH + '[chamber]\nradius = "0.1 mm"\nlength = "1 m"\n', "outside 0.001 to 10 m"),
    ("port no channel", BENCH + '[[port]]\nurl = "loop://"\n', "give at least one [[port.channel]]"),
    ("port not list", 'port = "COM1"\n' + BENCH, "must be a list of tables"),
    (
        "port timeout long",
        BENCH + PORT.replace('mode = "streaming"', 'mode = "streaming"\ntimeout = "1 h"'),
        "outside 0.001 to 60 s",
    ),
    ("port parity", BENCH + PORT.replace('mode = "streaming"', 'mode = "streaming"\nparity = "X"'), "is not one of"),
    (
        "port baud",
        BENCH + PORT.replace('mode = "streaming"', 'mode = "streaming"\nbaudrate = 3'),
        "is not a number from 50",
    ),
    ("channel regex", BENCH + PORT.replace("(?P<value>.*)", "("), "not a valid regular expression"),
    ("channel no value", BENCH + PORT.replace("(?P<value>.*)", "x"), "(?P<value>...)"),
    ("channel quantity", BENCH + PORT.replace('"pressure"', '"flux"'), "'flux' is not one of"),
    ("channel unit", BENCH + PORT.replace('unit = "Pa"', 'unit = "bananas"'), "is not a pressure unit"),
    ("channel status", BENCH + PORT + 'status = { X = "fine" }\n', "'fine' is not one of ok"),
    ("channel twice", BENCH + PORT + PORT, "is used by another channel"),
    ("channel scale", BENCH + PORT + "scale = 1e300\n", "is not a number from -1e+12"),
    ("channel gauge kind", BENCH + PORT + 'gauge = "magic"\n', "is not one of capacitance"),
    ("polled no query", BENCH + PORT.replace('mode = "streaming"', 'mode = "polled"'), "query: missing"),
    (
        "curve inverted",
        BENCH + '[curve]\ngas = "argon"\ncathode = "copper"\nfitted_on = "2026-11-30"\nn_points = 8\n'
        "A_per_Pa_m = 9.0\nB_V_per_Pa_m = 135.0\ngamma = 0.07\nA_sigma = 0.1\nB_sigma = 1.0\ngamma_sigma = 0.001\n"
        "covariance_ln = [[1e-4, 0, 0], [0, 1e-4, 0], [0, 0, 0]]\nresidual_scale = 0.02\nt_quantile = 2.4\n"
        "rms_residual_V = 5.0\npd_low_Pa_m = 3.0\npd_high_Pa_m = 0.3\n",
        "the fitted range is inverted",
    ),
    ("curve other gas", BENCH + '[curve]\ngas = "helium"\ncathode = "copper"\n', "fitted for helium on copper"),
    (
        "curve covariance",
        BENCH + '[curve]\ngas = "argon"\ncathode = "copper"\ncovariance_ln = [1, 2]\n',
        "is not a 3 x 3 list",
    ),
]

# Logbook records, each malformed in one field: `log` skips the line and names it (exit 0).
RECORDS = [
    ("time missing", with_(READING, t_unix=...), "t_unix None is not a number"),
    ("time text", with_(READING, t_unix="soon"), "t_unix 'soon' is not a number"),
    ("time negative", with_(READING, t_unix=-2e9), "is not a time from 2000 to 2200"),
    ("time 1913", with_(READING, t_unix=-1.8e9), "is not a time from 2000 to 2200"),
    ("time far future", with_(READING, t_unix=1e12), "is not a time from 2000 to 2200"),
    ("time list", with_(READING, t_unix=[1]), "is not a number of seconds"),
    ("time bool", with_(READING, t_unix=True), "is not a number of seconds"),
    ("mono negative", with_(READING, mono=-1), "mono -1 is not"),
    ("mono text", with_(READING, mono="x"), "mono 'x' is not"),
    ("kind missing", with_(READING, kind=...), "kind 'None' is not one of"),
    ("kind unknown", with_(READING, kind="weather"), "kind 'weather' is not one of"),
    ("kind list", with_(READING, kind=["reading"]), "is not one of"),
    ("channel list", with_(READING, channel=["a"]), "field 'channel' is ['a']"),
    ("channel empty", with_(READING, channel=""), "field 'channel' is ''"),
    ("channel huge", with_(READING, channel="c" * 100_000), "a name of 1-64 printable characters"),
    ("channel control", with_(READING, channel="a\x1b[2Jb"), "a name of 1-64 printable characters"),
    ("channel missing", with_(READING, channel=...), "reading has no 'channel'"),
    ("quantity unknown", with_(READING, quantity="flux"), "field 'quantity' is 'flux'"),
    ("status unknown", with_(READING, status="fine"), "field 'status' is 'fine'"),
    ("value text", with_(READING, value="lots"), "field 'value' is 'lots'"),
    ("value list", with_(READING, value=[1, 2]), "field 'value' is [1, 2]"),
    ("value bool", with_(READING, value=True), "field 'value' is True"),
    ("indicated dict", with_(READING, indicated={"a": 1}), "field 'indicated' is"),
    ("raw huge", with_(READING, raw="r" * 10_000), "field 'raw' is"),
    ("approximate text", with_(READING, approximate="yes"), "field 'approximate' is 'yes'"),
    ("strike text", with_(STRIKE, pressure_Pa="lots"), "field 'pressure_Pa' is 'lots'"),
    ("strike negative", with_(STRIKE, gap_m=-0.03), "field 'gap_m' is -0.03"),
    ("strike zero", with_(STRIKE, voltage_V=0), "field 'voltage_V' is 0"),
    ("strike huge", with_(STRIKE, pressure_Pa=1e30), "field 'pressure_Pa' is 1e+30, outside"),
    ("strike volts huge", with_(STRIKE, voltage_V=1e12), "field 'voltage_V' is 1e+12, outside"),
    ("strike missing", with_(STRIKE, voltage_V=...), "strike has no 'voltage_V'"),
    ("strike temperature", with_(STRIKE, gas_temperature_K="warm"), "field 'gas_temperature_K' is 'warm'"),
    ("strike note list", with_(STRIKE, note=["x"]), "field 'note' is"),
    ("flag level", {"kind": "flag", "t_unix": T, "code": "x", "level": "meh", "change": "raised"}, "field 'level'"),
    ("fill no composition", {"kind": "fill", "t_unix": T, "source": "typed"}, "fill has no 'composition'"),
    ("fill source", {"kind": "fill", "t_unix": T, "composition": "argon", "source": "guess"}, "field 'source'"),
    (
        "fill flows negative",
        {"kind": "fill", "t_unix": T, "composition": "argon", "flows_Pa_m3_s": {"argon": -1}},
        "field 'flows_Pa_m3_s'",
    ),
    (
        "fill flows list",
        {"kind": "fill", "t_unix": T, "composition": "argon", "flows_Pa_m3_s": [0.1]},
        "field 'flows_Pa_m3_s'",
    ),
    ("flag change", {"kind": "flag", "t_unix": T, "code": "x", "level": "ok", "change": "maybe"}, "field 'change'"),
    ("flag no code", {"kind": "flag", "t_unix": T, "level": "ok", "change": "raised"}, "flag has no 'code'"),
    ("event count", {"kind": "event", "t_unix": T, "event": "counts", "garbled": -3}, "field 'garbled' is -3"),
    ("event count float", {"kind": "event", "t_unix": T, "event": "counts", "readings": 1.5}, "field 'readings'"),
    ("event missing", {"kind": "event", "t_unix": T}, "event has no 'event'"),
    ("entry accepted", {"kind": "entry", "t_unix": T, "field": "gap", "accepted": "yes"}, "field 'accepted'"),
    ("forecast strikes", {"kind": "forecast", "t_unix": T, "strikes": "maybe"}, "field 'strikes'"),
    ("forecast volts", {"kind": "forecast", "t_unix": T, "breakdown_V": "high"}, "field 'breakdown_V'"),
    ("array", [1, 2, 3], "not a JSON object"),
    ("number", 42, "not a JSON object"),
    ("string", '"reading"', "not a JSON object"),
    ("NaN token", '{"kind":"reading","t_unix":NaN}', "NaN is not a number JSON allows"),
    ("Infinity token", '{"kind":"strike","t_unix":1.8e9,"pressure_Pa":Infinity}', "Infinity is not a number"),
    ("truncated middle", '{"kind":"reading","t_unix":18', "not JSON"),
    ("trailing garbage", json.dumps(READING) + " trailing", "not JSON"),
]
