"""Imports go one way (ARCHITECTURE.md): the model is pure, drivers know nothing of the model or
screen, profiles build model and port-spec data, and only tui wires them together.

Every .py file of the four folders is read with ``ast``; absolute, relative and ``from x import``
forms are all resolved to the module they name.
"""

import ast
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
LAYERS = ("model", "drivers", "profiles", "tui")

# What each layer may import from the others (a layer may always import itself).
ALLOWED = {
    "model": set(),
    "drivers": set(),
    "profiles": {"model", "drivers.specs", "drivers.reading"},
    "tui": {"model", "drivers", "profiles"},
}
# Libraries a layer must never import: the model does no I/O and knows no terminal or port.
BANNED = {
    "model": {
        "textual",
        "rich",
        "serial",
        "plotext",
        "matplotlib",
        "pymodbus",
        "pyvisa",
        "platformdirs",
        "os",
        "io",
        "time",
        "pathlib",
        "threading",
        "socket",
        "subprocess",
        "tempfile",
        "shutil",
        "tomllib",
        "logging",
        "sys",
    },
    "drivers": {"textual", "rich", "plotext", "matplotlib", "platformdirs"},
    "profiles": {"textual", "rich", "serial", "plotext", "matplotlib", "pymodbus", "pyvisa"},
    "tui": set(),
}


def _imports(path: Path, package: list[str] | None = None) -> list[str]:
    """Every module (or module.name) ``path`` imports, as absolute dotted names; ``package`` is the
    dotted package the file sits in (default: from its place in the repository)."""
    if package is None:
        package = ["strikeline", *path.relative_to(ROOT).parts[:-1]]
    out = []
    for node in ast.walk(ast.parse(path.read_text())):
        if isinstance(node, ast.Import):
            out += [a.name for a in node.names]
        elif isinstance(node, ast.ImportFrom):
            # "from X import y": y is a submodule of X or a name defined in it; X.y names both.
            base = package[: len(package) - (node.level - 1)] if node.level else []
            module = [*base, *(node.module.split(".") if node.module else [])]
            out += [".".join([*module, a.name]) for a in node.names]
    return out


def _files(layer: str) -> list[Path]:
    return sorted((ROOT / layer).rglob("*.py"))


def test_every_folder_is_read_including_subpackages():
    files = {str(p.relative_to(ROOT)) for layer in LAYERS for p in _files(layer)}
    assert "drivers/urlhandler/protocol_simbench.py" in files and "tui/verbs/parser.py" in files


def test_the_resolver_reads_every_import_form(tmp_path):
    # A guard on the guard: relative, parent-relative, "from . import" and absolute forms.
    probe = tmp_path / "probe.py"
    probe.write_text(
        "import numpy\nfrom . import fields\nfrom ..model import units\nfrom ..drivers.port import PortReader\n"
        "from strikeline.tui.screen import build\n"
    )
    got = _imports(probe, ["strikeline", "profiles"])
    assert got == [
        "numpy",
        "strikeline.profiles.fields",
        "strikeline.model.units",
        "strikeline.drivers.port.PortReader",
        "strikeline.tui.screen.build",
    ]


@pytest.mark.parametrize("layer", LAYERS)
def test_imports_go_one_way(layer):
    problems = []
    for path in _files(layer):
        for name in _imports(path):
            parts = name.split(".")
            where = path.relative_to(ROOT)
            if parts[0] == "strikeline":
                other = parts[1] if len(parts) > 1 else ""
                if other == layer:
                    continue
                sub = ".".join(parts[1:3])
                if other not in ALLOWED[layer] and sub not in ALLOWED[layer]:
                    problems.append(f"{where} imports {name}")
            elif parts[0] in BANNED[layer]:
                problems.append(f"{where} imports {name}")
    assert problems == []


def test_model_sources_call_no_io():
    for path in _files("model"):
        for node in ast.walk(ast.parse(path.read_text())):
            if isinstance(node, ast.Call) and isinstance(node.func, ast.Name):
                assert node.func.id not in ("open", "eval", "exec", "input", "print"), (
                    f"{path.name} calls {node.func.id}"
                )


def _loaded_after_import(module: str) -> set[str]:
    code = f"import sys, {module}; print('\\n'.join(sorted(sys.modules)))"
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60, check=True)
    return set(r.stdout.split())


@pytest.mark.parametrize(
    "module",
    ["strikeline.model.units", "strikeline.model.paschen", "strikeline.model.forecast", "strikeline.model.bench"],
)
def test_model_loads_neither_textual_nor_serial(module):
    loaded = _loaded_after_import(module)
    for banned in ("textual", "serial", "plotext", "rich"):
        assert not any(m == banned or m.startswith(banned + ".") for m in loaded), banned


