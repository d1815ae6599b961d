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


def test_screen_start_up_leaves_scipy_numpy_and_serial_out():
    # The live screen's first frame comes before any gauge reading, so it has no forecast yet:
    # nothing on its path may wait for scipy (about as slow to import as Textual), numpy, plotext
    # or pyserial. They load with the first reading, picture, fit or port.
    code = (
        "import sys\n"
        "from strikeline.profiles.loader import load_bench\n"
        "from strikeline.tui.session import Session\n"
        "import strikeline.tui.app\n"
        "s = Session(load_bench('demo'))\n"
        "assert s.view(0.0).withdrawn\n"
        "print('\\n'.join(sorted(sys.modules)))"
    )
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60, check=True)
    loaded = set(r.stdout.split())
    for heavy in ("scipy", "numpy", "plotext", "serial"):
        assert not any(m == heavy or m.startswith(heavy + ".") for m in loaded), heavy
