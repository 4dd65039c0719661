"""The house rules of the code base, checked on every test run.

* the layer contract in ``pyproject.toml`` (import-linter): cli → api → analysis → flight → io →
  engine → safety → physics, physics free of file/unit/terminal libraries, the engine free of
  ``sim.io``;
* no import of a brinebolt module inside a function outside the CLI package (there such imports
  only keep ``brinebolt --help`` fast; elsewhere they would hide a cycle), unless the line says
  ``# lazy: <why>``;
* ``ruff check`` and ``ruff format --check`` are clean.
"""

from __future__ import annotations

import ast
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
SIM = ROOT / "sim"


def test_import_contract_holds():
    from importlinter.cli import lint_imports

    code = lint_imports(config_filename=str(ROOT / "pyproject.toml"), no_cache=True, no_logo=True)
    assert code == 0, "the layer contract is broken: run `lint-imports` for the details"


def _function_level_sim_imports(path: Path) -> list[str]:
    text = path.read_text(encoding="utf-8")
    lines = text.splitlines()
    tree = ast.parse(text)
    found = []
    for fn in ast.walk(tree):
        if not isinstance(fn, ast.FunctionDef | ast.AsyncFunctionDef):
            continue
        for node in ast.walk(fn):
            if "# lazy" in lines[node.lineno - 1] if hasattr(node, "lineno") else False:
                continue  # a deliberate, commented deferral (start-up time), not a hidden cycle
            if isinstance(node, ast.ImportFrom) and (node.module or "").split(".")[0] == "sim":
                found.append(f"{path.relative_to(ROOT)}:{node.lineno} from {node.module}")
            elif isinstance(node, ast.Import):
                for alias in node.names:
                    if alias.name.split(".")[0] == "sim":
                        found.append(f"{path.relative_to(ROOT)}:{node.lineno} import {alias.name}")
    return found


def test_no_function_level_imports_of_sim_outside_the_cli():
    offenders = []
    for path in sorted(SIM.rglob("*.py")):
        if (SIM / "cli") in path.parents or path == SIM / "cli.py":
            continue
        offenders += _function_level_sim_imports(path)
    assert not offenders, "imports inside functions (move them to the top):\n" + "\n".join(
        offenders
    )


@pytest.mark.skipif(shutil.which("ruff") is None, reason="ruff is not installed")
@pytest.mark.parametrize("args", [["check", "."], ["format", "--check", "."]])
def test_ruff_is_clean(args):
    ruff = shutil.which("ruff")
    proc = subprocess.run([ruff, *args], cwd=ROOT, capture_output=True, text=True, check=False)
    assert proc.returncode == 0, f"ruff {' '.join(args)}:\n{proc.stdout}{proc.stderr}"


def test_physics_imports_without_file_libraries():
    """Importing every physics module leaves pydantic, pint, h5py and rich unloaded."""
    code = (
        "import sys, pkgutil, importlib, sim.physics as p\n"
        "for m in pkgutil.walk_packages(p.__path__, 'sim.physics.'):\n"
        "    importlib.import_module(m.name)\n"
        "bad = [n for n in ('pydantic', 'pint', 'h5py', 'rich') if n in sys.modules]\n"
        "print(','.join(bad))\n"
    )
    out = subprocess.run(
        [sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True
    )
    assert out.stdout.strip() == ""
