"""The inputs of a study and the variants drawn from them (grids, random, Latin hypercube,
Sobol), each variant a tuple of dotted-key settings with an identity hash.

A varied input maps a point u of the unit interval to a value as the files hold it: a list picks
its ⌊u·n⌋-th entry, a range gives min + u·(max − min) (or the same in the logarithm), rounded
for whole numbers, with its unit appended ("42.5 mm"). Sampling draws points of the unit cube
(scipy.stats.qmc for Latin hypercube and Sobol), all seeded.
"""

from __future__ import annotations

import hashlib
import itertools
import json
import math
import re
from collections.abc import Sequence

import numpy as np
from scipy.stats import qmc

from sim.io.study_schema import VarySpec

__all__ = [
    "VESSEL_TABLES",
    "draw_variants",
    "format_number",
    "grid_points",
    "is_vessel_key",
    "number_of",
    "sample_unit_cube",
    "scale_value",
    "value_at",
    "variant_id",
]

VESSEL_TABLES = frozenset({"vessel", "hull", "thruster", "battery", "drive", "hotel"})
"""Top-level tables of a vessel file; a dotted key starting with another name is a scenario
key."""


def is_vessel_key(key: str) -> bool:
    """True when a dotted key belongs to the vessel file (else to the scenario file)."""
    return key.split(".", 1)[0] in VESSEL_TABLES


def format_number(x: float, unit: str = "", integer: bool = False) -> object:
    """A number as a file would hold it: an int, a float, or text with its unit."""
    if integer:
        x = round(float(x))
        return f"{x} {unit}" if unit else x
    x = float(f"{x:.10g}")
    return f"{x:.10g} {unit}" if unit else x


def number_of(value: object) -> float:
    """The number in a value ("42.5 mm" -> 42.5, 4 -> 4.0); NaN when there is none."""
    if isinstance(value, bool):
        return float(value)
    if isinstance(value, int | float):
        return float(value)
    m = re.match(r"\s*([-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?)", str(value))
    return float(m.group(1)) if m else math.nan


def scale_value(value: object, factor: float) -> object:
    """A value times a factor, keeping its unit text ("0.75 T" × 1.02 -> "0.765 T")."""
    if isinstance(value, bool) or not isinstance(value, int | float | str):
        raise ValueError(f"cannot scale {value!r}: not a number")
    if isinstance(value, int | float):
        return float(f"{value * factor:.10g}")
    m = re.match(r"\s*([-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?)\s*(.*)$", value)
    if not m:
        raise ValueError(f"cannot scale {value!r}: no number at its start")
    return f"{float(m.group(1)) * factor:.10g} {m.group(4)}".strip()


def value_at(v: VarySpec, u: float) -> object:
    """The value of a varied input at the point u ∈ [0, 1] of its range or list."""
    u = min(max(float(u), 0.0), 1.0)
    if v.values is not None:
        return v.values[min(int(u * len(v.values)), len(v.values) - 1)]
    lo, hi = float(v.min), float(v.max)
    x = math.exp(math.log(lo) + u * (math.log(hi) - math.log(lo))) if v.log else lo + u * (hi - lo)
    return format_number(x, v.unit, v.integer)


def grid_points(v: VarySpec) -> list[object]:
    """The grid values of a varied input: its list, or `steps` points over its range (whole
    numbers without repeats)."""
    if v.values is not None:
        return list(v.values)
    out: list[object] = []
    for u in np.linspace(0.0, 1.0, int(v.steps)):
        x = value_at(v, float(u))
        if x not in out:
            out.append(x)
    return out


def sample_unit_cube(method: str, n: int, dims: int, seed: int) -> np.ndarray:
    """``n`` points of the unit cube in ``dims`` dimensions, seeded: random (uniform), lhs
    (Latin hypercube) or sobol (scrambled; a power of two keeps its balance)."""
    if dims == 0:
        return np.zeros((n, 0))
    if method == "random":
        return np.random.default_rng(seed).random((n, dims))
    if method == "lhs":
        return qmc.LatinHypercube(d=dims, seed=seed).random(n)
    if method == "sobol":
        sampler = qmc.Sobol(d=dims, scramble=True, seed=seed)
        m = math.ceil(math.log2(max(n, 1)))
        return sampler.random_base2(m)[:n]
    raise ValueError(f"unknown sampling method {method!r}; allowed: random, lhs, sobol")


def draw_variants(
    vary: Sequence[VarySpec], method: str, count: int, seed: int
) -> list[tuple[tuple[str, object], ...]]:
    """The settings of every variant of a sweep: the full grid, or ``count`` draws."""
    if method == "grid":
        axes = [[(v.key, x) for x in grid_points(v)] for v in vary]
        return [tuple(p) for p in itertools.product(*axes)]
    u = sample_unit_cube(method, count, len(vary), seed)
    return [tuple((v.key, value_at(v, ui)) for v, ui in zip(vary, row, strict=True)) for row in u]


def variant_id(settings: Sequence[tuple[str, object]]) -> str:
    """The identity of a variant: a hash of its settings (keys and values in order, with their
    types), so that a resumed study recognises the variants it has already flown."""
    text = json.dumps([[k, type(v).__name__, v] for k, v in settings], ensure_ascii=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()[:16]
