"""The worked examples in the docstrings run and hold."""

import doctest
import importlib
import pkgutil

import pytest
import strikeline.model
import strikeline.profiles
import strikeline.tui

MODULES = sorted(
    m.name
    for pkg in (strikeline.model, strikeline.profiles, strikeline.tui)
    for m in pkgutil.iter_modules(pkg.__path__, pkg.__name__ + ".")
)


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    result = doctest.testmod(importlib.import_module(name), optionflags=doctest.NORMALIZE_WHITESPACE)
    assert result.failed == 0
