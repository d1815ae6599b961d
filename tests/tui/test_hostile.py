"""Hostile input, as a new user (or a corrupt file) gives it: every case ends in a clean one-line
error with exit status 2, a reported skip, or a correct result; never a traceback or an internal
error. Each case states its exact exit status and a piece of its one line.

Files a case needs are made in a temporary folder; ``{tmp}`` in an argument is that folder.
"""

import json
import subprocess
import sys

import pytest
from hostile_cases import BENCH, PORT, PROFILES, RECORDS, SESSION, logbook
from strikeline.tui import cli

pytestmark = pytest.mark.timeout(60)


CLI = [
    # strike: every quantity against the one set of physical limits
    ("pressure huge", ["strike", "--bench", "demo", "--pressure", "1e30 Pa"], {}, 2, "outside 1e-06 to 1e+06 Pa"),
    ("pressure tiny", ["strike", "--bench", "demo", "--pressure", "5e-7 Pa"], {}, 2, "outside 1e-06"),
    ("pressure zero", ["strike", "--bench", "demo", "--pressure", "0 Pa"], {}, 2, "must be above zero"),
    ("pressure negative", ["strike", "--bench", "demo", "--pressure", "-5 Pa"], {}, 2, "must be above zero"),
    ("pressure nan", ["strike", "--bench", "demo", "--pressure", "nan Pa"], {}, 2, "not a quantity"),
    ("pressure inf", ["strike", "--bench", "demo", "--pressure", "inf Pa"], {}, 2, "not a quantity"),
    ("pressure overflow", ["strike", "--bench", "demo", "--pressure", "1e999 Pa"], {}, 2, "not a finite number"),
    ("pressure bare", ["strike", "--bench", "demo", "--pressure", "5"], {}, 2, "needs a unit"),
    ("pressure unit", ["strike", "--bench", "demo", "--pressure", "5 bananas"], {}, 2, "unknown unit 'bananas'"),
    ("pressure empty", ["strike", "--bench", "demo", "--pressure", ""], {}, 2, "not a quantity"),
    ("pressure unit only", ["strike", "--bench", "demo", "--pressure", "Pa"], {}, 2, "not a quantity"),
    ("pressure comma", ["strike", "--bench", "demo", "--pressure", "2,5 Pa"], {}, 2, "not a quantity"),
    ("pressure MBAR", ["strike", "--bench", "demo", "--pressure", "5 MBAR"], {}, 2, "unknown unit"),
    ("gap huge", ["strike", "--bench", "demo", "--gap", "1e300 m"], {}, 2, "outside 1e-06 to 10 m"),
    ("gap tiny", ["strike", "--bench", "demo", "--gap", "0.1 um"], {}, 2, "outside 1e-06 to 10 m"),
    ("gap negative", ["strike", "--bench", "demo", "--gap", "-1mm"], {}, 2, "must be above zero"),
    ("gap bare", ["strike", "--bench", "demo", "--gap", "3"], {}, 2, "needs a unit"),
    ("gap furlongs", ["strike", "--bench", "demo", "--gap", "3 furlongs"], {}, 2, "unknown unit"),
    ("voltage huge", ["strike", "--bench", "demo", "--voltage", "1e300 V"], {}, 2, "outside 1 to 1e+06 V"),
    ("voltage tiny", ["strike", "--bench", "demo", "--voltage", "0.5 V"], {}, 2, "outside 1 to 1e+06 V"),
    ("voltage negative", ["strike", "--bench", "demo", "--voltage", "-600V"], {}, 2, "must be above zero"),
    ("voltage bare", ["strike", "--bench", "demo", "--voltage", "600"], {}, 2, "needs a unit"),
    ("voltage millivolt", ["strike", "--bench", "demo", "--voltage", "600 mV"], {}, 2, "outside 1 to 1e+06 V"),
    ("temperature cold", ["strike", "--bench", "demo", "--temperature", "5 K"], {}, 2, "outside 20 to 3000 K"),
    ("temperature hot", ["strike", "--bench", "demo", "--temperature", "4000 K"], {}, 2, "outside 20 to 3000 K"),
    ("temperature abs zero", ["strike", "--bench", "demo", "--temperature", "-300 C"], {}, 2, "above zero"),
    ("temperature bare", ["strike", "--bench", "demo", "--temperature", "20"], {}, 2, "one of K, C"),
    ("gamma zero", ["strike", "--bench", "demo", "--gamma", "0"], {}, 2, "not a secondary-electron yield"),
    ("gamma negative", ["strike", "--bench", "demo", "--gamma=-1"], {}, 2, "not a secondary-electron yield"),
    ("gamma three", ["strike", "--bench", "demo", "--gamma", "3"], {}, 2, "not a secondary-electron yield"),
    ("gamma nan", ["strike", "--bench", "demo", "--gamma", "nan"], {}, 2, "not a secondary-electron yield"),
    ("gamma inf", ["strike", "--bench", "demo", "--gamma", "inf"], {}, 2, "not a secondary-electron yield"),
    ("gamma text", ["strike", "--bench", "demo", "--gamma", "high"], {}, 2, "not a secondary-electron yield"),
    ("gas unknown", ["strike", "--bench", "demo", "--gas", "bananium"], {}, 2, "gas 'bananium': unknown"),
    ("gas empty", ["strike", "--bench", "demo", "--gas", ""], {}, 2, "gas '': empty"),
    # mixtures: the list (unknown gas, negative or zero parts, parts adding up to nothing,
    # a gas listed twice, gases that cannot be mixed) and what else a hand can type
    ("mix unknown", ["strike", "--bench", "demo", "--gas", "argon:80,unobtainium:20"], {}, 2, "unobtainium"),
    ("mix negative", ["strike", "--bench", "demo", "--gas", "argon:80,oxygen:-20"], {}, 2, "above zero"),
    ("mix zero part", ["strike", "--bench", "demo", "--gas", "argon:80,oxygen:0"], {}, 2, "above zero"),
    ("mix all zero", ["strike", "--bench", "demo", "--gas", "argon:0,oxygen:0"], {}, 2, "above zero"),
    ("mix overflow", ["strike", "--bench", "demo", "--gas", "argon:1e308,oxygen:1e308"], {}, 2, "no finite number"),
    ("mix nan", ["strike", "--bench", "demo", "--gas", "argon:nan,oxygen:1"], {}, 2, "above zero"),
    ("mix inf", ["strike", "--bench", "demo", "--gas", "argon:inf,oxygen:1"], {}, 2, "above zero"),
    ("mix twice", ["strike", "--bench", "demo", "--gas", "argon:1,Ar:1"], {}, 2, "argon is listed twice"),
    ("mix air+O2", ["strike", "--bench", "demo", "--gas", "air:50,oxygen:50"], {}, 2, "air already holds"),
    ("mix no parts", ["strike", "--bench", "demo", "--gas", "argon,oxygen"], {}, 2, "has no parts"),
    ("mix empty parts", ["strike", "--bench", "demo", "--gas", "argon:,oxygen:1"], {}, 2, "above zero"),
    ("mix no name", ["strike", "--bench", "demo", "--gas", ":5,oxygen:1"], {}, 2, "names no gas"),
    ("mix parts+flow", ["strike", "--bench", "demo", "--gas", "argon:40 sccm,oxygen:5"], {}, 2, "every gas parts"),
    ("mix flow unit", ["strike", "--bench", "demo", "--gas", "argon:40 Pa,oxygen:5 sccm"], {}, 2, "unknown unit"),
    ("mix flow zero", ["strike", "--bench", "demo", "--gas", "argon:40 sccm,oxygen:0 sccm"], {}, 2, "above zero"),
    ("mix flow huge", ["strike", "--bench", "demo", "--gas", "argon:1e9 slm,oxygen:1 sccm"], {}, 2, "outside"),
    ("film unknown", ["strike", "--bench", "demo", "--film", "unobtainium oxide"], {}, 2, "film 'unobtainium oxide'"),
    ("speed zero", ["strike", "--bench", "demo", "--pumping-speed", "0 l/s"], {}, 2, "above zero"),
    ("speed unit", ["strike", "--bench", "demo", "--pumping-speed", "250 sccm"], {}, 2, "unknown unit"),
    ("current negative", ["strike", "--bench", "demo", "--current=-2 A"], {}, 2, "above zero"),
    ("cathode unknown", ["strike", "--bench", "demo", "--cathode", "gold"], {}, 2, "cathode 'gold': unknown"),
    ("bench missing", ["strike", "--bench", "{tmp}/none.toml"], {}, 2, "no such file"),
    ("bench folder", ["strike", "--bench", "{tmp}"], {}, 2, "cannot be read"),
    ("bench binary", ["strike", "--bench", "{tmp}/b.toml"], {"b.toml": b"\xff\xfe\x00\x01"}, 2, "cannot be read"),
    ("units unknown", ["strike", "--bench", "demo", "--units", "furlongs"], {}, 2, "invalid choice"),
    ("no pressure", ["strike", "--gas", "Ar", "--cathode", "Cu", "--gap", "1mm"], {}, 2, "--pressure needed"),
    ("no gap", ["strike", "--gas", "Ar", "--cathode", "Cu", "--pressure", "1 Pa"], {}, 2, "--gap needed"),
    ("no cathode", ["strike", "--gas", "Ar", "--pressure", "1 Pa", "--gap", "1mm"], {}, 2, "--cathode needed"),
    ("unknown option", ["strike", "--bogus"], {}, 2, "unrecognized arguments"),
    ("unknown verb", ["frobnicate"], {}, 2, "invalid choice"),
    # curve
    ("points one", ["curve", "--bench", "demo", "--points", "1"], {}, 2, "not a number of points"),
    ("points zero", ["curve", "--bench", "demo", "--points", "0"], {}, 2, "not a number of points"),
    ("points huge", ["curve", "--bench", "demo", "--points", "2000000"], {}, 2, "not a number of points"),
    ("points float", ["curve", "--bench", "demo", "--points", "1e9"], {}, 2, "not a number of points"),
    ("points text", ["curve", "--bench", "demo", "--points", "many"], {}, 2, "not a number of points"),
    ("span tiny", ["curve", "--bench", "demo", "--from", "1e-300 Torr cm"], {}, 2, "outside 1e-12 to 1e+07 Pa m"),
    ("span huge", ["curve", "--bench", "demo", "--to", "1e300 Torr cm"], {}, 2, "outside 1e-12 to 1e+07 Pa m"),
    (
        "span inverted",
        ["curve", "--bench", "demo", "--from", "10 Torr cm", "--to", "1 Torr cm"],
        {},
        2,
        "--from must be below --to",
    ),
    ("span pressure w/o gap", ["curve", "--bench", "demo", "--from", "1 Pa"], {}, 2, "add --gap to sweep pressure"),
    (
        "span pressure huge",
        ["curve", "--bench", "demo", "--gap", "1 cm", "--from", "1e30 Pa"],
        {},
        2,
        "outside 1e-06 to 1e+06 Pa",
    ),
    ("span text", ["curve", "--bench", "demo", "--from", "low"], {}, 2, "not a pd value"),
    ("span unit", ["curve", "--bench", "demo", "--from", "5 Torr furlong"], {}, 2, "unknown unit 'furlong'"),
    ("span zero", ["curve", "--bench", "demo", "--from", "0 Torr cm"], {}, 2, "must be a finite value above zero"),
    # gauge and record
    ("samples zero", ["gauge", "--bench", "demo", "--samples", "0"], {}, 2, "not a number of readings"),
    ("samples negative", ["gauge", "--bench", "demo", "--samples=-1"], {}, 2, "not a number of readings"),
    ("samples text", ["gauge", "--bench", "demo", "--samples", "ten"], {}, 2, "not a number of readings"),
    ("gauge seconds huge", ["gauge", "--bench", "demo", "--seconds", "1e300 s"], {}, 2, "outside 0.001 to 604800 s"),
    ("gauge seconds zero", ["gauge", "--bench", "demo", "--seconds", "0"], {}, 2, "must be above zero"),
    ("gauge seconds unit", ["gauge", "--bench", "demo", "--seconds", "5 parsecs"], {}, 2, "unknown unit"),
    ("gauge no ports", ["gauge", "--bench", "demo-magnetron"], {}, 2, "no [[port]] section"),
    ("gauge no bench", ["gauge"], {}, 2, "the following arguments are required: --bench"),
    ("record seconds huge", ["record", "--bench", "demo", "--seconds", "1e300 s"], {}, 2, "outside 0.001 to 604800 s"),
    ("record seconds text", ["record", "--bench", "demo", "--seconds", "long"], {}, 2, "not a quantity"),
    ("record no seconds", ["record", "--bench", "demo"], {}, 2, "required: --seconds"),
    ("record log empty", ["record", "--bench", "demo", "--seconds", "1", "--log", ""], {}, 2, "path is empty"),
    (
        "record log proc",
        ["record", "--bench", "demo", "--seconds", "1", "--log", "/proc/x/l.jsonl"],
        {},
        2,
        "cannot be made",
    ),
    ("record log sys", ["record", "--bench", "demo", "--seconds", "1", "--log", "/sys/l.jsonl"], {}, 2, "cannot write"),
    (
        "record log under file",
        ["record", "--bench", "demo", "--seconds", "1", "--log", "{tmp}/f.txt/l.jsonl"],
        {"f.txt": "a file"},
        2,
        "Not a directory",
    ),
    ("record log folder", ["record", "--bench", "demo", "--seconds", "1", "--log", "{tmp}"], {}, 2, "is a folder"),
    (
        "record log device",
        ["record", "--bench", "demo", "--seconds", "1", "--log", "/dev/full"],
        {},
        2,
        "not a regular file",
    ),
    (
        "record log foreign",
        ["record", "--bench", "demo", "--seconds", "1", "--log", "{tmp}/results.csv"],
        {"results.csv": "sample,value\na,1\n"},
        2,
        "is not a strikeline logbook",
    ),
    ("record no ports", ["record", "--bench", "demo-magnetron", "--seconds", "1"], {}, 2, "no [[port]] section"),
    # live: inputs are checked before the terminal is
    ("speed nan", ["live", "--speed", "nan"], {}, 2, "not a replay speed"),
    ("speed negative", ["live", "--speed=-1"], {}, 2, "not a replay speed"),
    ("speed inf", ["live", "--speed", "inf"], {}, 2, "not a replay speed"),
    ("speed text", ["live", "--speed", "fast"], {}, 2, "not a replay speed"),
    ("live units", ["live", "--units", "cubits"], {}, 2, "invalid choice"),
    ("replay missing", ["live", "--replay", "{tmp}/none.jsonl"], {}, 2, "cannot be read"),
    ("replay foreign", ["live", "--replay", "{tmp}/r.csv"], {"r.csv": "a,b\n1,2\n"}, 2, "no readings"),
    (
        "replay no readings",
        ["live", "--replay", "{tmp}/s.jsonl"],
        {"s.jsonl": json.dumps(SESSION) + "\n"},
        2,
        "no readings",
    ),
    ("live log foreign", ["live", "--log", "{tmp}/r.csv"], {"r.csv": "a,b\n"}, 2, "is not a strikeline logbook"),
    ("live log folder", ["live", "--log", "{tmp}"], {}, 2, "is a folder"),
    ("live bench", ["live", "--bench", "{tmp}/none.toml"], {}, 2, "no such file"),
    ("live no terminal", ["live"], {}, 2, "needs a terminal"),
    # log: the logbook itself
    ("log missing", ["log", "{tmp}/none.jsonl"], {}, 2, "no such file"),
    ("log folder", ["log", "{tmp}"], {}, 2, "cannot be read"),
    ("log empty", ["log", "{tmp}/e.jsonl"], {"e.jsonl": ""}, 2, "no readable logbook records (it is empty)"),
    ("log binary", ["log", "{tmp}/b.jsonl"], {"b.jsonl": b"\x00\xff\x13garbage\n\x01\n"}, 2, "not JSON"),
    ("log all bad", ["log", "{tmp}/a.jsonl"], {"a.jsonl": '{"kind": 5}\n[1,2]\n'}, 2, "skipped 2 lines"),
    ("log csv", ["log", "{tmp}/c.csv"], {"c.csv": "sample,value\na,1\n"}, 2, "not JSON"),
    ("strikes empty", ["log", "{tmp}/l.jsonl", "--strikes", ""], {"l.jsonl": logbook()}, 2, "--strikes is empty"),
    ("strikes folder", ["log", "{tmp}/l.jsonl", "--strikes", "{tmp}"], {"l.jsonl": logbook()}, 2, "is a folder"),
    (
        "strikes proc",
        ["log", "{tmp}/l.jsonl", "--strikes", "/proc/x/s.csv"],
        {"l.jsonl": logbook()},
        2,
        "does not exist",
    ),
    (
        "strikes foreign",
        ["log", "{tmp}/l.jsonl", "--strikes", "{tmp}/r.csv"],
        {"l.jsonl": logbook(), "r.csv": "sample,value\n"},
        2,
        "was not written by strikeline",
    ),
    (
        "strikes device",
        ["log", "{tmp}/l.jsonl", "--strikes", "/dev/full"],
        {"l.jsonl": logbook()},
        2,
        "not a regular file",
    ),
    # fit: the CSV and the bench to save into
    ("fit missing", ["fit", "{tmp}/none.csv", "--bench", "demo"], {}, 2, "no such file"),
    ("fit folder", ["fit", "{tmp}", "--bench", "demo"], {}, 2, "cannot be read"),
    ("fit empty", ["fit", "{tmp}/e.csv", "--bench", "demo"], {"e.csv": ""}, 2, "empty; give a header line"),
    (
        "fit header only",
        ["fit", "{tmp}/h.csv", "--bench", "demo"],
        {"h.csv": "pressure_Pa,gap_m,voltage_V\n"},
        2,
        "no usable rows",
    ),
    (
        "fit no voltage",
        ["fit", "{tmp}/n.csv", "--bench", "demo"],
        {"n.csv": "pressure_Pa,gap_m\n20,0.03\n"},
        2,
        "no voltage column",
    ),
    (
        "fit header unit",
        ["fit", "{tmp}/u.csv", "--bench", "demo"],
        {"u.csv": "pressure [furlong],gap_m,voltage_V\n20,0.03,400\n"},
        2,
        "unknown unit 'furlong'",
    ),
    (
        "fit rows bad",
        ["fit", "{tmp}/r.csv", "--bench", "demo"],
        {"r.csv": "pressure_Pa,gap_m,voltage_V\nlots,0.03,400\n1e30,0.03,400\n20,0.03,1e9\n"},
        2,
        "no usable rows",
    ),
    (
        "fit too few",
        ["fit", "{tmp}/f.csv", "--bench", "demo"],
        {"f.csv": "pressure_Pa,gap_m,voltage_V\n20,0.03,400\n"},
        2,
        "too few points",
    ),
    ("fit binary", ["fit", "{tmp}/b.csv", "--bench", "demo"], {"b.csv": b"\xff\xfe\x00pressure"}, 2, "cannot be read"),
    (
        "fit free unknown",
        ["fit", "{tmp}/f.csv", "--bench", "demo", "--free", "X"],
        {"f.csv": "pressure_Pa\n"},
        2,
        "'X' is not one of A, B, gamma",
    ),
    (
        "fit free A,gamma",
        ["fit", "{tmp}/f.csv", "--bench", "demo", "--free", "A,gamma"],
        {"f.csv": "pressure_Pa,gap_m,voltage_V\n" + "".join(f"{p},0.03,{300 + p}\n" for p in (10, 20, 40, 80, 160))},
        2,
        "no set of strikes can tell them apart",
    ),
    ("fit no gas", ["fit", "{tmp}/f.csv"], {"f.csv": "pressure_Pa\n"}, 2, "--gas and --cathode needed"),
    (
        "save builtin",
        ["fit", "{tmp}/f.csv", "--bench", "demo", "--save", "demo"],
        {"f.csv": "x\n"},
        2,
        "a built-in bench cannot be changed",
    ),
    (
        "save missing",
        ["fit", "{tmp}/f.csv", "--bench", "demo", "--save", "{tmp}/none.toml"],
        {"f.csv": "x\n"},
        2,
        "no such file",
    ),
    (
        "save not utf8",
        ["fit", "{tmp}/f.csv", "--bench", "demo", "--save", "{tmp}/b.toml"],
        {"f.csv": "x\n", "b.toml": b'[bench]\nname = "\xff"\n'},
        2,
        "cannot be read",
    ),
    (
        "save broken",
        ["fit", "{tmp}/f.csv", "--bench", "demo", "--save", "{tmp}/b.toml"],
        {"f.csv": "x\n", "b.toml": "[bench\n"},
        2,
        "not valid TOML",
    ),
]


