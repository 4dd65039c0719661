"""Quantities with units in input files, converted to plain SI floats at the edge.

Every dimensional value in a vessel or scenario file is a string such as ``"3 kn"``,
``"1.5 T"``, ``"48 V"``, ``"20 min"`` or ``"12 degC"``. :func:`to_si` parses it with pint, checks
its dimension against what the key expects and returns a float in the SI unit the physics
modules use (temperatures come back in °C, the unit the seawater correlations take). A
temperature *difference* written in °C or °F (``"10 degC"`` for a rise) is read as a difference
(10 K), never as an absolute temperature converted to kelvin.
The physics core never sees pint.

Start-up: importing pint and building its registry takes about 0.3 s, more than the rest of
``brinebolt check``. The plain units files use most (:data:`SI_FACTORS`: ``"m"``, ``"kn"``,
``"min"``, ``"degC"`` ...) are therefore converted with the very factor pint uses (a test
re-derives every one from pint and checks the results bit for bit); any other unit text, and
every error message, still goes through pint.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache

__all__ = ["KINDS", "UnitParseError", "to_si"]


@dataclass(frozen=True)
class Kind:
    """What a key holds: the SI unit returned and a few examples of accepted input."""

    name: str
    si_unit: str
    examples: str


KINDS: dict[str, Kind] = {
    k.name: k
    for k in [
        Kind("length", "m", '"0.5 m", "60 mm", "2 ft"'),
        Kind("distance", "m", '"12 km", "3 nmi", "800 m"'),
        Kind("area", "m**2", '"0.3 m^2", "1200 cm^2"'),
        Kind("volume", "m**3", '"0.12 m^3", "120 L"'),
        Kind("mass", "kg", '"180 kg", "2.5 t"'),
        Kind("speed", "m/s", '"3 kn", "1.5 m/s"'),
        Kind("time", "s", '"20 min", "1.5 h", "30 s"'),
        Kind("force", "N", '"120 N", "1.2 kN"'),
        Kind("power", "W", '"40 W", "1.2 kW"'),
        Kind("voltage", "V", '"48 V", "600 mV"'),
        Kind("current", "A", '"300 A", "25 mA"'),
        Kind("resistance", "ohm", '"5 mohm", "0.02 ohm"'),
        Kind("charge", "A*h", '"27.6 A*h", "100 Ah"'),
        Kind("energy", "J", '"2 kWh", "3.6 MJ"'),
        Kind("field", "T", '"1.5 T", "800 mT"'),
        Kind("temperature", "degC", '"12 degC", "285 K", "54 degF"'),
        Kind("temperature_difference", "K", '"10 K", "10 delta_degC"'),
        Kind("pressure", "dbar", '"5 dbar", "150 kPa"'),
        Kind("thermal_conductance", "W/K", '"2 W/K"'),
        Kind("heat_capacity", "J/K", '"3.5 kJ/K"'),
        Kind("gain_per_speed", "V/(m/s)", '"20 V/(m/s)"'),
        Kind("gain_per_distance", "V/m", '"5 V/m"'),
        Kind("volumetric_rate", "m**3/s", '"2 L/min"'),
    ]
}

_NUMBER_UNIT = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")


class UnitParseError(ValueError):
    """A value could not be read as a quantity of the expected kind.

    ``reason`` says what is wrong, ``allowed`` what would be accepted.
    """

    def __init__(self, reason: str, allowed: str) -> None:
        self.reason = reason
        self.allowed = allowed
        super().__init__(f"{reason}; allowed: {allowed}")


SI_FACTORS: dict[tuple[str, str], float] = {
    # (unit text, kind): the factor pint multiplies the number by (value * factor), generated
    # by pint_factor_table() with pint 0.25; tests/test_units_fast.py re-derives every entry
    ("m", "length"): 1.0,
    ("mm", "length"): 0.001,
    ("cm", "length"): 0.01,
    ("km", "length"): 1000.0,
    ("um", "length"): 1e-06,
    ("ft", "length"): 0.30479999999999996,
    ("in", "length"): 0.0254,
    ("m", "distance"): 1.0,
    ("km", "distance"): 1000.0,
    ("nmi", "distance"): 1852.0,
    ("m^2", "area"): 1.0,
    ("m**2", "area"): 1.0,
    ("cm^2", "area"): 0.0001,
    ("mm^2", "area"): 1e-06,
    ("m^3", "volume"): 1.0,
    ("m**3", "volume"): 1.0,
    ("L", "volume"): 0.0010000000000000002,
    ("l", "volume"): 0.0010000000000000002,
    ("kg", "mass"): 1.0,
    ("g", "mass"): 0.001,
    ("t", "mass"): 1000.0,
    ("kn", "speed"): 0.5144444444444445,
    ("knot", "speed"): 0.5144444444444445,
    ("knots", "speed"): 0.5144444444444445,
    ("m/s", "speed"): 1.0,
    ("km/h", "speed"): 0.2777777777777778,
    ("s", "time"): 1.0,
    ("ms", "time"): 0.001,
    ("min", "time"): 60.0,
    ("h", "time"): 3600.0,
    ("hr", "time"): 3600.0,
    ("d", "time"): 86400.0,
    ("N", "force"): 1.0,
    ("kN", "force"): 1000.0,
    ("W", "power"): 1.0,
    ("kW", "power"): 1000.0,
    ("MW", "power"): 1000000.0,
    ("V", "voltage"): 1.0,
    ("mV", "voltage"): 0.001,
    ("kV", "voltage"): 1000.0,
    ("A", "current"): 1.0,
    ("mA", "current"): 0.001,
    ("kA", "current"): 1000.0,
    ("ohm", "resistance"): 1.0,
    ("mohm", "resistance"): 0.001,
    ("A*h", "charge"): 1.0,
    ("Ah", "charge"): 1.0,
    ("mAh", "charge"): 0.001,
    ("J", "energy"): 1.0,
    ("kJ", "energy"): 1000.0,
    ("MJ", "energy"): 1000000.0,
    ("Wh", "energy"): 3600.0,
    ("kWh", "energy"): 3600000.0,
    ("MWh", "energy"): 3600000000.0,
    ("T", "field"): 1.0,
    ("mT", "field"): 0.001,
    ("degC", "temperature"): 1.0,
    ("K", "temperature_difference"): 1.0,
    ("delta_degC", "temperature_difference"): 1.0,
    ("degC", "temperature_difference"): 1.0,
    ("dbar", "pressure"): 1.0,
    ("kPa", "pressure"): 0.1,
    ("Pa", "pressure"): 0.0001,
    ("bar", "pressure"): 10.0,
    ("W/K", "thermal_conductance"): 1.0,
    ("J/K", "heat_capacity"): 1.0,
    ("kJ/K", "heat_capacity"): 1000.0,
    ("V/(m/s)", "gain_per_speed"): 1.0,
    ("V/m", "gain_per_distance"): 1.0,
    ("m^3/s", "volumetric_rate"): 1.0,
    ("L/min", "volumetric_rate"): 1.666666666666667e-05,
    ("L/s", "volumetric_rate"): 0.0010000000000000002,
}
"""Unit texts converted without pint: ``(unit text, kind name) -> factor``, so that
``to_si("3 kn", "speed") == 3.0 * 0.5144444444444445``, exactly what pint returns. Only units
whose conversion is one multiplication are listed (``"degC"`` to °C and a ``"degC"`` rise to K
are the factor 1); ``"K"`` or ``"degF"`` as a temperature, and anything not listed, go to pint."""


def pint_factor_table(keys=None) -> dict[tuple[str, str], float]:
    """The factors of :data:`SI_FACTORS` (or of ``keys``) as pint computes them now: the value
    pint returns for the number 1 (pint converts ``value * factor``). Imports pint."""
    return {(u, k): _convert(1.0, u, k) for u, k in (SI_FACTORS if keys is None else keys)}


@lru_cache(maxsize=1)
def _registry():
    import pint

    ureg = pint.UnitRegistry()
    return ureg


@lru_cache(maxsize=4096)
def _convert(number: float, unit_text: str, kind_name: str) -> float:
    import pint

    kind = KINDS[kind_name]
    ureg = _registry()
    try:
        q = ureg.Quantity(number, unit_text)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError) as exc:
        raise UnitParseError(
            f"unknown unit {unit_text!r}", f"a {kind.name}, e.g. {kind.examples}"
        ) from exc
    except Exception as exc:  # pint raises a variety of parse errors (AttributeError, TokenError)
        raise UnitParseError(
            f"cannot read unit {unit_text!r}", f"a {kind.name}, e.g. {kind.examples}"
        ) from exc
    target = ureg.Unit(kind.si_unit)
    if q.dimensionality != target.dimensionality:
        raise UnitParseError(
            f"{unit_text!r} is not a {kind.name} (it has dimension {q.dimensionality})",
            f"a {kind.name}, e.g. {kind.examples}",
        )
    offset = str(q.units) in _OFFSET_UNITS
    if kind.name == "temperature_difference" and offset:
        # "10 degC" as a rise means 10 K, not 283.15 K: read it as a difference
        q = ureg.Quantity(number, f"delta_{q.units}")
    elif kind.name == "temperature" and str(q.units).startswith("delta_"):
        raise UnitParseError(
            f"{unit_text!r} is a temperature difference, not a temperature",
            f"a {kind.name}, e.g. {kind.examples}",
        )
    try:
        return float(q.to(target).magnitude)
    except Exception as exc:  # e.g. pint's OffsetUnitCalculusError for products of degC
        raise UnitParseError(
            f"cannot convert {unit_text!r} to {kind.si_unit}",
            f"a {kind.name}, e.g. {kind.examples}",
        ) from exc


_OFFSET_UNITS = frozenset({"degree_Celsius", "degree_Fahrenheit", "degree_Reaumur"})


def to_si(value: object, kind_name: str) -> float:
    """Read a quantity from a file value and return it as a float in the kind's SI unit.

    Parameters
    ----------
    value : str, int or float
        ``"3 kn"``-style text. A bare number is accepted only as 0 (zero needs no unit) for
        kinds other than temperature; everything else must carry its unit.
    kind_name : str
        A key of :data:`KINDS`.

    Returns
    -------
    float
        The value in ``KINDS[kind_name].si_unit``.

    Raises
    ------
    UnitParseError
        With the reason and what is allowed.
    """
    kind = KINDS[kind_name]
    allowed = f"a {kind.name} with its unit, e.g. {kind.examples}"
    if isinstance(value, bool):
        raise UnitParseError(f"got a true/false value ({value})", allowed)
    if isinstance(value, int | float):
        if not math.isfinite(value):
            raise UnitParseError(f"{value} is not a finite number", allowed)
        if value == 0 and kind.name != "temperature":
            return 0.0
        raise UnitParseError(f"the number {value} has no unit", allowed)
    if not isinstance(value, str):
        raise UnitParseError(
            f"expected text such as {kind.examples}, got a {_type_word(value)}", allowed
        )
    text = value.strip()
    if text.lower() in {"nan", "inf", "-inf", "+inf", "infinity"} or re.match(
        r"^[-+]?(nan|inf)", text.lower()
    ):
        raise UnitParseError(f"{value!r} is not a finite number", allowed)
    m = _NUMBER_UNIT.match(text)
    if not m:
        raise UnitParseError(f"{value!r} does not start with a number", allowed)
    number = float(m.group(1))
    unit_text = m.group(2)
    if re.match(r"^,\d", unit_text):
        raise UnitParseError(
            f"{value!r} uses a decimal comma", f"a decimal point, e.g. {kind.examples}"
        )
    if not unit_text:
        if number == 0 and kind.name != "temperature":
            return 0.0
        raise UnitParseError(f"{value!r} has no unit", allowed)
    factor = SI_FACTORS.get((unit_text, kind.name))
    result = number * factor if factor is not None else _convert(number, unit_text, kind.name)
    if not math.isfinite(result):
        raise UnitParseError(f"{value!r} is not a finite quantity", allowed)
    return result


def _type_word(value: object) -> str:
    return {list: "list", dict: "table", tuple: "list"}.get(type(value), type(value).__name__)
