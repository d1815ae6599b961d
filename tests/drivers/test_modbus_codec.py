"""Modbus decoding and read planning (drivers/modbus_codec.py) against outside references: the standard
library's struct and pymodbus's own converter."""

import math

import pytest
from fake_modbus import words
from hypothesis import given
from hypothesis import strategies as st
from pymodbus.client import ModbusTcpClient
from strikeline.drivers.modbus_codec import MAX_REGISTERS, decode, plan_reads
from strikeline.drivers.specs import ChannelSpec, Register

# -- decoding and planning, against outside references ----------------------------------

TYPES = {
    "int16": ("h", st.integers(-(2**15), 2**15 - 1)),
    "uint16": ("H", st.integers(0, 2**16 - 1)),
    "int32": ("i", st.integers(-(2**31), 2**31 - 1)),
    "uint32": ("I", st.integers(0, 2**32 - 1)),
    "float32": ("f", st.floats(width=32, allow_nan=False)),
    "int64": ("q", st.integers(-(2**63), 2**63 - 1)),
    "uint64": ("Q", st.integers(0, 2**64 - 1)),
    "float64": ("d", st.floats(allow_nan=False)),
}


@given(
    st.sampled_from(sorted(TYPES)), st.data(), st.sampled_from(["big", "little"]), st.sampled_from(["big", "little"])
)
def test_decode_matches_struct_for_every_type_and_order(dtype, data, word_order, byte_order):
    fmt, values = TYPES[dtype]
    value = data.draw(values)
    got = decode(words(fmt, value, word_order, byte_order), dtype, word_order, byte_order)
    assert got == float(value) or (math.isinf(value) and got == value)


@given(st.sampled_from(["int16", "uint16", "int32", "uint32", "float32", "int64", "uint64", "float64"]), st.data(),
       st.sampled_from(["big", "little"]))  # fmt: skip
def test_decode_matches_pymodbus_own_converter(dtype, data, word_order):
    # pymodbus's convert_from_registers is an independent implementation of the same convention.
    fmt, values = TYPES[dtype]
    value = data.draw(values)
    regs = words(fmt, value, word_order)
    theirs = ModbusTcpClient.convert_from_registers(
        regs, getattr(ModbusTcpClient.DATATYPE, dtype.upper()), word_order=word_order
    )
    assert decode(regs, dtype, word_order) == pytest.approx(float(theirs), rel=1e-15, abs=0)


@given(
    st.lists(
        st.tuples(
            st.sampled_from(["holding", "input"]),
            st.integers(0, 400),
            st.sampled_from(["uint16", "float32", "float64"]),
        ),  # fmt: skip
        min_size=1,
        max_size=40,
    )
)
def test_read_plan_covers_every_register_without_reading_a_gap(specs):
    chans = [ChannelSpec(f"c{i}", "voltage", register=Register(t, a, d)) for i, (t, a, d) in enumerate(specs)]
    blocks = plan_reads(chans)
    for c in chans:
        r = c.register
        mine = [b for b in blocks if r in b.members]
        assert len(mine) == 1
        b = mine[0]
        assert b.table == r.table and b.start <= r.address and r.address + r.count <= b.start + b.count
    for b in blocks:
        assert b.count <= MAX_REGISTERS
        covered = set()
        for r in b.members:
            covered |= set(range(r.address, r.address + r.count))
        assert covered == set(range(b.start, b.start + b.count))  # no address outside a register is read
