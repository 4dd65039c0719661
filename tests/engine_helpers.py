"""Small scenario files for engine tests, written next to the bundled vessels."""

from __future__ import annotations

from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
VESSELS = ROOT / "vessels"
SCENARIOS = ROOT / "scenarios"


def scenario_text(
    legs: str,
    *,
    vessel: str = "glasswort-drone.toml",
    water: str = 'salinity = 35.0\ntemperature = "15 degC"',
    limits: str = 'time = "2 h"',
    extra: str = "",
    start: str = "state_of_charge = 0.9",
    output: str = 'sample = "10 s"',
    solver: str = "",
) -> str:
    return f"""
[scenario]
name = "test"
vessel = "{(VESSELS / vessel).as_posix()}"

[water]
{water}

[start]
{start}

[output]
{output}

[solver]
{solver}

[limits]
{limits}

{legs}

{extra}
"""


def write_scenario(tmp_path: Path, legs: str, name: str = "s.toml", **kw) -> Path:
    p = tmp_path / name
    p.write_text(scenario_text(legs, **kw), encoding="utf-8")
    return p
