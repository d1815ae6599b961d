"""The one way to build the live screen: :func:`make_app`, for the command line and the tests alike.

It opens the logbook, builds the Session, and wires the readings' source (the bench's
instruments, a replay, or none in manual mode) to the screen through small messages. The
screen itself is :class:`~strikeline.tui.screen.live.StrikelineApp`.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

from textual.message import Message

from ...drivers.logbook import Logbook
from ...drivers.logbook_read import ReplaySource
from ...drivers.reading import Reading
from ...profiles.bench import BenchProfile
from ..session.session import Session
from .live import StrikelineApp
from .messages import Fresh, LogbookNote, PortNote, ReplayNote, Skipped

__all__ = ["make_app"]


def _caution_marker() -> Path:
    from platformdirs import user_config_path

    return user_config_path("strikeline", appauthor=False) / "cautions-shown"


def make_app(
    profile: BenchProfile,
    *,
    manual: bool = False,
    replay: list[dict[str, Any]] | None = None,
    speed: float = 1.0,
    log_path: Path | None = None,
    log: bool = True,
    show_caution: bool | None = None,
    clock: Callable[[], float] = time.monotonic,
    start_sources: bool = True,
    units: str = "SI",
    strict_log: bool = False,
    notes: list[str] | tuple[str, ...] = (),
) -> StrikelineApp:
    """The one way to build the screen, for the command line and the tests alike.

    ``replay`` plays logbook records back instead of reading instruments; ``manual``
    reads none (typed values only). ``show_caution`` None shows the high-voltage
    cautions on the first start for this user only. With ``strict_log`` a logbook that cannot be
    written raises :class:`~strikeline.drivers.logbook.LogbookRefused` before the screen starts
    (a later failure is shown on the screen). ``notes`` are shown as the first events.
    """
    logbook = None
    app_ref: list[StrikelineApp] = []

    def post(msg: Message) -> None:
        if app_ref:
            app_ref[0].post_message(msg)

    if log and replay is None:
        from ..locations import new_logbook_path

        path = log_path or new_logbook_path(profile.bench.name, time.time())
        logbook = Logbook(path, on_error=lambda text: post(LogbookNote(text)))
        logbook.open(
            strict=strict_log,
            bench=profile.label,
            gas=profile.bench.composition,
            cathode=profile.bench.cathode.key,
            mode="manual" if manual else "live",
        )
    session = Session(profile, logbook=logbook, manual=manual or replay is None and not profile.ports, clock=clock)

    def on_reading(r: Reading) -> None:
        note = session.handle(r)  # logged, every one
        if app_ref and app_ref[0].wants():  # only what changes the screen wakes it (tui/screen/pacing.py)
            post(Fresh(time.perf_counter()))
        if note is not None:
            post(Skipped(note))

    def on_port(port: str, kind: str, text: str) -> None:
        session.event(port, kind, text)
        post(PortNote(port, kind, text))

    make_source = None
    mode = "manual" if session.pressure_channel is None else "live"
    if replay is not None:
        session.use_gauge = session.pressure_channel is not None

        def make_source():
            return ReplaySource(
                replay,
                on_reading,
                lambda rec: post(ReplayNote(rec)),
                speed=speed,
                on_done=lambda: post(ReplayNote({"kind": "replay-end"})),
            )

        mode = "replay"
    elif not manual and profile.ports and start_sources:

        def make_source():
            from ...drivers.hub import Instruments

            # One consumer thread takes every port's readings off one queue (drivers/hub.py); a bug in
            # handling one is reported on the screen, never taken for a lost instrument.
            return Instruments(profile.ports, on_reading, on_port, on_error=lambda text: post(Skipped(text)))

    marker = None
    if show_caution is None:  # first start for this user: show the cautions once
        marker = _caution_marker()
        show_caution = not marker.exists()
    app = StrikelineApp(
        session,
        make_source=make_source,
        mode=mode,
        show_caution=show_caution,
        caution_marker=marker,
        clock=clock,
        units=units,
        notes=tuple(notes),
    )
    app_ref.append(app)
    return app
