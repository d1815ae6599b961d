"""The bibliography: every [key] a data file, a formula, a flag or a document cites is an entry of
profiles/data/sources.toml, and every entry says who, what, when and how far it was checked."""

import re
from pathlib import Path

import pytest
from strikeline.profiles.gasdata import cite, sources
from strikeline.tui.gastext import gases_text

ROOT = Path(__file__).resolve().parents[2]
SELF = Path(__file__).resolve()
KEY = re.compile(r"(?<![\[\w])\[([a-z][a-z0-9]*(?:-[a-z0-9]+)+)\](?!\])")
"""A citation: lowercase words joined by hyphens in square brackets, not a TOML [[table]]."""
HEADER = re.compile(r"^\s*\[[^\]]*\]\s*(#.*)?$", re.M)
"""A TOML table's header line ([carbon-dioxide]): not a citation."""
CITING = [
    *sorted((ROOT / "profiles" / "data").glob("*.toml")),
    *sorted(p for d in ("model", "profiles", "tui", "drivers") for p in (ROOT / d).rglob("*.py")),
    *sorted((ROOT / "tests").rglob("*.py")),
    *sorted((ROOT / "tests" / "reference").glob("*.toml")),
    ROOT / "README.md",
    ROOT / "ARCHITECTURE.md",
    ROOT / "DEVELOPERS.md",
]


def _cited() -> dict[str, list[str]]:
    out: dict[str, list[str]] = {}
    for path in CITING:
        if path.name == "sources.toml" or path == SELF:
            continue
        text = path.read_text(encoding="utf-8")
        if path.suffix == ".toml":
            text = HEADER.sub("", text)
        for key in KEY.findall(text):
            out.setdefault(key, []).append(path.relative_to(ROOT).as_posix())
    return out


def test_the_scan_finds_citations_where_they_are():
    cited = _cited()
    assert "raizer-1991" in cited and "morrow-lowke-1997" in cited  # the pattern still matches
    assert any(p.startswith("profiles/data/") for p in cited["raizer-1991"])
    assert not KEY.findall("[[port.channel]] [curve] [bench]\n[[stray_gap]]")
    assert not KEY.findall(HEADER.sub("", "[carbon-dioxide]\nsource = 'x'\n"))


def test_every_cited_key_is_in_the_bibliography():
    known = sources()
    missing = {k: where for k, where in _cited().items() if k not in known}
    assert not missing, missing


def test_every_entry_is_cited_somewhere():
    unused = set(sources()) - set(_cited())
    assert not unused, unused


@pytest.mark.parametrize("key", sorted(sources()))
def test_every_entry_names_who_what_when_and_how_far_it_was_checked(key):
    e = sources()[key]
    assert e["authors"].strip() and e["title"].strip() and 1850 < int(e["year"]) <= 2026
    assert re.match(r"(found|from memory)", e["checked"]), e["checked"]
    assert "doi" not in e or re.fullmatch(r"10\.\d{4,9}/\S+", e["doi"]), e.get("doi")
    assert "isbn" not in e or re.fullmatch(r"[\d-]{10,17}X?", e["isbn"]), e.get("isbn")
    assert "venue" in e or "publisher" in e


def test_gases_prints_every_source_it_cites():
    text = gases_text()
    listed = set(re.findall(r"^  \[([a-z0-9-]+)\] ", text, re.M))
    used = set(KEY.findall(text.split("sources (each [key] above)")[0]))
    assert used and used <= listed == set(sources())
    assert f"[raizer-1991] {cite(sources()['raizer-1991'])}" in text
