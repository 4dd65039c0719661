"""Safety figures and caution texts, shared by the command line and the run report.

The gas the electrodes make (litres of hydrogen, grams of chlorine, and what they would mean in an
enclosed space), the flags for high DC current in the water and for strong thruster fields, and
the general cautions every result is printed with. Plain functions of numbers: no file, schema or
console objects (this module imports nothing of brinebolt but :mod:`sim.physics`).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

__all__ = [
    "CAUTIONS",
    "CAUTION_CODES",
    "CAUTION_CURRENT",
    "CAUTION_FIELD",
    "CAUTION_GAS",
    "CL2_IDLH_PPM",
    "CL2_MOLAR_MASS_G",
    "CL2_NIOSH_REL_PPM",
    "DEFAULT_ENCLOSED_M3",
    "H2_LFL_FRACTION",
    "H2_MOLAR_MASS_G",
    "H2_MOLAR_VOLUME_L",
    "HIGH_CURRENT_A",
    "STRONG_FIELD_T",
    "chlorine_ppm_in_volume",
    "current_flag",
    "field_flag",
    "gas_caution",
    "gas_fractions_in_volume",
    "gas_made_text",
    "gas_per_hour",
    "hydrogen_fraction_in_volume",
    "run_flags",
]

# ---------------------------------------------------------------------------- figures

H2_MOLAR_VOLUME_L = 24.4654
"""Molar volume of an ideal gas at 25 °C and 1 atm [L/mol] (ideal-gas law)."""

CL2_MOLAR_MASS_G = 70.906
"""Molar mass of Cl₂ [g/mol] (IUPAC standard atomic weights)."""

CL2_NIOSH_REL_PPM = 0.5
"""NIOSH recommended exposure limit for chlorine, 15-minute ceiling [ppm] (NIOSH Pocket Guide)."""

CL2_IDLH_PPM = 10.0
"""Chlorine concentration immediately dangerous to life or health [ppm] (NIOSH IDLH)."""

H2_LFL_FRACTION = 0.04
"""Lower flammability limit of hydrogen in air [-] (Zabetakis 1965, USBM Bulletin 627)."""

HIGH_CURRENT_A = 100.0
"""Peak thruster current [A] above which a run is flagged for high DC current in the water
(project choice: far above what a person in the water may meet without harm)."""

STRONG_FIELD_T = 0.5
"""Thruster field [T] at or above which a vessel is flagged for its strong field, for people with
implants (project choice; the stray field is far weaker than the gap field, but at such gap
fields it exceeds the 0.5 mT limit commonly applied to pacemaker wearers well outside the
thruster, from memory: ACGIH static-field TLV)."""

DEFAULT_ENCLOSED_M3 = 10.0
"""Enclosed air volume [m³] of the gas caution when none is given."""

# ---------------------------------------------------------------------------- general cautions

CAUTION_GAS = (
    "Electrolysis of seawater releases hydrogen (flammable 4–75 % in air) and chlorine (toxic; "
    "NIOSH REL 0.5 ppm ceiling, IDLH 10 ppm): ventilate, never enclose the outlet gas."
)
CAUTION_CURRENT = (
    "High DC currents in water can injure or kill: keep people out of the water near energised "
    "electrodes and isolate before handling."
)
CAUTION_FIELD = "Strong magnetic fields attract tools and affect pacemakers and implants."
CAUTION_CODES = (
    "This tool is an engineering estimate. Follow local codes and licensed practice for any "
    "real craft."
)
CAUTIONS = (CAUTION_GAS, CAUTION_CURRENT, CAUTION_FIELD, CAUTION_CODES)
"""The general reminders printed with every result, in this order."""

# ---------------------------------------------------------------------------- gas


def gas_per_hour(h2_mol_s: float, cl2_mol_s: float) -> tuple[float, float]:
    """Hydrogen [L/h at 25 °C, 1 atm] and chlorine [g/h] from molar rates [mol/s]."""
    return h2_mol_s * 3600 * H2_MOLAR_VOLUME_L, cl2_mol_s * 3600 * CL2_MOLAR_MASS_G


H2_MOLAR_MASS_G = 2.016
"""Molar mass of H₂ [g/mol] (IUPAC standard atomic weights)."""


def gas_fractions_in_volume(h2_mol: float, cl2_mol: float, volume_m3: float) -> tuple[float, float]:
    """Volume fractions of hydrogen and chlorine [-] in an enclosed, well-mixed air space of
    ``volume_m3`` [m³] into which all the gas made is released.

    The space keeps its pressure (1 atm, 25 °C) by pushing out its well-mixed contents as the
    gas comes in, and has no other air change: the worst case for a closed compartment. Then
    the share of the space taken by the released gas is 1 − exp(−G/V), G the gas volume, split
    between the gases as they were made, so the fractions grow towards the gas mixture's own
    and their sum never exceeds 1 (the well-mixed dilution law, C = C∞ (1 − exp(−G/V)); common
    practice in ventilation design). Without air change a space only fills; any ventilation
    lowers these figures.
    """
    if not volume_m3 > 0:
        raise ValueError(f"enclosed volume {volume_m3!r} m³: allowed: a positive volume")
    h2, cl2 = max(float(h2_mol), 0.0), max(float(cl2_mol), 0.0)
    total = h2 + cl2
    if total == 0.0:
        return 0.0, 0.0
    gas_m3 = total * H2_MOLAR_VOLUME_L / 1000.0
    filled = -math.expm1(-gas_m3 / volume_m3)
    return filled * h2 / total, filled * cl2 / total


def chlorine_ppm_in_volume(cl2_mol: float, volume_m3: float, h2_mol: float = 0.0) -> float:
    """Chlorine [ppm by volume] in the enclosed space of :func:`gas_fractions_in_volume`."""
    return 1e6 * gas_fractions_in_volume(h2_mol, cl2_mol, volume_m3)[1]


def hydrogen_fraction_in_volume(h2_mol: float, volume_m3: float, cl2_mol: float = 0.0) -> float:
    """Hydrogen volume fraction [-] in the enclosed space of :func:`gas_fractions_in_volume`."""
    return gas_fractions_in_volume(h2_mol, cl2_mol, volume_m3)[0]


def gas_made_text(h2_mol: float, cl2_mol: float) -> str:
    """What the electrodes made, in mol, litres (25 °C, 1 atm) and grams: amounts made, not
    concentrations reached."""
    return (
        f"Gas produced: hydrogen {h2_mol:,.2f} mol = {h2_mol * H2_MOLAR_VOLUME_L:,.1f} L at "
        f"25 °C = {h2_mol * H2_MOLAR_MASS_G:,.1f} g; chlorine {cl2_mol:,.2f} mol = "
        f"{cl2_mol * H2_MOLAR_VOLUME_L:,.1f} L = {cl2_mol * CL2_MOLAR_MASS_G:,.1f} g (Faraday's "
        "law, 100 % current efficiency: the amounts made, not concentrations reached)."
    )


def gas_caution(summary: dict, enclosed_volume_m3: float = DEFAULT_ENCLOSED_M3) -> str:
    """One line on the gas a run made and what it could mean in an enclosed space.

    ``summary`` is a run summary (``h2_total_mol``, ``cl2_total_mol`` [mol]). The amounts
    made come first; the enclosed-space figures are upper bounds of
    :func:`gas_fractions_in_volume` (all the gas released into a closed, well-mixed space of
    ``enclosed_volume_m3`` [m³] without air change; they never add up past 100 %)."""
    h2 = float(summary.get("h2_total_mol", 0.0))
    cl2 = float(summary.get("cl2_total_mol", 0.0))
    x_h2, x_cl2 = gas_fractions_in_volume(h2, cl2, enclosed_volume_m3)
    ppm = 1e6 * x_cl2
    text = gas_made_text(h2, cl2)
    flags = []
    if ppm > CL2_NIOSH_REL_PPM:
        flags.append(
            f"released into a closed, well-mixed {enclosed_volume_m3:g} m³ space without air "
            f"change it could bring the chlorine to {ppm:,.0f} ppm (NIOSH REL "
            f"{CL2_NIOSH_REL_PPM} ppm, IDLH {CL2_IDLH_PPM:g} ppm)"
        )
    if x_h2 > H2_LFL_FRACTION:
        flags.append(
            f"the hydrogen to {100 * x_h2:.1f} % by volume, above its 4 % lower flammability limit"
        )
    if flags:
        text += (
            " CAUTION: "
            + "; ".join(flags)
            + " (upper bounds: the gas pushes out the mixed air, so the fractions stay below "
            "the gas mixture's own and sum to at most 100 %; ventilation lowers them). Never "
            "collect or enclose electrolysis gas."
        )
    return text


# ---------------------------------------------------------------------------- current and field


def current_flag(peak_current_a: float) -> str | None:
    """The high-DC-current caution for a run whose thruster current peaked at
    ``peak_current_a`` [A], or None at or below :data:`HIGH_CURRENT_A`."""
    if not peak_current_a > HIGH_CURRENT_A:
        return None
    return (
        f"CAUTION high DC current: up to {peak_current_a:,.0f} A flowed through the water at the "
        f"electrodes (flagged above {HIGH_CURRENT_A:g} A). Keep people and divers out of the "
        "water near energised electrodes; isolate and lock out before handling."
    )


def field_flag(fields_t: Sequence[float], superconducting: bool = False) -> str | None:
    """The strong-field caution for thrusters of gap fields ``fields_t`` [T], or None when none
    reaches :data:`STRONG_FIELD_T`. ``superconducting`` adds the quench warning."""
    if not fields_t or max(fields_t) < STRONG_FIELD_T:
        return None
    return (
        f"CAUTION strong magnetic field: {max(fields_t):g} T in the thruster gaps (flagged at "
        f"{STRONG_FIELD_T:g} T and above). Keep people with pacemakers or other implants "
        "away, and loose steel and tools clear."
        + (" Superconducting magnets can quench." if superconducting else "")
    )


def run_flags(
    summary: dict,
    fields_t: Sequence[float],
    *,
    superconducting: bool = False,
    enclosed_volume_m3: float = DEFAULT_ENCLOSED_M3,
) -> list[str]:
    """The caution lines a run's results call for: the gas made (and what it would mean in an
    enclosed space of ``enclosed_volume_m3`` [m³]), high DC current in the water (from the
    summary's ``peak_thruster_current_a`` [A]) and strong fields (``fields_t`` [T])."""
    lines = [gas_caution(summary, enclosed_volume_m3)]
    amps = current_flag(float(summary.get("peak_thruster_current_a", 0.0)))
    field = field_flag(fields_t, superconducting)
    return lines + [x for x in (amps, field) if x is not None]
