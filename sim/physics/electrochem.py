"""Electrochemistry at the thruster electrodes: Faraday's law of gas production.

References
----------
Faraday constant: CODATA 2018 recommended value, F = 96485.33212 C/mol
(Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010).
"""

from __future__ import annotations

import numpy as np

FARADAY_C_MOL = 96485.33212
"""Faraday constant [C/mol] (CODATA 2018)."""


def gas_rates_mol_s(current_a, chlorine_fraction: float = 1.0):
    """Gas evolved at the electrodes by a direct current in seawater (Faraday's law).

    Parameters
    ----------
    current_a : float or array
        Current through the electrolyte [A]. The sign is ignored: gas forms whichever way the
        current flows.
    chlorine_fraction : float
        Fraction of the anodic charge that evolves chlorine (2Cl⁻ → Cl₂ + 2e⁻) [-]; the rest
        evolves oxygen (2H₂O → O₂ + 4H⁺ + 4e⁻). At the cathode all charge evolves hydrogen
        (2H₂O + 2e⁻ → H₂ + 2OH⁻). Default 1.0 (all chlorine, the worst case for toxicity).

    Returns
    -------
    tuple of (h2, cl2, o2)
        Molar production rates [mol/s].

    Notes
    -----
    ṅ_H2 = |I|/(2F); ṅ_Cl2 = f_Cl·|I|/(2F); ṅ_O2 = (1 − f_Cl)·|I|/(4F).

    References
    ----------
    Faraday's law of electrolysis; F from CODATA 2018.
    """
    if not 0.0 <= chlorine_fraction <= 1.0:
        raise ValueError(f"chlorine_fraction = {chlorine_fraction!r} must lie in [0, 1]")
    i = np.abs(np.asarray(current_a, dtype=float))
    h2 = i / (2.0 * FARADAY_C_MOL)
    cl2 = chlorine_fraction * h2
    o2 = (1.0 - chlorine_fraction) * i / (4.0 * FARADAY_C_MOL)
    return h2, cl2, o2
