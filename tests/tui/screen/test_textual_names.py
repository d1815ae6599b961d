"""No class of ours hides a name its Textual base already uses for its own state.

Textual's MessagePump sets ``self._closing = False`` in its constructor; a method of ours called
``_closing`` was hidden by it, and every guard calling it raised "'bool' object is not callable"
exactly while the screen was torn down. This test introspects each Textual base (an instance's
attributes and the class's MRO) against every name our subclasses (and mixins) define or assign.
"""

import ast
import importlib
import inspect
import pkgutil
import textwrap

import pytest
import strikeline.tui
from textual.dom import DOMNode
from textual.message import Message

# Documented class settings a Textual subclass is meant to override.
SETTINGS = {
    "AUTO_FOCUS",
    "BINDINGS",
    "CSS",
    "CSS_PATH",
    "DEFAULT_CSS",
    "ENABLE_COMMAND_PALETTE",
    "HORIZONTAL_BREAKPOINTS",
    "SUB_TITLE",
    "TITLE",
    "VERTICAL_BREAKPOINTS",
}


def _our_textual_classes() -> list[type]:
    found = {}
    for m in pkgutil.walk_packages(strikeline.tui.__path__, "strikeline.tui."):
        module = importlib.import_module(m.name)
        for obj in vars(module).values():
            if inspect.isclass(obj) and obj.__module__.startswith("strikeline.") and issubclass(obj, DOMNode | Message):
                found[f"{obj.__module__}.{obj.__qualname__}"] = obj
    return list(found.values())


def _textual_base(cls: type) -> type:
    return next(c for c in cls.__mro__ if c.__module__.startswith("textual."))


def _base_instance_names(base: type) -> set[str]:
    names = {s for c in base.__mro__ for s in getattr(c, "__slots__", ())}
    try:
        names |= set(vars(base()))
    except TypeError:  # no __dict__ (slots only)
        pass
    return names


def _injected(base: type) -> set[str]:
    """What Textual itself writes into every subclass of ``base`` (handler names, CSS type names...)."""
    return set(vars(type("Empty", (base,), {})))


def _assigned_on_self(cls: type) -> set[str]:
    try:
        source = inspect.getsource(cls)
    except (OSError, TypeError):  # defined where no source file exists
        return set()
    tree = ast.parse(textwrap.dedent(source))
    return {
        node.attr
        for node in ast.walk(tree)
        if isinstance(node, ast.Attribute)
        and isinstance(node.ctx, ast.Store)
        and isinstance(node.value, ast.Name)
        and node.value.id == "self"
    }


def _clashes(cls: type) -> list[str]:
    base = _textual_base(cls)
    instance_names = _base_instance_names(base)
    class_names = set(dir(base))
    ours = [c for c in cls.__mro__ if c.__module__.startswith("strikeline.")]
    injected = _injected(base)
    problems = []
    for c in ours:
        for name, value in vars(c).items():
            if (name.startswith("__") and name.endswith("__")) or name in injected:
                continue
            if name in instance_names:
                problems.append(f"{c.__name__}.{name} is hidden by the state {base.__name__} keeps under that name")
            elif name in class_names and name not in SETTINGS:
                theirs = getattr(base, name)
                if name.startswith("_") or not (callable(value) and callable(theirs)):
                    problems.append(f"{c.__name__}.{name} replaces {base.__name__}.{name}")
        for name in _assigned_on_self(c):
            if name in instance_names or name in class_names:
                problems.append(f"{c.__name__} assigns self.{name}, which {base.__name__} already uses")
    return problems


CLASSES = _our_textual_classes()


def test_the_screen_classes_are_all_checked():
    names = {c.__name__ for c in CLASSES}
    assert {"StrikelineApp", "CalibrationScreen", "HelpScreen", "FlagsScreen", "Fresh"} <= names


@pytest.mark.parametrize("cls", CLASSES, ids=lambda c: c.__name__)
def test_no_name_of_ours_shadows_textual_state(cls):
    assert _clashes(cls) == []


def test_the_check_catches_the_closing_clash():
    # The defect that crashed quitting: a method named after MessagePump's own flag.
    from textual.app import App

    class Shadowing(App):
        def _closing(self) -> bool:
            return False

    Shadowing.__module__ = "strikeline.test"
    assert any("_closing is hidden" in p for p in _clashes(Shadowing))