# Bench files: one bad field each, read through `strike --bench` (so a profile and the command
# line are held to the same limits and messages).
def _materialise(tmp_path, argv, files):
    for name, content in files.items():
        path = tmp_path / name
        path.parent.mkdir(parents=True, exist_ok=True)
        (path.write_bytes if isinstance(content, bytes) else path.write_text)(content)
    return [a.replace("{tmp}", str(tmp_path)) for a in argv]


def _one_line(err: str) -> None:
    assert err.count("\n") == 1 and err.startswith("strikeline"), err
    assert "Traceback" not in err and "internal error" not in err, err


@pytest.mark.parametrize(("argv", "files", "status", "needle"), [c[1:] for c in CLI], ids=[c[0] for c in CLI])
def test_command_line(tmp_path, capsys, argv, files, status, needle):
    code = cli.main(_materialise(tmp_path, argv, files))
    out, err = capsys.readouterr()
    assert code == status, err
    _one_line(err)
    assert needle in err, err


@pytest.mark.parametrize(("text", "needle"), [c[1:] for c in PROFILES], ids=[c[0] for c in PROFILES])
def test_bench_profile(tmp_path, capsys, text, needle):
    (tmp_path / "b.toml").write_text(text)
    code = cli.main(["strike", "--bench", str(tmp_path / "b.toml"), "--pressure", "20 Pa"])
    out, err = capsys.readouterr()
    assert code == 2 and out == ""
    _one_line(err)
    assert needle in err and err.count(str(tmp_path / "b.toml")) == 1, err


