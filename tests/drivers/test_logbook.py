"""The logbook: round trip, replay, kill -9, torn lines, failing disks, summaries."""

import errno
import json
import os
import signal
import subprocess
import sys
import time

import pytest
from fakes import wait_for
from strikeline.drivers.logbook import FORMAT, Logbook, ReplaySource, read_logbook, reading_from_record
from strikeline.drivers.reading import Reading, Status
from strikeline.profiles.bench import load_bench
from strikeline.tui import cli
from strikeline.tui.report.summary import summarise
from strikeline.tui.session.session import Session


class Clock:
    def __init__(self, t=1000.0):
        self.t = t

    def __call__(self):
        return self.t


def _readings(n, start=0.0, step=0.1):
    return [
        Reading("chamber", "pressure", 10.0 + i, Status.OK, f"{i}", start + i * step, 1.8e9 + i * step)
        for i in range(n)
    ]


def test_round_trip_write_read_replay_gives_the_same_readings(tmp_path):
    clock, wall = Clock(0.0), Clock(1.8e9)
    path = tmp_path / "shift.jsonl"
    book = Logbook(path, clock=clock, wall=wall)
    book.open(bench="demo")
    session = Session(load_bench("demo"), logbook=book, clock=clock, wall=wall)
    sent = _readings(50)
    for r in sent:
        clock.t, wall.t = r.t_mono, r.t_wall
        session.handle(r)
    book.close()
    log = read_logbook(path)
    assert log.records[0]["kind"] == "session" and log.records[0]["format"] == FORMAT
    back = [reading_from_record(x, 0.0) for x in log.records if x["kind"] == "reading"]
    assert [(r.channel, r.value, r.status, r.raw) for r in back] == [
        (r.channel, r.value, r.status, r.raw) for r in sent
    ]
    # the stored value is gas-corrected (thermal gauge in argon), the indicated one is as read
    rec = next(x for x in log.records if x["kind"] == "reading")
    assert rec["value"] == pytest.approx(rec["indicated"] * 1.6)
    got = []
    ReplaySource(log.records, got.append, speed=0).run()
    assert [r.value for r in got] == [r.value for r in sent] and all(r.source == "replay" for r in got)


def test_replay_keeps_its_own_pace():
    recs = [
        {"kind": "reading", "mono": m, "channel": "c", "quantity": "pressure", "indicated": 1.0, "status": "ok"}
        for m in (0.0, 0.1, 0.2)
    ]
    clock = Clock(0.0)
    waits = []

    class Src(ReplaySource):
        pass

    src = Src(recs, lambda r: None, speed=2.0, clock=clock)

    def fake_wait(dt):  # advances the replaced clock instead of sleeping
        waits.append(dt)
        clock.t += dt
        return False

    src._stop.wait = fake_wait
    src.run()
    assert waits == pytest.approx([0.05, 0.05])


def test_torn_last_line_is_tolerated(tmp_path):
    path = tmp_path / "torn.jsonl"
    reading = '{"kind":"reading","t_unix":1.8e9,"channel":"c","quantity":"pressure","status":"ok"}'
    path.write_text('{"kind":"session","t_unix":1.8e9}\n' + reading + '\n{"kind":"read')
    log = read_logbook(path)
    assert len(log.records) == 2 and log.torn_tail and log.bad_lines == []
    path.write_text('{"kind":"session","t_unix":1.8e9}\nnot json\n{"kind":"event","t_unix":1.8e9,"event":"x"}\n')
    log = read_logbook(path)
    assert len(log.records) == 2 and log.skipped == [(2, "not JSON (Expecting value)")] and not log.torn_tail


class FailingFile:
    """A file whose writes fail like a full disk until ``healed``."""

    def __init__(self, real, state):
        self.real, self.state = real, state

    def write(self, s):
        if not self.state["healed"]:
            raise OSError(errno.ENOSPC, "No space left on device")
        return self.real.write(s)

    def flush(self):
        self.real.flush()

    def fileno(self):
        return self.real.fileno()

    def close(self):
        self.real.close()


def test_full_disk_is_reported_at_once_and_nothing_is_lost(tmp_path):
    state = {"healed": False}
    messages = []
    clock = Clock(0.0)
    path = tmp_path / "full.jsonl"
    book = Logbook(
        path,
        clock=clock,
        on_error=messages.append,
        opener=lambda p, mode, encoding: FailingFile(open(p, mode, encoding=encoding), state),
    )
    book.open(bench="demo")
    for i in range(5):
        book.write("entry", field="pressure", text=f"{i} Pa")
        clock.t += 0.3
    assert book.error is not None and "No space left" in book.error
    assert messages and messages[0] == book.error  # said once, at once
    assert book.pending == 6
    state["healed"] = True
    clock.t += 2.0
    book.write("entry", field="gap", text="30 mm")
    assert book.error is None and messages[-1] is None and book.pending == 0
    book.close()
    assert [r.get("text") for r in read_logbook(path).records][1:] == ["0 Pa", "1 Pa", "2 Pa", "3 Pa", "4 Pa", "30 mm"]


def test_read_only_folder_is_reported_and_the_session_goes_on(tmp_path):
    def deny(p, mode, encoding):
        raise OSError(errno.EROFS, "Read-only file system")

    messages = []
    book = Logbook(tmp_path / "ro.jsonl", opener=deny, on_error=messages.append)
    book.open(bench="demo")
    session = Session(load_bench("demo"), logbook=book, clock=Clock(0.0))
    session.handle(_readings(1)[0])
    assert session.update().forecast is not None  # the screen keeps working
    assert messages and "Read-only" in messages[0]
    book.close()


