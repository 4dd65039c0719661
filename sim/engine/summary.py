"""The run summary: one set of numbers worked out from a run's sampled series.

The same function serves a finished run (:class:`sim.engine.mission.MissionRunner` passes the
accumulated totals it integrated) and a log without a stored summary (a partial log: the
analysis passes the series alone). Nothing here reads files.
"""

from __future__ import annotations

import math
from collections.abc import Mapping

import numpy as np

from sim.physics import electrodes
from sim.physics.electrochem import FARADAY_C_MOL

__all__ = [
    "NOT_FINISHED",
    "OLD_SERIES_NAMES",
    "OLD_SUMMARY_KEYS",
    "OPTIONAL_SUMMARY_UNITS",
    "SUMMARY_UNITS",
    "anode_mass_left_kg",
    "summarise",
    "upgrade_summary",
]

NOT_FINISHED = "(log stops here: run not finished)"
"""Ending reason of the summary of a log whose run did not finish."""

SUMMARY_UNITS = {
    "distance_m": "m",
    "duration_s": "s",
    "mean_speed_over_ground_m_s": "m/s",
    "energy_out_j": "J",
    "energy_per_distance_j_m": "J/m",
    "mean_eta_overall": "1",
    "best_eta_overall": "1",
    "end_state_of_charge": "1",
    "peak_duct_temperature_rise_k": "K",
    "peak_battery_temperature_c": "degC",
    "peak_magnet_temperature_c": "degC",
    "h2_total_mol": "mol",
    "cl2_total_mol": "mol",
    "o2_total_mol": "mol",
    "peak_pack_current_a": "A",
    "peak_thruster_current_a": "A",
    "energy_busbar_j": "J",
    "energy_hull_interaction_j": "J",
    "charge_folded_s": "s",
    "peak_void_fraction_outlet": "1",
    "peak_end_current_a": "A",
    "time_drive_saturated_s": "s",
    "time_power_folded_s": "s",
    "time_speed_short_s": "s",
    "drive_limit_episodes": "1",
    "ending_reason": "",
}
"""Summary key -> unit text ("" for the ending reason), in the summary's key order."""

OPTIONAL_SUMMARY_UNITS = {
    "anode_mass_left_kg": "kg",
}
"""Summary keys present only when the run has what they describe (after the keys of
:data:`SUMMARY_UNITS`): ``anode_mass_left_kg``, the least sacrificial anode metal left on one
unit of any design that tracks its anode mass, at the end of the run."""

OLD_SUMMARY_KEYS = {
    "mean_overall_efficiency": "mean_eta_overall",
    "best_overall_efficiency": "best_eta_overall",
}
"""Summary keys of logs written before the efficiency names of docs/efficiencies.md -> now."""

OLD_SERIES_NAMES = {
    "efficiency_electrical": "eta_electrical",
    "efficiency_propulsive": "eta_hydraulic",
    "efficiency_overall": "eta_overall",
}
"""Channel names of logs written before the efficiency names of docs/efficiencies.md -> now."""


def upgrade_summary(summary: Mapping) -> dict:
    """A stored summary with its old keys (:data:`OLD_SUMMARY_KEYS`) also under their new
    names, so that readers of old logs find what they look for."""
    out = dict(summary)
    for old, new in OLD_SUMMARY_KEYS.items():
        if old in out and new not in out:
            out[new] = out[old]
    return out


def _channel(s: Mapping, name: str):
    """A channel by its name now, or by its old name in an old log (None when neither)."""
    if name in s:
        return s[name]
    for old, new in OLD_SERIES_NAMES.items():
        if new == name and old in s:
            return s[old]
    return None


def _trapezoid(y: np.ndarray, t: np.ndarray) -> float:
    y, t = np.asarray(y, dtype=float), np.asarray(t, dtype=float)
    return float(np.sum(0.5 * (y[1:] + y[:-1]) * np.diff(t))) if t.size > 1 else 0.0


