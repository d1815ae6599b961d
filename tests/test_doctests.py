"""The worked examples in the docstrings run and hold (every layer; modules without one are not cases)."""

import doctest
import importlib
import pkgutil

import pytest
import strikeline.drivers
import strikeline.model
import strikeline.profiles
import strikeline.tui


def _modules_with_examples() -> list[str]:
    names = []
    for pkg in (strikeline.model, strikeline.drivers, strikeline.profiles, strikeline.tui):
        for m in pkgutil.walk_packages(pkg.__path__, pkg.__name__ + "."):
            module = importlib.import_module(m.name)
            if any(t.examples for t in doctest.DocTestFinder().find(module)):
                names.append(m.name)
    return sorted(names)


MODULES = _modules_with_examples()


def test_every_layer_has_worked_examples():
    layers = {name.split(".")[1] for name in MODULES}
    assert layers == {"model", "drivers", "profiles", "tui"}


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    result = doctest.testmod(importlib.import_module(name), optionflags=doctest.NORMALIZE_WHITESPACE)
    assert result.attempted > 0 and result.failed == 0
