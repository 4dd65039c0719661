"""Mass and volume of the parts that change between design variants, and the vessel's trim.

Design studies compare thrusters and packs of different sizes. To compare them fairly the vessel
must carry what it is fitted with: bigger magnets and more cells weigh more, and a submerged
body must still float level while a displacement hull sinks deeper. This module sizes the parts
from the design figures (pure functions, SI units) and says what the hull makes of the change.

- Permanent magnets: two facing NdFeB blocks per channel, just thick enough for the field asked
  for; either in an iron yoke (magnetic-circuit load line, :func:`yoke_magnet_mass`) or without
  iron, their volume-mean field over the channel from the closed-form block field
  (:func:`blocks_magnet_mass`, :func:`sim.physics.magnet_gap.facing_blocks_mean_field_t`).
- Superconducting magnets: winding and structure from the stored field energy (virial theorem),
  a cryostat from its surface, a cryocooler from the heat leak through that surface.
- Ducts and electrodes: wall and plate areas times thickness times density.
- The pack: cells × cell mass × a packaging factor.
- Trim: a submerged body is trimmed neutral with ballast (a heavier variant sheds ballast, a
  lighter one takes more on; when the ballast runs out it is out of trim); a displacement hull
  sinks by the extra displaced volume (draft in proportion, form coefficients kept).

References
----------
.. [1] Furlani, E. P. (2001). Permanent Magnet and Electromechanical Devices. Academic Press.
   §4.4 (field of rectangular blocks, through :mod:`sim.physics.magnet_gap`).
.. [2] Moon, F. C. (1982). The virial theorem and scaling laws for superconducting magnet
   systems. Journal of Applied Physics 53(12), 9112–9121. doi:10.1063/1.330423 (minimum
   structural mass M ≥ ρ·E/σ of a magnet storing energy E).
.. [3] Sintered NdFeB density 7.4–7.6 g/cm³ (magnet makers' data sheets, common practice).
.. [4] Pack mass over cell mass 1.2–1.5 for small marine and vehicle packs (housing, busbars,
   management electronics; common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from sim.physics.errors import ModelRangeError
from sim.physics.magnet_gap import facing_blocks_mean_field_t

__all__ = [
    "CRYOCOOLER_KG_PER_W",
    "CRYOCOOLER_W_PER_W",
    "CRYOSTAT_AREAL_KG_M2",
    "GRP_DENSITY_KG_M3",
    "HEAT_LEAK_W_M2",
    "IRON_DENSITY_KG_M3",
    "NDFEB_DENSITY_KG_M3",
    "PACK_PACKAGING_FACTOR",
    "STEEL_DENSITY_KG_M3",
    "TITANIUM_DENSITY_KG_M3",
    "DuctMass",
    "PermanentMagnetMass",
    "SuperconductingMagnetMass",
    "Trim",
    "blocks_magnet_mass",
    "displacement_hull_trim",
    "duct_mass",
    "pack_mass_kg",
    "submerged_body_trim",
    "superconducting_magnet_mass",
    "yoke_magnet_mass",
]

NDFEB_DENSITY_KG_M3 = 7500.0
"""Sintered NdFeB [kg/m³] (data sheets give 7.4–7.6 g/cm³; common practice)."""

GRP_DENSITY_KG_M3 = 1900.0
"""Glass-reinforced plastic duct walls [kg/m³] (1.8–2.0 g/cm³ for hand-laid E-glass/polyester
laminate; common practice)."""

TITANIUM_DENSITY_KG_M3 = 4510.0
"""Titanium electrode plates (platinised or mixed-oxide coated) [kg/m³] (common practice)."""

IRON_DENSITY_KG_M3 = 7850.0
"""Mild steel of a magnet yoke [kg/m³] (common practice)."""

STEEL_DENSITY_KG_M3 = 7900.0
"""Stainless steel of a magnet's structure [kg/m³] (common practice)."""