@pytest.mark.parametrize(("record", "needle"), [c[1:] for c in RECORDS], ids=[c[0] for c in RECORDS])
def test_logbook_record_is_skipped_and_named(tmp_path, capsys, record, needle):
    path = tmp_path / "l.jsonl"
    path.write_text(logbook(record))
    csv = tmp_path / "s.csv"
    code = cli.main(["log", str(path), "--strikes", str(csv), "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    summary = json.loads(out)  # valid JSON: never NaN
    assert [s["line"] for s in summary["skipped"]] == [3]
    assert needle in summary["skipped"][0]["why"], summary["skipped"]
    assert csv.read_text().splitlines()[1] == "20.0,0.03,450.0,"  # the good mark (no gas recorded), only good ones
    assert len(csv.read_text().splitlines()) == 2
    assert err.count("\n") == 1 and "1 strike marks written" in err


def test_port_that_cannot_open_exits_non_zero(tmp_path, capsys):
    bench = tmp_path / "b.toml"
    bench.write_text(BENCH + PORT.replace("loop://", str(tmp_path / "no-such-tty")))
    for argv in (["gauge", "--seconds", "0.5"], ["record", "--seconds", "0.5", "--log", str(tmp_path / "l.jsonl")]):
        code = cli.main([argv[0], "--bench", str(bench), *argv[1:]])
        out, err = capsys.readouterr()
        assert code == 1
        assert err.splitlines()[-1].startswith(f"strikeline {argv[0]}: no instrument answered in")
        assert "Traceback" not in err


@pytest.mark.parametrize(
    "argv",
    [
        ["strike", "--bench", "demo"],
        ["strike", "--bench", "demo", "--json"],
        ["curve", "--bench", "demo"],
        ["gases"],
        ["gases", "--json"],
    ],
)
def test_output_to_a_full_device_is_one_line(argv):
    with open("/dev/full", "w") as full:
        r = subprocess.run(
            [sys.executable, "-m", "strikeline.tui.cli", *argv], stdout=full, stderr=subprocess.PIPE, text=True
        )
    assert r.returncode == 2
    _one_line(r.stderr)
    assert "standard output cannot be written (No space left on device)" in r.stderr


def test_a_closed_pipe_is_one_line():
    p = subprocess.Popen(
        [sys.executable, "-m", "strikeline.tui.cli", "curve", "--bench", "demo", "--points", "100000"],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    p.stdout.readline()
    p.stdout.close()  # the reader had enough, like `| head -1`
    err = p.stderr.read()
    p.stderr.close()
    assert p.wait(30) == 0
    _one_line(err)
    assert "broken pipe" in err


def test_there_are_at_least_150_hostile_cases():
    assert len(CLI) + len(PROFILES) + len(RECORDS) + 5 + 2 >= 150
