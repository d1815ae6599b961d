"""Instrument sources: line framing, serial-URL polling, simulation, replay, logbook.

Drivers know nothing of the model or the screen.
"""