PACK_PACKAGING_FACTOR = 1.3
"""Pack mass / cell mass (housing, busbars, battery management), within the 1.2–1.5 of small
packs (common practice)."""

CRYOSTAT_AREAL_KG_M2 = 30.0
"""Mass of a vacuum cryostat per area of its outer wall [kg/m²]: stainless vessel of a few mm,
radiation shield and insulation (from memory)."""

HEAT_LEAK_W_M2 = 1.0
"""Heat reaching the cold mass per cryostat wall area [W/m²], radiation through insulation and
conduction down the supports (from memory: of the order of 1 W/m² at 4 K)."""

CRYOCOOLER_KG_PER_W = 100.0
"""Mass of a 4 K cryocooler (cold head and compressor) per watt lifted at 4 K [kg/W] (from
memory: commercial units lift 1–1.5 W for 100–150 kg)."""

CRYOCOOLER_W_PER_W = 7000.0
"""Electrical input of a 4 K cryocooler per watt lifted [W/W] (from memory: 5–10 kW per W)."""

MU0 = 1.25663706212e-6
"""Vacuum permeability [H/m] (CODATA 2018: 1.25663706212(19)e-6 H/m)."""

_PM = "permanent-magnet sizing"
_SC = "superconducting magnet scaling"


def _positive(name: str, value: float, model: str) -> float:
    v = float(value)
    if not (math.isfinite(v) and v > 0.0):
        raise ModelRangeError(name, value, "finite and > 0", model)
    return v


@dataclass(frozen=True)
class PermanentMagnetMass:
    """Permanent magnets (and their iron, if any) of one thruster unit.

    Attributes
    ----------
    thickness_m : thickness of each block along the field [m]
    width_m : width of each block across the channel [m]
    magnet_volume_m3 : magnet volume of the unit (two blocks per channel) [m³]
    magnet_kg : magnet mass of the unit [kg]
    iron_kg : mass of the iron yoke of the unit [kg] (0 without a yoke)
    mass_kg : magnets and iron [kg]
    volume_m3 : solid volume of magnets and iron [m³]
    """

    thickness_m: float
    width_m: float
    magnet_volume_m3: float
    magnet_kg: float
    iron_kg: float
    mass_kg: float
    volume_m3: float


def _check_channel(gap_m, pole_height_m, active_length_m, channels, model):
    w = _positive("gap_m", gap_m, model)
    h = _positive("pole_height_m", pole_height_m, model)
    ell = _positive("active_length_m", active_length_m, model)
    if not (isinstance(channels, int | np.integer) and channels >= 1):
        raise ModelRangeError("channels", channels, "an integer ≥ 1", model)
    return w, h, ell


