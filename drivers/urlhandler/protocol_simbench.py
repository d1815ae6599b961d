"""``simbench://`` : the simulated bench as a serial port, so the demo runs the real driver.

    simbench://demo?seed=1&speed=1&gauge_factor=1.6&setpoint=20

The device answers our own invented line protocol (terminator CR LF):

    MEAS P1  ->  P1,OK,1.2500E-01      gauge reading in mbar, as an N2-calibrated gauge
                                        indicates it (true pressure / gauge_factor)
    MEAS U1  ->  U1,OK,1.200E+03       supply voltage read-back, V
    MEAS I1  ->  I1,OK,2.10E+01        supply current read-back, mA
    MEAS F1  ->  F1,OK,4.00E+01        argon flow, sccm      (the reactive variant: pumping=<l/s>
    MEAS F2  ->  F2,OK,6.00E+00        oxygen flow, sccm      in the URL)
    MEAS W1  ->  W1,OK,1.20E+02        RF forward power, W   (the striking variants: cycle=dc or
    MEAS W2  ->  W2,OK,6.00E+00        RF reflected power, W  cycle=rf in the URL, simstrikes.py;
    MEAS B1  ->  B1,OK,-1.2E+02        DC self-bias, V        W1, W2, B1, R1 answer with rf)
    MEAS R1  ->  R1,OK,6.00E+02        electrodes' peak-to-peak voltage, V
    anything else -> ERR

Scenario time runs from the moment the port is opened, ``speed`` times faster than real
time. ``drop_after`` (s of scenario time) makes the device go silent, for fault drills.
"""

from __future__ import annotations

import threading
import time
import urllib.parse

from serial.serialutil import PortNotOpenError, SerialBase, SerialException

from ..sim import Scenario, flows_at, pressure_at, supply_at
from ..simstrikes import Cycle, cycle_pressure, dc_at, rf_at

_RF = ("MEAS W1", "MEAS W2", "MEAS B1", "MEAS R1")
"""Forward and reflected power, self-bias, peak-to-peak voltage: rf_at's order."""

__all__ = ["Serial"]


class Serial(SerialBase):
    """A simulated instrument behind the pyserial interface."""

    clock = staticmethod(time.monotonic)

    def open(self):
        if self.is_open:
            raise SerialException("Port is already open.")
        if self._port is None:
            raise SerialException("Port must be configured before it can be used.")
        self._scenario, self._speed, self._gauge_factor, self._drop_after, self._cycle = self._from_url(self.port)
        self._lock = threading.Condition()
        self._out = bytearray()
        self._pending = bytearray()
        self._t0 = self.clock()
        self.is_open = True

    def _from_url(self, url: str):
        parts = urllib.parse.urlsplit(url)
        if parts.scheme != "simbench":
            raise SerialException(f"expected a simbench:// URL, got {url!r}")
        q = urllib.parse.parse_qs(parts.query)
        try:
            seed = int(q.get("seed", ["1"])[0])
            speed = float(q.get("speed", ["1"])[0])
            factor = float(q.get("gauge_factor", ["1"])[0])
            setpoint = float(q.get("setpoint", ["20"])[0])
            drop = float(q["drop_after"][0]) if "drop_after" in q else None
            voltage = float(q.get("voltage", ["1200"])[0])
            current = float(q.get("current", ["0.021"])[0])
            pumping = float(q["pumping"][0]) * 1e-3 if "pumping" in q else None
            kind = q.get("cycle", [None])[0]
            if kind not in (None, "dc", "rf"):
                raise ValueError(f"cycle={kind!r} is not dc or rf")
            cycle = (
                None
                if kind is None
                else Cycle(
                    kind=kind,
                    v_min=float(q.get("vmin", ["250"])[0]),
                    p_min=float(q.get("pmin", ["15"])[0]),
                    ramp_rate=float(q.get("ramp", ["150"])[0]),
                )
            )
        except ValueError as e:
            raise SerialException(f"bad simbench URL {url!r}: {e}") from None
        if speed <= 0 or factor <= 0 or setpoint <= 0 or (pumping is not None and pumping <= 0):
            raise SerialException(
                f"bad simbench URL {url!r}: speed, gauge_factor, setpoint and pumping must be above zero"
            )
        sc = Scenario(
            setpoint=setpoint, seed=seed, supply_voltage=voltage, supply_current=current, pumping_speed=pumping
        )
        return sc, speed, factor, drop, cycle

    def close(self):
        self.is_open = False

    def _reconfigure_port(self):
        pass

    def _t(self) -> float:
        return (self.clock() - self._t0) * self._speed

    def _answer(self, query: bytes) -> bytes:
        t = self._t()
        if self._drop_after is not None and t >= self._drop_after:
            return b""
        cmd = query.decode("ascii", "replace").strip().upper()
        sc, cy = self._scenario, self._cycle
        if cmd == "MEAS P1":
            p = pressure_at(t, sc) if cy is None else cycle_pressure(t, sc, cy)
            return f"P1,OK,{p / self._gauge_factor / 100.0:.4E}\r\n".encode()
        if cmd in ("MEAS U1", "MEAS I1") and (cy is None or cy.kind == "dc"):
            v, i = supply_at(t, sc) if cy is None else dc_at(t, sc, cy)
            return f"U1,OK,{v:.4E}\r\n".encode() if cmd == "MEAS U1" else f"I1,OK,{i * 1e3:.4E}\r\n".encode()
        if cmd in _RF and cy is not None and cy.kind == "rf":
            value = rf_at(t, sc, cy)[_RF.index(cmd)]
            return f"{cmd[-2:]},OK,{value:.4E}\r\n".encode()
        if cmd in ("MEAS F1", "MEAS F2") and self._scenario.pumping_speed is not None:
            n = int(cmd[-1])
            return f"F{n},OK,{flows_at(t, self._scenario)[n - 1]:.3E}\r\n".encode()
        return b"ERR\r\n"

    @property
    def in_waiting(self):
        with self._lock:
            return len(self._out)

    def write(self, data):
        if not self.is_open:
            raise PortNotOpenError()
        self._pending += bytes(data)
        while b"\r\n" in self._pending:
            line, _, rest = bytes(self._pending).partition(b"\r\n")
            self._pending = bytearray(rest)
            answer = self._answer(line)
            with self._lock:
                self._out += answer
                self._lock.notify_all()
        return len(data)

    def read(self, size=1):
        if not self.is_open:
            raise PortNotOpenError()
        deadline = None if self._timeout is None else self.clock() + self._timeout
        with self._lock:
            while not self._out and self.is_open:
                if deadline is None:
                    self._lock.wait(0.1)
                    continue
                left = deadline - self.clock()
                if left <= 0:
                    break
                self._lock.wait(left)
            data = bytes(self._out[:size])
            del self._out[:size]
        return data

    def reset_input_buffer(self):
        with self._lock:
            self._out.clear()

    def reset_output_buffer(self):
        pass

    def cancel_read(self):
        with self._lock:
            self._lock.notify_all()