def test_profiles_load_no_port_library():
    # The loader builds port specs without pyserial, pymodbus or pyvisa: they load when ports start.
    loaded = _loaded_after_import("strikeline.profiles.bench")
    for lib in ("serial", "pymodbus", "pyvisa"):
        assert not any(m == lib or m.startswith(lib + ".") for m in loaded), lib


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
        "from strikeline.profiles.bench import load_bench\n"
        "from strikeline.tui.session.session import Session\n"
        "import strikeline.tui.screen.build\n"
        "s = Session(load_bench('demo'))\n"
        "assert s.update(0.0).withdrawn\n"
        "print('\\n'.join(sorted(sys.modules)))"
    )
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60, check=True)
    loaded = set(r.stdout.split())
    for heavy in ("scipy", "numpy", "plotext", "serial", "pymodbus", "pyvisa"):
        assert not any(m == heavy or m.startswith(heavy + ".") for m in loaded), heavy


def test_the_live_screens_first_frame_waits_for_no_heavy_import():
    # The screen draws its layout and the bench's name first; the forecast (numpy), the curve
    # (plotext) and the ports (pyserial) fill in after that frame. What was loaded when the first
    # frame went out is read off the real app (headless), in a fresh interpreter.
    code = (
        "import asyncio, sys\n"
        "import textual.app\n"
        "from strikeline.profiles.bench import load_bench\n"
        "from strikeline.tui.screen.build import make_app\n"
        "first = []\n"
        "shown = textual.app.App._display\n"
        "def display(self, screen, update):\n"
        "    if update is not None and not first:\n"
        "        first.append(sorted(sys.modules))\n"
        "    return shown(self, screen, update)\n"
        "textual.app.App._display = display\n"
        "async def run():\n"
        "    app = make_app(load_bench('demo'), log=False, show_caution=False)\n"
        "    async with app.run_test(size=(80, 24)) as pilot:\n"
        "        for _ in range(200):\n"
        "            await pilot.pause(0.01)\n"
        "            if app.view_ is not None:\n"
        "                break\n"
        "        assert app.view_ is not None and 'numpy' in sys.modules  # the forecast did follow\n"
        "asyncio.run(run())\n"
        "print('\\n'.join(first[0]))"
    )
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert r.returncode == 0, r.stderr[-2000:]
    loaded = set(r.stdout.split())
    assert "strikeline.tui.screen.live" in loaded
    for heavy in (
        "numpy",
        "scipy",
        "plotext",
        "matplotlib",
        "serial",
        "pymodbus",
        "pyvisa",
        "strikeline.tui.screen.dialogs",
    ):
        assert not any(m == heavy or m.startswith(heavy + ".") for m in loaded), heavy


# Inside tui/: the session wires instruments to the model and knows no terminal; the screen and the
# report do not import each other's rooms at module level, and nothing below tui imports a verb.
TUI_PACKAGES = {
    "session": {
        "banned_packages": {"screen", "report", "verbs"},
        "banned_libraries": {"textual", "rich", "matplotlib"},
    },
    "report": {"banned_packages": {"screen", "verbs"}, "banned_libraries": {"textual"}},
    "screen": {"banned_packages": {"verbs"}, "banned_libraries": {"matplotlib"}},
}


@pytest.mark.parametrize("package", sorted(TUI_PACKAGES))
def test_tui_packages_keep_their_rooms(package):
    rule = TUI_PACKAGES[package]
    problems = []
    for path in sorted((ROOT / "tui" / package).rglob("*.py")):
        tree = ast.parse(path.read_text())
        top = [n for n in tree.body if isinstance(n, (ast.Import, ast.ImportFrom))]  # module level only
        for node in top:
            for name in _imports_of(node, ["strikeline", *path.relative_to(ROOT).parts[:-1]]):
                parts = name.split(".")
                if parts[:2] == ["strikeline", "tui"] and len(parts) > 2 and parts[2] in rule["banned_packages"]:
                    problems.append(f"{path.relative_to(ROOT)} imports {name}")
                if parts[0] in rule["banned_libraries"]:
                    problems.append(f"{path.relative_to(ROOT)} imports {name}")
    assert problems == []


def _imports_of(node, package: list[str]) -> list[str]:
    if isinstance(node, ast.Import):
        return [a.name for a in node.names]
    base = package[: len(package) - (node.level - 1)] if node.level else []
    module = [*base, *(node.module.split(".") if node.module else [])]
    return [".".join([*module, a.name]) for a in node.names]