def blocks_magnet_mass(
    field_t: float,
    br_t: float,
    gap_m: float,
    pole_height_m: float,
    active_length_m: float,
    channels: int = 1,
    *,
    overhang_m: float | None = None,
    density_kg_m3: float = NDFEB_DENSITY_KG_M3,
    max_thickness_ratio: float = 20.0,
) -> PermanentMagnetMass:
    """Facing NdFeB blocks without iron that give a field across a channel, and their mass.

    Parameters
    ----------
    field_t : float
        Volume-mean field wanted over the channel [T], > 0.
    br_t : float
        Remanence of the grade [T].
    gap_m : float
        Electrode gap (channel width) [m].
    pole_height_m : float
        Distance between the two pole faces [m].
    active_length_m : float
        Channel length [m].
    channels : int
        Channels per unit, each with its own pair of blocks.
    overhang_m : float, optional
        How far each block reaches past the channel on every side across and along it [m];
        default half the pole height (wider poles flatten the field; common practice).
    density_kg_m3 : float
        Magnet density [kg/m³]; default sintered NdFeB 7500.
    max_thickness_ratio : float
        Thickest block tried, as a multiple of the pole height [-].

    Returns
    -------
    PermanentMagnetMass

    Raises
    ------
    ModelRangeError
        When such blocks cannot give the field however thick they are.

    Notes
    -----
    Solves ⟨B⟩(t) = field for the thickness t with Brent's method, ⟨B⟩ from
    :func:`sim.physics.magnet_gap.facing_blocks_mean_field_t` (rising monotonically with t).
    Volume = 2 · channels · (gap + 2o) · (length + 2o) · t, mass = density · volume.

    References
    ----------
    Furlani (2001), §4.4 (block field); magnet makers' data sheets for the density (common
    practice).
    """
    b = _positive("field_t", field_t, _PM)
    br = _positive("br_t", br_t, _PM)
    w, h, ell = _check_channel(gap_m, pole_height_m, active_length_m, channels, _PM)
    o = 0.5 * h if overhang_m is None else float(overhang_m)
    bw, bl = w + 2.0 * o, ell + 2.0 * o

    def mean_field(t: float) -> float:
        return facing_blocks_mean_field_t(br, bw, bl, t, h, w, ell, n_points=8)

    t_max = max_thickness_ratio * h
    b_max = mean_field(t_max)
    if b >= b_max:
        raise ModelRangeError(
            "field_t",
            b,
            f"below {b_max:.3g} T, the most that iron-free blocks of Br {br:g} T give across a "
            f"{h * 1e3:g} mm pole height over a {w * 1e3:g} mm gap",
            _PM,
        )
    t = brentq(lambda x: mean_field(x) - b, 1e-6 * h, t_max, xtol=1e-9, rtol=1e-10)
    volume = 2.0 * channels * bw * bl * t
    m = density_kg_m3 * volume
    return PermanentMagnetMass(float(t), bw, float(volume), float(m), 0.0, float(m), float(volume))


def yoke_magnet_mass(
    field_t: float,
    br_t: float,
    gap_m: float,
    pole_height_m: float,
    active_length_m: float,
    channels: int = 1,
    *,
    leakage_factor: float = 1.2,
    iron_saturation_t: float = 1.5,
    density_kg_m3: float = NDFEB_DENSITY_KG_M3,
    iron_density_kg_m3: float = IRON_DENSITY_KG_M3,
) -> PermanentMagnetMass:
    """NdFeB blocks in an iron yoke that give a field across a channel, and their mass.

    Parameters
    ----------
    field_t : float
        Field wanted across the channel [T], > 0.
    br_t : float
        Remanence of the grade [T].
    gap_m, pole_height_m, active_length_m : float
        Channel: electrode gap (block width), distance between the pole faces, length [m].
    channels : int
        Channels per unit, each with its own pair of blocks and yoke.
    leakage_factor : float
        Magnet flux over gap flux, ≥ 1 (from memory: 1.1–1.5 for such a box circuit).
    iron_saturation_t : float
        Flux density allowed in the yoke [T] (common practice for mild steel: 1.4–1.6 T).
    density_kg_m3, iron_density_kg_m3 : float
        Magnet and iron densities [kg/m³].

    Returns
    -------
    PermanentMagnetMass

    Raises
    ------
    ModelRangeError
        When the grade cannot give the field at this leakage (Br ≤ k_l·B).

    Notes
    -----
    Magnetic circuit with ideal iron and recoil permeability 1 (the load line): two blocks of
    thickness t in series with the pole height h give B = Br·2t / (2t + h) / k_l, so

        t = k_l·B·h / (2·(Br − k_l·B)).

    The yoke carries the gap flux Φ = B·w·L (times k_l) at the saturation density: back plates
    and two side legs of thickness d = k_l·B·w / (2·B_sat) around the channel, iron volume
    L·d·(2w + 2(h + 2t + 2d)).

    References
    ----------
    Furlani (2001), ch. 3 (magnetic circuits, load line); iron saturation: common practice.
    """
    b = _positive("field_t", field_t, _PM)
    br = _positive("br_t", br_t, _PM)
    w, h, ell = _check_channel(gap_m, pole_height_m, active_length_m, channels, _PM)
    if not leakage_factor >= 1.0:
        raise ModelRangeError("leakage_factor", leakage_factor, "≥ 1", _PM)
    if br <= leakage_factor * b:
        raise ModelRangeError(
            "field_t",
            b,
            f"below Br/k_l = {br / leakage_factor:.3g} T for a grade of Br {br:g} T in a yoke "
            f"with leakage factor {leakage_factor:g}",
            _PM,
        )
    t = leakage_factor * b * h / (2.0 * (br - leakage_factor * b))
    mag_v = 2.0 * channels * w * ell * t
    d = leakage_factor * b * w / (2.0 * iron_saturation_t)
    iron_v = channels * ell * d * (2.0 * w + 2.0 * (h + 2.0 * t + 2.0 * d))
    mag_kg = density_kg_m3 * mag_v
    iron_kg = iron_density_kg_m3 * iron_v
    return PermanentMagnetMass(
        float(t),
        w,
        float(mag_v),
        float(mag_kg),
        float(iron_kg),
        float(mag_kg + iron_kg),
        float(mag_v + iron_v),
    )


