"""The duct thruster against published figures of seawater MHD propulsion (issue 9).

The published numbers and their sources are in tests/data/published/thruster_published.toml;
each check names its source again beside the assertion. "read" figures were read in the cited
text; "from memory" figures were not confirmed and get loose tolerances, said at each check.
docs/validation.md lists the comparisons with the model's numbers.

The plain model has a uniform field over the active length and no end losses unless asked, so
for a real thruster it is an upper bound on thrust at a given current; published test figures
include non-uniform (saddle-coil) fields and end fringing.
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path

import numpy as np
import pytest

from sim.physics.seawater import water_state
from sim.physics.thruster import DuctThruster, operating_point

DATA = tomllib.loads(
    (Path(__file__).parent / "data" / "published" / "thruster_published.toml").read_text()
)
KNOT_M_S = 1852.0 / 3600.0  # international knot (definition)

# open sea water, SP 35, 15 °C, surface (PSS-78 / TEOS-10 through gsw)
SEA = water_state(35.0, 15.0, 0.0)
# a harbour in early summer, SP 33, 20 °C (from memory; σ ≈ 4.5 S/m)
HARBOUR = water_state(33.0, 20.0, 0.0)


def _current_for_thrust(th: DuctThruster, water, speed_m_s: float, thrust_n: float):
    """Operating point at the current giving `thrust_n` (thrust rises with current ahead)."""
    currents = np.geomspace(1.0, 1e9, 2001)
    op = operating_point(th, water, speed_m_s, current_a=currents)
    thrust = op.thrust_n
    assert np.all(np.diff(thrust) > 0.0)
    assert thrust[0] < thrust_n < thrust[-1]
    current = float(np.exp(np.interp(thrust_n, thrust, np.log(currents))))
    return operating_point(th, water, speed_m_s, current_a=current)


# --------------------------------------------------------------------------------------------
# Mitchell & Gubser (1988): overall efficiency > 50 % at 40 kn needs fields above about 5 T
# over volumes of the order of 100 m³ (abstract, read).
# --------------------------------------------------------------------------------------------

MG = DATA["mitchell_gubser_1988"]


def _mg_thruster(b_tesla: float, **kw) -> DuctThruster:
    # one square duct of 100 m³ active volume (2.5 m × 2.5 m × 16 m), rounded inlet K = 0.04
    # (Idelchik 1986, r/D ≥ 0.15), walls 0.1 mm sand roughness
    side = 2.5
    length = MG["active_volume_m3"] / side**2
    losses = {"k_inlet": 0.04} | kw
    return DuctThruster(
        gap_m=side,
        height_m=side,
        length_m=length,
        n_channels=1,
        b_tesla=b_tesla,
        roughness_m=1e-4,
        **losses,
    )


def _mg_eta(b_tesla: float, **kw) -> float:
    # thrust loading C_T = T/(q·A) = 0.2, a lightly loaded pump-jet as suits a fast
    # submersible (our choice; the paper's ship drag is not in its abstract)
    v0 = MG["speed_kn"] * KNOT_M_S
    th = _mg_thruster(b_tesla, **kw)
    thrust = 0.2 * (0.5 * SEA.rho_kg_m3 * v0**2) * th.total_area_m2
    return float(_current_for_thrust(th, SEA, v0, thrust).eta_overall)


def test_mitchell_gubser_efficiency_rises_with_field_and_stays_below_half_at_5_tesla():
    # Mitchell & Gubser (1988), J. Supercond. 1(4):349-364, abstract (read): η_o > 0.5 at
    # 40 kn only "provided that magnetic fields >5T can be maintained over volumes of the
    # order of 100 m3". The model agrees in direction: at 100 m³ and 40 kn it stays below
    # 0.5 at 5 T (it gives 0.18) and rises with the field (0.04, 0.18, 0.36, 0.48 at 2, 5,
    # 10, 20 T). It is more pessimistic than the paper: with the duct's own wall, inlet and
    # nozzle losses it passes 0.5 only above 20 T (docs/validation.md); the paper's duct
    # losses are not in its abstract.
    fields = [2.0, 5.0, 10.0, 20.0]
    etas = [_mg_eta(b) for b in fields]
    assert np.all(np.diff(etas) > 0.0), etas
    assert etas[1] < MG["overall_efficiency"]
    assert etas[0] < 0.1  # ≈0.04: conventional fields give a few per cent (Phillips 1962,
    # J. Ship Res.; Friauf 1961, J. Am. Soc. Naval Eng.: conclusions from memory)


def test_mitchell_gubser_lossless_duct_crosses_half_between_2_5_and_10_tesla():
    # Same source and loading. Without duct losses (the paper counts hull and duct friction
    # apart from the pump-jet, from memory) the field at which η_o reaches 0.5 should be
    # "about 5 T": we accept 2.5-10 T (factor 2 either way: the loading C_T = 0.2 and the
    # duct shape are our choice, not the paper's). Model: 0.46 at 5 T, 0.67 at 8 T.
    lossless = {"k_inlet": 0.0, "k_nozzle": 0.0, "wall_friction": False}
    assert _mg_eta(2.5, **lossless) < MG["overall_efficiency"]
    assert _mg_eta(10.0, **lossless) > MG["overall_efficiency"]


# --------------------------------------------------------------------------------------------
# Way (1968): thrust power / electric power of an MHD cargo submarine rises with size and
# falls with speed (abstract, read): 79 / 83 / 86 % at 29 kn for 25 000 / 50 000 / 100 000 t;
# over 90 % at 20 kn.
# --------------------------------------------------------------------------------------------

WAY = DATA["way_1968"]


def _way_eta(displacement_t: float, speed_kn: float) -> float:
    # Way's arrangement is an external field around the hull; here a duct set scaled with the
    # hull (every length ∝ Δ^(1/3)), field 6 T, thrust = drag = C_D·q·S with the wetted area
    # S = 6·Vol^(2/3) and C_D = 0.0025 (common practice for an appended submarine hull).
    vol = displacement_t * 1000.0 / SEA.rho_kg_m3
    scale = (displacement_t / 25000.0) ** (1.0 / 3.0)
    th = DuctThruster(
        gap_m=2.0 * scale,
        height_m=2.0 * scale,
        length_m=40.0 * scale,
        n_channels=4,
        b_tesla=6.0,
        roughness_m=1e-4,
        k_inlet=0.04,
    )
    v0 = speed_kn * KNOT_M_S
    drag = 0.0025 * 0.5 * SEA.rho_kg_m3 * v0**2 * 6.0 * vol ** (2.0 / 3.0)
    return float(_current_for_thrust(th, SEA, v0, drag).eta_overall)


def test_way_efficiency_rises_with_displacement_at_29_knots():
    # Way (1968), J. Hydronautics 2(2), abstract (read): 79 % < 83 % < 86 % as the
    # displacement doubles twice at 29 kn. Trend only (the model's duct is not Way's external
    # field): the model's efficiency must rise the same way, by a few points per doubling
    # (Way: +4 and +3 points; model +3.5 and +3.6 at 25-32 %; we accept +0.5 to +15 points
    # per doubling). The level differs (the model's 6 T duct set is our choice).
    etas = [_way_eta(d, 29.0) for d in WAY["displacement_t"]]
    published = WAY["efficiency_29kn"]
    assert np.all(np.diff(published) > 0.0)  # the data file holds Way's order
    steps = np.diff(etas)
    assert np.all(steps > 0.005) and np.all(steps < 0.15), etas


def test_way_efficiency_is_higher_at_20_than_at_29_knots():
    # Way (1968), abstract (read): over 90 % at 20 kn against 79-86 % at 29 kn. With thrust
    # = drag ∝ V², the current density needed grows as V² while the back-EMF uB grows as V,
    # so the Lorentz efficiency must fall with speed; the model must show it for each size.
    for d in WAY["displacement_t"]:
        assert _way_eta(d, 20.0) > _way_eta(d, 29.0) + 0.01


# --------------------------------------------------------------------------------------------
# The superconducting test craft of 1991-1992: two thrusters of six ducts each.
# Read: two 2000 kW generators, design 8 kn, first run at about 6 kn (New Scientist 1990;
# Deseret News 1992). From memory: 4 T central field, 0.26 m duct bore, 3.0 m electrodes,
# 2000 A through each duct, ≈4000 N design thrust per thruster (Motora et al. 1991;
# Takezawa et al. 1995).
# --------------------------------------------------------------------------------------------

CRAFT = DATA["test_craft_1992"]


def _craft_duct(**kw) -> DuctThruster:
    # round bore of 0.26 m as the square of equal area (side 0.230 m)
    side = math.sqrt(math.pi / 4.0) * CRAFT["duct_inner_diameter_m"]
    return DuctThruster(
        gap_m=side,
        height_m=side,
        length_m=CRAFT["active_length_m"],
        n_channels=1,
        b_tesla=CRAFT["field_t"],
        roughness_m=1e-5,
        **kw,
    )


def _craft_point(speed_kn: float, **kw):
    # each duct carries the full electrode current (ducts in series, as the published
    # current and thrust imply: 2000 A × 4 T × 0.23 m is only 1.8 kN per duct)
    return operating_point(
        _craft_duct(**kw), HARBOUR, speed_kn * KNOT_M_S, current_a=CRAFT["duct_current_a"]
    )


def test_test_craft_electrical_power_fits_the_installed_generators():
    # The model's electrode power for all ducts at the published current must not exceed
    # the installed 2 × 2000 kW (New Scientist 1990, read), and must not be far below it
    # (the plant was sized for the thrusters). Model: 12 × 0.309 MW = 3.71 MW at 6 and 8 kn.
    # Tolerance 0.5-1.0 × installed: the current, bore and length are from memory (±20 %
    # on resistance), and the generators also fed the cryogenic plant.
    n_ducts = CRAFT["n_thrusters"] * CRAFT["ducts_per_thruster"]
    for speed_kn in (CRAFT["trial_speed_kn"], CRAFT["design_speed_kn"]):
        power = n_ducts * float(_craft_point(speed_kn).electrical_power_w)
        ratio = power / CRAFT["generator_power_w"]
        assert 0.5 <= ratio <= 1.0, (speed_kn, power)


def test_test_craft_thrust_is_an_upper_bound_on_the_published_thrust():
    # Published design thrust ≈4000 N per thruster at 2000 A, 4 T (from memory; 8000 N is
    # also quoted). Model at the trial speed: 6 × 1.37 kN = 8.2 kN, 2.05 × the lower figure.
    # The uniform-field model must be the upper bound (4 T is the coil's central field, the
    # saddle-coil field is lower near the duct ends, and fringing current gives no thrust),
    # within a factor of 3 (end and field losses of 30-60 % are reported for short ducts,
    # from memory).
    per_thruster = CRAFT["ducts_per_thruster"] * float(
        _craft_point(CRAFT["trial_speed_kn"]).thrust_n
    )
    ratio = per_thruster / CRAFT["thrust_per_thruster_n"]
    assert 1.0 <= ratio <= 3.0, per_thruster
    # with end fringing the current drawn for the same thrust rises, never the thrust
    with_ends = CRAFT["ducts_per_thruster"] * float(
        _craft_point(CRAFT["trial_speed_kn"], end_effects=True).thrust_n
    )
    assert with_ends < per_thruster


def test_test_craft_overall_efficiency_is_a_few_per_cent():
    # Published figures only: design thrust 2 × 4000 N (from memory) at 8 kn over 4 MW
    # installed (read) gives T·V/P = 0.8 %; with the 8000 N figure 1.6 %. Reports of the
    # trials call the efficiency a few per cent (from memory). The model at 2000 A per duct
    # must give an overall efficiency within 0.5-5 % (model: 1.5 % at 8 kn): a factor of
    # about 3 around the published ratio, which rests on from-memory thrust.
    op = _craft_point(CRAFT["design_speed_kn"])
    published = (
        CRAFT["n_thrusters"]
        * CRAFT["thrust_per_thruster_n"]
        * CRAFT["design_speed_kn"]
        * KNOT_M_S
        / CRAFT["generator_power_w"]
    )
    assert published == pytest.approx(0.0082, rel=0.01)
    assert 0.005 <= float(op.eta_overall) <= 0.05, float(op.eta_overall)
