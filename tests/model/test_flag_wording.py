"""Every flag sentence, in every branch, reads as one whole sentence with its numbers.

Each case builds the situation that raises the flag and holds its full reason to a pattern: the
words a technician reads, with the numbers left as patterns. No sentence may carry "None", "nan"
or two clauses glued together (the stray-gap sentence once read "at or below the main gap cannot
break down at all").
"""

import re

import pytest
from flag_cases import DC_CASES, NITROGEN, N, _bench, _point
from flag_cases_more import MORE_CASES
from scipy import constants
from strikeline.model.forecast import forecast

CASES = DC_CASES + MORE_CASES


def _reason(f, code: str) -> str:
    found = [x.reason for x in f.flags if x.code == code]
    assert len(found) == 1, (code, [x.code for x in f.flags])
    return found[0]


@pytest.mark.parametrize(("bench", "point", "code", "pattern"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_flag_sentence(bench, point, code, pattern):
    reason = _reason(forecast(point, bench), code)
    assert re.fullmatch(pattern, reason), reason
    assert not re.search(r"\b(None|nan|inf)\b", reason)


def test_every_flag_code_has_a_wording_case():
    # A new flag must come with its sentence checked here: every code the model can raise (found in
    # its source as Flag("code", ...) or flag("code", ...)) has a case.
    from pathlib import Path

    import strikeline.model

    source = "".join(p.read_text() for p in Path(strikeline.model.__file__).parent.glob("*.py"))
    raised = set(re.findall(r'(?:Flag|flag)\(\s*"([a-z_]+)",', source))
    assert len(raised) >= 30, raised  # the pattern still finds them
    assert {c[3] for c in CASES} == raised


@pytest.mark.parametrize(("bench", "point"), [c[1:3] for c in CASES], ids=[c[0] for c in CASES])
def test_one_flag_per_code(bench, point):
    # The session tracks flags by code (raised/cleared); two flags under one code would hide one.
    codes = [x.code for x in forecast(point, bench).flags]
    assert len(codes) == len(set(codes)), codes


@pytest.mark.parametrize(("bench", "point"), [c[1:3] for c in CASES], ids=[c[0] for c in CASES])
def test_every_number_the_unit_systems_convert_is_a_quantity(bench, point):
    # A pressure, pd, E/p or gap written into the template itself would stay in SI on a Torr screen:
    # each must be a quantity, with its SI unit and what it is, in the JSON as in the flag.
    for x in forecast(point, bench).flags:
        assert not re.search(rf"{N} (Pa|Pa m|mm|V/\(Pa m\))\b", x.template), x.template
        j = x.to_json()
        assert j["reason"] == x.reason and set(j["quantities"]) == {name for name, _ in x.quantities}
        for name, qty in j["quantities"].items():
            assert qty["what"] and qty["unit"] is not None and "{" + name + "}" in x.template


def test_a_flag_sentence_follows_the_operators_units():
    # no_breakdown in Torr: the pds in Torr cm and the pressure in mTorr, converted with scipy's torr.
    from strikeline.tui.text import flag_sentence

    f = forecast(_point(5.0), _bench(fill=NITROGEN))
    (nb,) = [x for x in f.flags if x.code == "no_breakdown"]
    rpd = dict(nb.quantities)["rpd"].value
    text = flag_sentence(nb, "Torr")
    assert f"reduced pd {rpd / (constants.torr * constants.centi):.3g} Torr cm" in text
    assert re.search(rf"raise the pressure above {N} mTorr$", text) and " Pa" not in text
    assert flag_sentence(nb, "SI") == nb.reason