@dataclass(frozen=True)
class SuperconductingMagnetMass:
    """A superconducting magnet with its cryostat and cryocooler.

    Attributes
    ----------
    stored_energy_j : magnetic energy stored [J]
    structure_kg : winding and its force-bearing structure [kg]
    cryostat_kg : vacuum vessel, shield and insulation [kg]
    cryocooler_kg : cryocooler (cold head and compressor) [kg]
    cryocooler_power_w : electrical input of the cryocooler [W]
    mass_kg : total [kg]
    volume_m3 : outer volume of the cryostat [m³]
    """

    stored_energy_j: float
    structure_kg: float
    cryostat_kg: float
    cryocooler_kg: float
    cryocooler_power_w: float
    mass_kg: float
    volume_m3: float


def superconducting_magnet_mass(
    field_t: float,
    bore_width_m: float,
    bore_height_m: float,
    length_m: float,
    *,
    field_volume_factor: float = 2.0,
    allowable_stress_pa: float = 200e6,
    structure_factor: float = 3.0,
    coil_build_m: float = 0.1,
) -> SuperconductingMagnetMass:
    """Mass of a superconducting magnet for a rectangular bore, from stated scalings.

    Parameters
    ----------
    field_t : float
        Field in the bore [T], > 0.
    bore_width_m, bore_height_m, length_m : float
        Bore (all channels of a unit together) [m].
    field_volume_factor : float
        Volume holding the stored energy over the bore volume [-] (from memory: the field
        outside a dipole bore stores about as much again).
    allowable_stress_pa : float
        Working stress of the structure [Pa] (stainless steel; common practice).
    structure_factor : float
        Real winding-and-structure mass over the virial minimum [-] (from memory: 2–4).
    coil_build_m : float
        Radial build of winding, cold mass and cryostat around the bore [m] (from memory).

    Returns
    -------
    SuperconductingMagnetMass

    Notes
    -----
    Stored energy E = B²/(2μ0) · k_V · V_bore. Virial theorem: a magnet storing E needs at least
    M = ρ·E/σ of structure [2]; the structure is taken as ``structure_factor`` times that.
    Cryostat: the box around the bore grown by the build on every side, of area A and volume V;
    mass = areal density · A; heat leak q = HEAT_LEAK_W_M2 · A; cryocooler mass
    CRYOCOOLER_KG_PER_W · q and input power CRYOCOOLER_W_PER_W · q (all from memory).

    References
    ----------
    Moon (1982), J. Appl. Phys. 53, 9112, doi:10.1063/1.330423 (virial minimum mass); the
    cryostat and cryocooler figures are from memory.
    """
    b = _positive("field_t", field_t, _SC)
    w = _positive("bore_width_m", bore_width_m, _SC)
    h = _positive("bore_height_m", bore_height_m, _SC)
    ell = _positive("length_m", length_m, _SC)
    energy = b * b / (2.0 * MU0) * field_volume_factor * w * h * ell
    structure = structure_factor * STEEL_DENSITY_KG_M3 * energy / allowable_stress_pa
    d = 2.0 * coil_build_m
    a, c, e = w + d, h + d, ell + d
    area = 2.0 * (a * c + a * e + c * e)
    q = HEAT_LEAK_W_M2 * area
    cryostat = CRYOSTAT_AREAL_KG_M2 * area
    cooler = CRYOCOOLER_KG_PER_W * q
    return SuperconductingMagnetMass(
        stored_energy_j=energy,
        structure_kg=structure,
        cryostat_kg=cryostat,
        cryocooler_kg=cooler,
        cryocooler_power_w=CRYOCOOLER_W_PER_W * q,
        mass_kg=structure + cryostat + cooler,
        volume_m3=a * c * e,
    )