def test_kill_9_of_a_real_recording_loses_at_most_the_last_second(tmp_path):
    path = tmp_path / "killed.jsonl"
    proc = subprocess.Popen(
        [
            sys.executable,
            "-m",
            "strikeline.tui.cli",
            "record",
            "--bench",
            "demo",
            "--seconds",
            "60 s",
            "--log",
            str(path),
        ],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
    )
    try:
        assert wait_for(lambda: path.exists() and path.read_text().count('"kind":"reading"') > 60, timeout=30)
        first = path.read_text().count('"kind":"reading"')
        # another 1.5 s of readings (3 channels at 10 Hz), so the once-a-second sync has run since
        assert wait_for(lambda: path.read_text().count('"kind":"reading"') >= first + 45, timeout=30)
        killed_at = time.time()
        os.kill(proc.pid, signal.SIGKILL)
        proc.wait(10)
    finally:
        if proc.poll() is None:
            proc.kill()
    log = read_logbook(path)
    readings = [r for r in log.records if r["kind"] == "reading" and r["channel"] == "chamber"]
    assert readings
    assert readings[-1]["t_unix"] >= killed_at - 1.0  # no more than the last second is missing
    ts = [r["t_unix"] for r in readings]
    assert max(b - a for a, b in zip(ts, ts[1:], strict=False)) < 1.0  # and nothing before it


def _known_log(tmp_path):
    path = tmp_path / "known.jsonl"
    base = 1.8e9
    recs = [{"kind": "session", "t": "x", "t_unix": base, "mono": 0, "bench": "demo", "gas": "argon"}]
    recs.append(
        {
            "kind": "fill",
            "t_unix": base + 12,
            "t": "2027-01-15T08:00:12.000000Z",
            "composition": "argon:80,oxygen:20",
            "source": "typed",
            "flows_Pa_m3_s": {},
        }
    )
    for i in range(10):
        recs.append(
            {
                "kind": "reading",
                "t_unix": base + i,
                "t": "2027-01-15T08:00:00.000000Z",
                "channel": "chamber",
                "quantity": "pressure",
                "status": "ok",
                "indicated": 1.0,
                "value": 1.6,
            }
        )
    recs.append(
        {
            "kind": "reading",
            "t_unix": base + 10,
            "t": "2027-01-15T08:00:10.000000Z",
            "channel": "chamber",
            "quantity": "pressure",
            "status": "lost",
            "indicated": None,
        }
    )
    recs.append(
        {
            "kind": "event",
            "t_unix": base + 10,
            "t": "2027-01-15T08:00:10.000000Z",
            "port": "ctl",
            "event": "lost",
            "message": "cable",
        }
    )
    recs.append(
        {
            "kind": "reading",
            "t_unix": base + 15,
            "t": "2027-01-15T08:00:15.000000Z",
            "channel": "chamber",
            "quantity": "pressure",
            "status": "ok",
            "indicated": 1.0,
        }
    )
    recs.append(
        {
            "kind": "strike",
            "t_unix": base + 16,
            "t": "2027-01-15T08:00:16.000000Z",
            "pressure_Pa": 20.0,
            "gap_m": 0.03,
            "voltage_V": 450.0,
            "gas": "argon:80,oxygen:20",
        }
    )
    recs.append(
        {
            "kind": "flag",
            "t_unix": base + 16,
            "t": "2027-01-15T08:00:16.000000Z",
            "code": "strikes",
            "level": "ok",
            "reason": "r",
            "change": "raised",
        }
    )
    path.write_text("".join(json.dumps(r) + "\n" for r in recs))
    return path


def test_summary_figures_on_a_known_log(tmp_path):
    s = summarise(read_logbook(_known_log(tmp_path)))
    assert s["span_s"] == pytest.approx(16.0)
    assert s["readings"] == {"chamber": {"ok": 11, "lost": 1}}
    assert (
        len(s["gaps"]) == 1
        and s["gaps"][0]["from"] == pytest.approx(1.8e9 + 10)
        and s["gaps"][0]["to"] == pytest.approx(1.8e9 + 15)
    )
    assert len(s["faults"]) == 1 and len(s["strikes"]) == 1 and len(s["flag_changes"]) == 1
    assert [(f["composition"], f["source"]) for f in s["fills"]] == [
        ("argon", "profile"),
        ("argon:80,oxygen:20", "typed"),
    ]


def test_log_verb_exports_strike_marks_for_calibration(tmp_path, capsys):
    out = tmp_path / "strikes.csv"
    assert cli.main(["log", str(_known_log(tmp_path)), "--strikes", str(out)]) == 0
    text = capsys.readouterr().out
    assert "strike marks (1: 0 seen by the instruments" in text and "gaps and faults (1 gaps, 1 faults" in text
    assert "08:00:12.000  argon:80,oxygen:20 (typed)" in text
    assert out.read_text().splitlines() == ["pressure_Pa,gap_m,voltage_V,gas", '20.0,0.03,450.0,"argon:80,oxygen:20"']
    assert cli.main(["log", str(tmp_path / "none.jsonl")]) == 2


def test_record_verb_writes_a_logbook(tmp_path, capsys):
    path = tmp_path / "rec.jsonl"
    assert cli.main(["record", "--bench", "demo", "--seconds", "1.5 s", "--log", str(path)]) == 0
    kinds = {r["kind"] for r in read_logbook(path).records}
    assert {"session", "reading", "forecast", "event"} <= kinds
    assert cli.main(["record", "--bench", "demo-magnetron", "--seconds", "1 s"]) == 2
