"""The repository keeps its promises: CI runs the README's test command, data ships."""

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def test_ci_runs_the_readme_test_command():
    readme = (ROOT / "README.md").read_text()
    ci_lines = [
        ln
        for ln in (ROOT / ".ci" / "run").read_text().splitlines()
        if ln and not ln.startswith(("#", "set ", "cd ", "rm "))
    ]
    assert len(ci_lines) == 1
    assert f"    {ci_lines[0]}\n" in readme


def test_installed_package_runs_from_any_folder(tmp_path):
    # profiles/ data must come from the installed package, not the working directory.
    r = subprocess.run(
        [sys.executable, "-m", "strikeline.tui.cli", "strike", "--bench", "demo"],
        cwd=tmp_path,
        capture_output=True,
        text=True,
        timeout=60,
    )
    assert r.returncode == 0, r.stderr
    assert "breakdown voltage" in r.stdout


def test_top_level_is_as_specified():
    for name in ("README.md", "DEVELOPERS.md", "pyproject.toml", "tui", "model", "drivers", "tests", "profiles", ".ci"):
        assert (ROOT / name).exists(), name


def test_every_package_folder_is_installed():
    # A subpackage missing from pyproject works in an editable checkout and vanishes from a
    # real install (it happened to drivers/urlhandler, the demo's simulated gauge).
    import tomllib

    cfg = tomllib.loads((ROOT / "pyproject.toml").read_text())["tool"]["setuptools"]
    listed = {cfg["package-dir"][p] for p in cfg["packages"]}
    found = {
        str(init.parent.relative_to(ROOT))
        for top in ("model", "drivers", "profiles", "tui")
        for init in (ROOT / top).rglob("__init__.py")
    }
    assert found == listed