@dataclass(frozen=True)
class DuctMass:
    """Duct walls and electrodes of one thruster unit.

    Attributes
    ----------
    walls_kg : insulating duct walls [kg]
    electrodes_kg : electrode plates [kg]
    mass_kg : both [kg]
    volume_m3 : solid volume of both [m³]
    """

    walls_kg: float
    electrodes_kg: float
    mass_kg: float
    volume_m3: float


def duct_mass(
    gap_m: float,
    pole_height_m: float,
    active_length_m: float,
    channels: int = 1,
    *,
    wall_thickness_m: float = 3e-3,
    wall_density_kg_m3: float = GRP_DENSITY_KG_M3,
    electrode_thickness_m: float = 1e-3,
    electrode_density_kg_m3: float = TITANIUM_DENSITY_KG_M3,
) -> DuctMass:
    """Mass of the channel walls and electrode plates of one unit.

    Parameters
    ----------
    gap_m, pole_height_m, active_length_m : float
        Channel size: electrode gap, pole height, active length [m].
    channels : int
        Channels side by side.
    wall_thickness_m, wall_density_kg_m3 : float
        Insulating wall [m], [kg/m³]; default 3 mm of GRP.
    electrode_thickness_m, electrode_density_kg_m3 : float
        Electrode plate [m], [kg/m³]; default 1 mm of titanium.

    Returns
    -------
    DuctMass

    Notes
    -----
    Each channel has two pole walls (gap × length) and two electrode walls (pole height ×
    length) of insulating laminate, and two electrode plates (pole height × length).

    References
    ----------
    Material densities: common practice.
    """
    w = _positive("gap_m", gap_m, "duct mass")
    h = _positive("pole_height_m", pole_height_m, "duct mass")
    ell = _positive("active_length_m", active_length_m, "duct mass")
    wall_v = channels * 2.0 * (w + h) * ell * wall_thickness_m
    plate_v = channels * 2.0 * h * ell * electrode_thickness_m
    walls = wall_v * wall_density_kg_m3
    plates = plate_v * electrode_density_kg_m3
    return DuctMass(walls, plates, walls + plates, wall_v + plate_v)


def pack_mass_kg(
    series: int, parallel: int, cell_mass_kg: float, packaging_factor: float = PACK_PACKAGING_FACTOR
) -> float:
    """Mass of a battery pack [kg].

    Parameters
    ----------
    series, parallel : int
        Cells in series and in parallel.
    cell_mass_kg : float
        Mass of one cell [kg].
    packaging_factor : float
        Pack mass over the cells' mass [-], ≥ 1; default 1.3 (common practice).

    Returns
    -------
    float
        series · parallel · cell mass · packaging factor [kg].
    """
    if not packaging_factor >= 1.0:
        raise ModelRangeError("packaging_factor", packaging_factor, "≥ 1", "pack mass")
    return float(series * parallel * cell_mass_kg * packaging_factor)