def _time_flagged(flag: np.ndarray | None, t: np.ndarray) -> float:
    """Time [s] during which a per-sample flag is set, each sample standing for the interval up
    to the next one; NaN when the series lacks the channel (logs written before it existed)."""
    if flag is None:
        return math.nan
    on = np.asarray(flag, dtype=float)[:-1] > 0
    return float(np.sum(np.diff(t)[on])) if t.size > 1 else 0.0


def summarise(
    series: Mapping[str, np.ndarray],
    *,
    ending_reason: str,
    totals: Mapping[str, float] | None = None,
) -> dict[str, float | str]:
    """The run summary (keys and units of :data:`SUMMARY_UNITS`) from a run's samples.

    Parameters
    ----------
    series : mapping of str to array
        The logged channels (:func:`sim.engine.mission.channel_specs`), one row per sample;
        the last row is the state at which the run ended.
    ending_reason : str
        Why the run ended (:data:`NOT_FINISHED` for a log that stops before the end).
    totals : mapping of str to float, optional
        The accumulators integrated with the state (:data:`sim.engine.model.ACC_NAMES`:
        energies [J], gas [mol]), known for a run flown in this process. Without them (a
        partial log) the energies are the trapezoidal integrals of the sampled powers and the
        oxygen follows from the logged hydrogen and chlorine.

    Returns
    -------
    dict
        Distance over ground [m], duration [s], mean speed over ground [m/s], pack terminal
        energy [J] and energy per distance [J/m], mean and best overall efficiency η_o [-]
        (docs/efficiencies.md; best over the samples that drive the thrusters), end state of
        charge [-], peak duct temperature rise [K], peak battery and magnet temperatures [°C],
        gas evolved [mol], peak pack and total thruster currents [A], busbar loss energy and
        hull-interaction energy (wake and thrust deduction) [J], time with regenerated power
        folded back [s], peak outlet void fraction [-], peak end-fringing current [A], the time
        the drive spent clamped at its current or voltage limit, folded back to the pack's power
        limit, and short of a held speed at a limit [s] (each sample standing for the interval to
        the next; NaN for a log without those channels), the number of separate spells at a
        drive or pack limit (counted on the samples), and the ending reason. Other channels an
        old log lacks count as zero.

    Notes
    -----
    Mean η_o = thrust work / thruster electrical energy, where the electrical
    energy is the sum of its parts (Joule, electrode, friction, wake, useful) when ``totals``
    are given, else ∫ V·I dt over the samples (the same quantity, to the sampling error).
    Without ``totals`` oxygen is n_O2 = (n_H2 − n_Cl2)/2: all cathode charge evolves hydrogen,
    the anode charge not spent on chlorine evolves oxygen.

    References
    ----------
    Faraday's law of electrolysis (gas from charge, :func:`sim.physics.electrochem.
    gas_rates_mol_s`).
    """
    s = series
    n = len(s["time_s"])
    dist = float(s["distance_m"][-1])
    dur = float(s["time_s"][-1])
    if totals is not None:
        energy_out = totals["energy_pack_terminal_j"]
        useful = totals["energy_useful_j"]
        thr_energy = (
            totals["energy_joule_j"]
            + totals["energy_electrode_j"]
            + totals["energy_friction_j"]
            + totals["energy_wake_j"]
            + useful
        )
        h2, cl2, o2 = totals["h2_mol"], totals["cl2_mol"], totals["o2_mol"]
        busbar = totals.get("energy_busbar_j", 0.0)
        interaction = totals.get("energy_hull_interaction_j", 0.0)
    else:
        energy_out = float(s["energy_out_j"][-1])
        useful = _trapezoid(s["useful_power_w"], s["time_s"])
        thr_energy = _trapezoid(s["thruster_power_w"], s["time_s"])
        h2, cl2 = float(s["h2_total_mol"][-1]), float(s["cl2_total_mol"][-1])
        o2 = max(0.0, 0.5 * (h2 - cl2))
        busbar = _trapezoid(s["busbar_loss_w"], s["time_s"]) if "busbar_loss_w" in s else 0.0
        interaction = (
            _trapezoid(s["hull_interaction_power_w"], s["time_s"])
            if "hull_interaction_power_w" in s
            else 0.0
        )
    eff = np.asarray(_channel(s, "eta_overall"))
    t = np.asarray(s["time_s"], dtype=float)
    folded = np.asarray(s["charge_folded"], dtype=float) if "charge_folded" in s else None
    # time folded back: each sample's state held over the interval that follows it
    folded_s = float(np.sum(folded[:-1] * np.diff(t))) if folded is not None and n > 1 else 0.0

    def peak(name: str) -> float:
        return float(np.max(np.abs(s[name]))) if name in s and n else 0.0

    driving = np.asarray(s["thruster_power_w"]) > 0
    thruster_current = np.asarray(s["thruster_current_a"], dtype=float).reshape(n, -1)
    sat, fold = s.get("drive_saturated"), s.get("power_folded")
    short = s.get("speed_short_m_s")
    if sat is not None and fold is not None:
        limited = (np.asarray(sat) > 0) | (np.asarray(fold) > 0)
        episodes = float(np.count_nonzero(limited[1:] & ~limited[:-1]) + int(limited[0]))
    else:
        episodes = math.nan
    out = {
        "distance_m": dist,
        "duration_s": dur,
        "mean_speed_over_ground_m_s": dist / dur if dur > 0 else 0.0,
        "energy_out_j": energy_out,
        "energy_per_distance_j_m": energy_out / dist if dist > 0 else 0.0,
        "mean_eta_overall": useful / thr_energy if thr_energy > 0 else 0.0,
        "best_eta_overall": float(eff[driving].max()) if driving.any() else 0.0,
        "end_state_of_charge": float(s["state_of_charge"][-1]),
        "peak_duct_temperature_rise_k": float(np.max(s["duct_temperature_rise_k"])),
        "peak_battery_temperature_c": float(np.max(s["battery_temperature_c"])),
        "peak_magnet_temperature_c": float(np.max(s["magnet_temperature_c"])),
        "h2_total_mol": h2,
        "cl2_total_mol": cl2,
        "o2_total_mol": o2,
        "peak_pack_current_a": float(np.max(np.abs(s["pack_current_a"]))),
        "peak_thruster_current_a": float(np.max(np.abs(np.sum(thruster_current, axis=1)))),
        "energy_busbar_j": busbar,
        "energy_hull_interaction_j": interaction,
        "charge_folded_s": folded_s,
        "peak_void_fraction_outlet": peak("void_fraction_outlet"),
        "peak_end_current_a": peak("end_current_a"),
        "time_drive_saturated_s": _time_flagged(sat, t),
        "time_power_folded_s": _time_flagged(fold, t),
        "time_speed_short_s": _time_flagged(short, t),
        "drive_limit_episodes": episodes,
        "ending_reason": ending_reason,
    }
    if "anode_mass_left_kg" in s and n:
        last = np.asarray(s["anode_mass_left_kg"], dtype=float).reshape(n, -1)[-1]
        if np.isfinite(last).any():
            out["anode_mass_left_kg"] = float(np.nanmin(last))
    return out


def anode_mass_left_kg(
    h2_total_mol: float, *, units: int, anode: str, anode_mass_kg: float
) -> float:
    """Sacrificial anode metal left on one thruster unit after a run [kg], from the summary's
    hydrogen total.

    Parameters
    ----------
    h2_total_mol : float
        Hydrogen made at all cathodes [mol] (summary key ``h2_total_mol``).
    units : int
        Thruster units that shared that charge (one design: its ``units``).
    anode : str
        Key of :data:`sim.physics.electrodes.SACRIFICIAL_ANODES`.
    anode_mass_kg : float
        Anode metal of one unit when new [kg].

    Returns
    -------
    float
        m0 − Q/capacity, Q = 2F·n_H₂/units (each coulomb through a cathode makes 1/(2F) mol
        H₂ and passed an anode), design (practical) capacity; never below 0.

    References
    ----------
    Faraday's law; DNV-RP-B401 (2017) (:func:`sim.physics.electrodes.anode_mass_left_kg`).
    """
    q = 2.0 * FARADAY_C_MOL * max(float(h2_total_mol), 0.0) / int(units)
    return float(electrodes.anode_mass_left_kg(anode_mass_kg, q, anode))
