"""Human-readable forms of run results (shared by the terminal summary and the report)."""

from __future__ import annotations

KNOT_M_S = 1852.0 / 3600.0
"""One knot [m/s] (international nautical mile of 1852 m per hour)."""

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


def chlorine_ppm_in_volume(cl2_mol: float, volume_m3: float) -> float:
    """Volume concentration [ppm] if the chlorine were released into a closed, well-mixed air
    volume at 25 °C and 1 atm (no absorption, no ventilation: the worst case)."""
    gas_m3 = cl2_mol * H2_MOLAR_VOLUME_L / 1000.0
    return 1e6 * gas_m3 / volume_m3 if volume_m3 > 0 else float("inf")


def hydrogen_fraction_in_volume(h2_mol: float, volume_m3: float) -> float:
    """Volume fraction of hydrogen [-] in a closed air volume (worst case, as above)."""
    return h2_mol * H2_MOLAR_VOLUME_L / 1000.0 / volume_m3 if volume_m3 > 0 else float("inf")


def gas_caution(summary: dict, enclosed_volume_m3: float = 10.0) -> str:
    """One line on the gas a run produced and what it would mean in an enclosed space."""
    h2 = float(summary.get("h2_total_mol", 0.0))
    cl2 = float(summary.get("cl2_total_mol", 0.0))
    ppm = chlorine_ppm_in_volume(cl2, enclosed_volume_m3)
    h2_frac = hydrogen_fraction_in_volume(h2, enclosed_volume_m3)
    text = (
        f"Gas produced: {h2 * H2_MOLAR_VOLUME_L:.1f} L hydrogen, "
        f"{cl2 * CL2_MOLAR_MASS_G:.1f} g chlorine (Faraday's law, 100 % current efficiency). "
    )
    flags = []
    if ppm > CL2_NIOSH_REL_PPM:
        flags.append(
            f"in an enclosed {enclosed_volume_m3:g} m³ space the chlorine alone would "
            f"reach {ppm:,.0f} ppm (NIOSH REL {CL2_NIOSH_REL_PPM} ppm, IDLH "
            f"{CL2_IDLH_PPM:g} ppm)"
        )
    if h2_frac > H2_LFL_FRACTION:
        flags.append(
            f"the hydrogen would reach {100 * h2_frac:.0f} % by volume, above its "
            "4 % lower flammability limit"
        )
    if flags:
        text += "CAUTION: " + "; ".join(flags) + ". Never collect or enclose electrolysis gas."
    return text


def summary_rows(summary: dict) -> list[tuple[str, str]]:
    """(label, value) rows for a run summary, in the units people read."""
    s = summary
    dist = float(s["distance_m"])
    dur = float(s["duration_s"])
    e = float(s["energy_out_j"])
    rows = [
        ("distance over ground", f"{dist / 1000:.3f} km  ({dist / 1852:.3f} nmi)"),
        ("duration", f"{dur / 60:.1f} min  ({dur / 3600:.2f} h)"),
        (
            "mean speed over ground",
            f"{float(s['mean_speed_over_ground_m_s']):.3f} m/s  "
            f"({float(s['mean_speed_over_ground_m_s']) / KNOT_M_S:.2f} kn)",
        ),
        ("energy from the pack", f"{e / 3.6e6:.3f} kWh"),
        (
            "energy per distance",
            f"{e / 3.6e3 / (dist / 1000):.1f} Wh/km  ({e / 3.6e3 / (dist / 1852):.1f} Wh/nmi)"
            if dist > 0
            else "—",
        ),
        ("mean overall efficiency", f"{100 * float(s['mean_overall_efficiency']):.3f} %"),
        ("best overall efficiency", f"{100 * float(s['best_overall_efficiency']):.3f} %"),
        ("end state of charge", f"{100 * float(s['end_state_of_charge']):.1f} %"),
        ("peak duct temperature rise", f"{float(s['peak_duct_temperature_rise_k']):.2f} K"),
        ("peak battery temperature", f"{float(s['peak_battery_temperature_c']):.1f} °C"),
        ("peak magnet temperature", f"{float(s['peak_magnet_temperature_c']):.1f} °C"),
        ("peak pack current", f"{float(s['peak_pack_current_a']):.0f} A"),
        ("peak thruster current (all units)", f"{float(s['peak_thruster_current_a']):.0f} A"),
        ("hydrogen evolved", f"{float(s['h2_total_mol']) * H2_MOLAR_VOLUME_L:.1f} L at 25 °C"),
        ("chlorine evolved", f"{float(s['cl2_total_mol']) * CL2_MOLAR_MASS_G:.1f} g"),
        ("ended by", str(s["ending_reason"])),
    ]
    return rows
