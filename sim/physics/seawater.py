"""Seawater properties (to be completed: see functions below)."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class WaterState:
    """Properties of the water a vessel moves through, all SI.

    Attributes
    ----------
    sp : practical salinity [-] (PSS-78)
    t_c : in-situ temperature [°C] (ITS-90)
    p_dbar : sea pressure [dbar]
    sigma_s_m : electrical conductivity [S/m]
    dsigma_dt_s_m_k : temperature derivative of conductivity at this state [S/(m·K)]
    rho_kg_m3 : in-situ density [kg/m³]
    cp_j_kg_k : isobaric specific heat capacity [J/(kg·K)]
    mu_pa_s : dynamic viscosity [Pa·s]
    """

    sp: float
    t_c: float
    p_dbar: float
    sigma_s_m: float
    dsigma_dt_s_m_k: float
    rho_kg_m3: float
    cp_j_kg_k: float
    mu_pa_s: float

    @property
    def nu_m2_s(self) -> float:
        """Kinematic viscosity [m²/s]."""
        return self.mu_pa_s / self.rho_kg_m3
