"""``simbench://`` : the simulated bench as a serial port, so the demo runs the real driver.

    simbench://demo?seed=1&speed=1&gauge_factor=1.6&setpoint=20

The device answers our own invented line protocol (terminator CR LF):

    MEAS P1  ->  P1,OK,1.2500E-01      gauge reading in mbar, as an N2-calibrated gauge
                                        indicates it (true pressure / gauge_factor)
    MEAS U1  ->  U1,OK,1.200E+03       supply voltage read-back, V
    MEAS I1  ->  I1,OK,2.10E+01        supply current read-back, mA
    MEAS F1  ->  F1,OK,4.00E+01        argon flow, sccm      (the reactive variant: pumping=<l/s>
    MEAS F2  ->  F2,OK,6.00E+00        oxygen flow, sccm      in the URL)
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

__all__ = ["Serial"]


class Serial(SerialBase):
    """A simulated instrument behind the pyserial interface."""

    clock = staticmethod(time.monotonic)

    def open(self):
        if self.is_open:
            raise SerialException("Port is already open.")
        if self._port is None:
            raise SerialException("Port must be configured before it can be used.")
        self._scenario, self._speed, self._gauge_factor, self._drop_after = self._from_url(self.port)
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
        except ValueError as e:
            raise SerialException(f"bad simbench URL {url!r}: {e}") from None
        if speed <= 0 or factor <= 0 or setpoint <= 0 or (pumping is not None and pumping <= 0):
            raise SerialException(
                f"bad simbench URL {url!r}: speed, gauge_factor, setpoint and pumping must be above zero"
            )
        sc = Scenario(
            setpoint=setpoint, seed=seed, supply_voltage=voltage, supply_current=current, pumping_speed=pumping
        )
        return sc, speed, factor, drop

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
        if cmd == "MEAS P1":
            indicated_mbar = pressure_at(t, self._scenario) / self._gauge_factor / 100.0
            return f"P1,OK,{indicated_mbar:.4E}\r\n".encode()
        if cmd == "MEAS U1":
            return f"U1,OK,{supply_at(t, self._scenario)[0]:.3E}\r\n".encode()
        if cmd == "MEAS I1":
            return f"I1,OK,{supply_at(t, self._scenario)[1] * 1e3:.2E}\r\n".encode()
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
