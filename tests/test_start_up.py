"""Start-up structure: the plain units convert without pint exactly as pint would, the
pure-Python Brent root finder gives SciPy's roots to the last bit, and loading files imports
none of the heavy libraries a command does not need.

The wall-time targets themselves (``brinebolt --help`` ≤ 0.3 s, ``check`` ≤ 0.4 s, the demo
run ≤ 0.8 s) are measured by ``benchmarks/bench_startup.py``, never here.
"""

from __future__ import annotations

import json
import math
import os
import random
import subprocess
import sys
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sim.io import units
from sim.io.units import SI_FACTORS, pint_factor_table, to_si
from sim.physics.roots import brent_root

ROOT = Path(__file__).resolve().parent.parent

# ------------------------------------------------------------------ units without pint


def test_every_fast_factor_is_pints():
    # reference library: pint (its own conversion factor for each unit text and kind); when
    # pint's definitions change, regenerate SI_FACTORS with pint_factor_table()
    assert pint_factor_table() == SI_FACTORS


@pytest.mark.parametrize(("unit", "kind"), sorted(SI_FACTORS))
def test_fast_conversion_is_bit_identical_to_pint(unit, kind):
    # reference library: pint (the value pint returns, compared bit for bit)
    rng = random.Random(hash((unit, kind)) & 0xFFFF)
    numbers = [0.05, 1.1, 14.0, 28.0, 600.0, 0.95, 1e-7, 3.3e9, -0.1, -273.0]
    numbers += [rng.uniform(-1e4, 1e4) for _ in range(30)]
    numbers += [10 ** rng.uniform(-9, 9) for _ in range(30)]
    for x in numbers:
        text = f"{x!r} {unit}"
        assert to_si(text, kind) == units._convert(float(repr(x)), unit, kind), text


@settings(max_examples=200, deadline=None)
@given(
    st.sampled_from(sorted(SI_FACTORS)),
    st.floats(min_value=-1e12, max_value=1e12, allow_nan=False, allow_infinity=False),
)
def test_fast_conversion_matches_pint_for_any_number(entry, x):
    # reference library: pint
    unit, kind = entry
    assert to_si(f"{x!r} {unit}", kind) == units._convert(float(repr(x)), unit, kind)


def test_units_outside_the_table_and_errors_still_go_through_pint():
    # reference: ITS-90 (0 °C = 273.15 K) and the international foot (0.3048 m), common practice
    assert ("K", "temperature") not in SI_FACTORS
    assert to_si("285 K", "temperature") == pytest.approx(11.85, rel=1e-12)
    assert to_si("2 yd", "length") == pytest.approx(2 * 3 * 0.3048, rel=1e-12)
    with pytest.raises(units.UnitParseError, match="is not a speed"):
        to_si("3 kg", "speed")  # "kg" is in the table, but only as a mass
    with pytest.raises(units.UnitParseError, match="unknown unit"):
        to_si("3 furlongz", "length")


# ------------------------------------------------------------------ Brent without SciPy


def _pairs():
    rng = random.Random(11)
    for trial in range(400):
        c, p = rng.uniform(-3, 3), rng.uniform(0.2, 5)
        f = [
            lambda x, c=c: x**3 - c,
            lambda x, c=c, p=p: math.exp(p * x) - 2 - c,
            lambda x, c=c, p=p: math.tanh(p * (x - c)) + 1e-3 * x,
            lambda x, c=c, p=p: (x - c) * abs(x - c) ** p,
            lambda x, c=c, p=p: math.atan(x - c) * p + 0.1 * math.sin(5 * x),
        ][trial % 5]
        a, b = -4.0 + rng.random(), 4.0 + rng.random()
        xtol = rng.choice([1e-12, 1e-10, 1e-9, 2e-12])
        rtol = rng.choice([1e-13, 1e-12, 8.881784197001252e-16])
        yield f, a, b, xtol, rtol


def test_brent_root_gives_scipys_roots_bit_for_bit():
    # reference library: scipy.optimize.brentq (the same method; the engine's logs depend on
    # every bit of these roots)
    from scipy.optimize import brentq

    def outcome(fn, f, a, b, xtol, rtol):
        try:
            return fn(f, a, b, xtol=xtol, rtol=rtol, maxiter=200)
        except ValueError as exc:
            return type(exc)

    found = 0
    for f, a, b, xtol, rtol in _pairs():
        ours = outcome(brent_root, f, a, b, xtol, rtol)
        assert ours == outcome(brentq, f, a, b, xtol, rtol)
        found += isinstance(ours, float)
    assert found > 300


def test_brent_root_errors_match_scipys():
    # reference library: scipy.optimize.brentq (which errors it raises)
    from scipy.optimize import brentq

    for fn in (brentq, brent_root):
        with pytest.raises(ValueError, match="different signs"):
            fn(lambda x: x + 5.0, 0.0, 1.0)
        with pytest.raises(ValueError, match="NaN"):
            fn(lambda x: math.nan if x > 0.1 else x - 0.5, 0.0, 1.0)
        with pytest.raises(RuntimeError, match="converge"):
            fn(lambda x: math.cbrt(x - 0.3), 0.0, 1.0, xtol=1e-300, rtol=1e-15, maxiter=2)
    assert brent_root(lambda x: x - 2.0, 2.0, 5.0) == 2.0  # a root at an end


# ------------------------------------------------------------------ what loading imports

HEAVY = ("scipy", "matplotlib", "pint", "h5py", "rich", "numba", "simpy")


def _modules_after(code: str) -> list[str]:
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    out = subprocess.run(
        [sys.executable, "-c", code + "\nimport sys, json; print(json.dumps(sorted(sys.modules)))"],
        cwd=ROOT,
        env=env,
        capture_output=True,
        text=True,
        check=True,
    )
    return json.loads(out.stdout.strip().splitlines()[-1])


def test_loading_files_imports_no_heavy_library():
    mods = _modules_after("import sim.io.files")
    assert not [m for m in mods if m.split(".")[0] in HEAVY]


def test_checking_a_scenario_needs_neither_scipy_nor_pint():
    # the steady feasibility checks run (they need the engine model), yet nothing heavy loads
    code = (
        "from sim.io.files import check_file\n"
        "kind, warnings = check_file('scenarios/glasswort-survey.toml')\n"
        "assert kind == 'scenario'\n"
    )
    mods = _modules_after(code)
    assert "sim.io.feasibility" in mods and "sim.engine.steady" in mods
    assert not [m for m in mods if m.split(".")[0] in ("scipy", "matplotlib", "pint", "h5py")]


def test_help_imports_nothing_heavy():
    mods = _modules_after("from sim.cli.app import build_parser\nbuild_parser().format_help()")
    assert not [m for m in mods if m.split(".")[0] in (*HEAVY, "numpy", "pydantic")]


def test_importing_the_api_does_not_load_the_study_machinery():
    """`brinebolt run` imports sim.api: the design-study code (SciPy statistics, optimisers)
    loads only when a study is used (it cost ≈1 s of start-up when imported eagerly)."""
    import subprocess
    import sys

    code = (
        "import sys, sim.api\n"
        "print(','.join(m for m in ('sim.analysis.study', 'scipy.stats', 'pymoo') "
        "if m in sys.modules))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""