@dataclass(frozen=True)
class Trim:
    """What the hull makes of a change in the mass it carries.

    Attributes
    ----------
    mass_kg : the vessel's mass as it floats (or sinks) [kg]
    margin_kg : ballast left to shed (submerged body) or draft allowance left as mass [kg];
        negative when out of trim
    draft_m : draft of a displacement hull [m] (NaN for a submerged body)
    displaced_volume_m3 : displaced volume of a displacement hull [m³] (NaN for a submerged body)
    in_trim : the hull carries the variant as intended
    """

    mass_kg: float
    margin_kg: float
    draft_m: float
    displaced_volume_m3: float
    in_trim: bool


def submerged_body_trim(
    base_mass_kg: float,
    delta_mass_kg: float,
    delta_outboard_volume_m3: float,
    ballast_kg: float,
    rho_kg_m3: float,
) -> Trim:
    """A submerged body trimmed neutral with ballast, after its parts changed.

    Parameters
    ----------
    base_mass_kg : float
        Mass of the base design, neutrally buoyant [kg].
    delta_mass_kg : float
        Change of the parts' mass [kg].
    delta_outboard_volume_m3 : float
        Change of the solid volume outside the pressure hull (thrusters on pylons), which adds
        buoyancy [m³].
    ballast_kg : float
        Trim ballast the base design carries and can shed [kg], ≥ 0.
    rho_kg_m3 : float
        Water density [kg/m³].

    Returns
    -------
    Trim
        In trim when the net weight gain Δm − ρ·ΔV does not exceed the ballast. In trim the
        vessel is neutral, so its mass is the displaced mass, base + ρ·ΔV (lighter variants
        take on ballast); out of trim it keeps base + Δm − ballast and sinks.

    References
    ----------
    Archimedes' principle; trimming with solid ballast is common practice for small
    underwater vehicles.
    """
    if not ballast_kg >= 0.0:
        raise ModelRangeError("ballast_kg", ballast_kg, "≥ 0", "submerged trim")
    net = delta_mass_kg - rho_kg_m3 * delta_outboard_volume_m3
    margin = ballast_kg - net
    ok = margin >= 0.0
    mass = (
        base_mass_kg + rho_kg_m3 * delta_outboard_volume_m3
        if ok
        else (base_mass_kg + delta_mass_kg - ballast_kg)
    )
    return Trim(float(mass), float(margin), math.nan, math.nan, bool(ok))


def displacement_hull_trim(
    base_mass_kg: float,
    delta_mass_kg: float,
    draft_m: float,
    displaced_volume_m3: float,
    rho_kg_m3: float,
    max_draft_change_m: float = math.inf,
) -> Trim:
    """A displacement hull floating deeper or shallower after its parts changed.

    Parameters
    ----------
    base_mass_kg : float
        Mass of the base design [kg].
    delta_mass_kg : float
        Change of the parts' mass [kg].
    draft_m, displaced_volume_m3 : float
        Draft [m] and displaced volume [m³] of the base design.
    rho_kg_m3 : float
        Water density [kg/m³].
    max_draft_change_m : float
        Largest change of draft the design accepts [m] (freeboard, propulsor immersion).

    Returns
    -------
    Trim
        New displaced volume ∇' = ∇ + Δm/ρ and draft T' = T·∇'/∇ (the form coefficients kept:
        ∇ = C_B·L·B·T); out of trim when |T' − T| exceeds the allowance or ∇' ≤ 0.

    References
    ----------
    Archimedes' principle; ∇ = C_B·L·B·T (definition of the block coefficient, common
    practice).
    """
    mass = base_mass_kg + delta_mass_kg
    vol = displaced_volume_m3 + delta_mass_kg / rho_kg_m3
    if vol <= 0.0:
        return Trim(mass, -math.inf, math.nan, vol, False)
    draft = draft_m * vol / displaced_volume_m3
    change = abs(draft - draft_m)
    margin = (max_draft_change_m - change) * rho_kg_m3 * displaced_volume_m3 / draft_m
    return Trim(
        float(mass), float(margin), float(draft), float(vol), bool(change <= max_draft_change_m)
    )
