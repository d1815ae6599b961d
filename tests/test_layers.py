"""Imports go one way: the model is pure and loads no UI or I/O library."""

import ast
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


def _loaded_after_import(module: str) -> set[str]:
    code = f"import sys, {module}; print('\\n'.join(sorted(sys.modules)))"
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60, check=True)
    return set(r.stdout.split())


@pytest.mark.parametrize(
    "module",
    [
        "strikeline.model.units",
        "strikeline.model.paschen",
        "strikeline.model.forecast",
        "strikeline.model.bench",
    ],
)
def test_model_loads_neither_textual_nor_serial(module):
    loaded = _loaded_after_import(module)
    for banned in ("textual", "serial", "plotext", "rich"):
        assert not any(m == banned or m.startswith(banned + ".") for m in loaded), banned


def test_model_sources_do_no_io_and_import_no_other_layer():
    for path in (ROOT / "model").glob("*.py"):
        tree = ast.parse(path.read_text())
        for node in ast.walk(tree):
            if isinstance(node, ast.ImportFrom):
                assert not (node.level >= 2), f"{path.name} imports another layer"
                assert node.module is None or node.module.split(".")[0] not in (
                    "textual",
                    "serial",
                    "plotext",
                    "os",
                    "io",
                ), path.name
            if isinstance(node, ast.Import):
                for a in node.names:
                    assert a.name.split(".")[0] not in (
                        "textual",
                        "serial",
                        "plotext",
                        "os",
                        "io",
                        "time",
                        "pathlib",
                    ), path.name
            if isinstance(node, ast.Call) and isinstance(node.func, ast.Name):
                assert node.func.id not in ("open", "eval", "exec", "input", "print"), (
                    f"{path.name} calls {node.func.id}"
                )


def test_drivers_know_nothing_of_the_screen_or_model():
    for path in (ROOT / "drivers").glob("*.py"):
        text = path.read_text()
        assert "textual" not in text and "..model" not in text and "..tui" not in text, path.name


def test_cli_start_up_defers_heavy_imports():
    # `strikeline --help` must not pay for textual or scipy.optimize.
    loaded = _loaded_after_import("strikeline.tui.cli")
    assert "textual" not in loaded and "scipy.optimize" not in loaded


def test_screen_start_up_leaves_scipy_out():
    # scipy costs about as much to import as Textual itself; the screen's first frame must not
    # wait for it (fits and the inverse branches import it when used).
    loaded = _loaded_after_import("strikeline.tui.app")
    assert not any(m == "scipy" or m.startswith("scipy.") for m in loaded)
