"""The safety figures of :mod:`sim.safety` against Faraday's law, the ideal-gas law and the
exposure limits they quote, and the current and field flags at their thresholds."""

from __future__ import annotations

import math

import pytest
import scipy.constants as sc

from sim import safety


def test_gas_per_ampere_hour():
    # Faraday's law, F from scipy.constants (CODATA 2018): 1 A makes 1/(2F) mol/s of H2 at the
    # cathode and of Cl2 at the anode; /work/shared/REFERENCES.md: 0.456 L/h and 1.32 g/h
    mol_s = 1.0 / (2.0 * sc.physical_constants["Faraday constant"][0])
    h2_l_h, cl2_g_h = safety.gas_per_hour(mol_s, mol_s)
    assert h2_l_h == pytest.approx(0.456, abs=1e-3)
    assert cl2_g_h == pytest.approx(1.32, abs=5e-3)


def test_gas_figures():
    # ideal-gas molar volume R·T/p at 25 °C and 1 atm, R and atm from scipy.constants (CODATA)
    assert safety.H2_MOLAR_VOLUME_L == pytest.approx(sc.R * 298.15 / sc.atm * 1000, rel=1e-5)
    # Cl2: twice the standard atomic weight of chlorine, 35.45 (IUPAC abridged value)
    assert safety.CL2_MOLAR_MASS_G == pytest.approx(2 * 35.45, abs=0.02)
    # NIOSH Pocket Guide, chlorine: REL C 0.5 ppm (15 min), IDLH 10 ppm
    assert (safety.CL2_NIOSH_REL_PPM, safety.CL2_IDLH_PPM) == (0.5, 10.0)
    # hydrogen lower flammability limit in air 4 % (Zabetakis 1965, USBM Bulletin 627)
    assert safety.H2_LFL_FRACTION == 0.04


def test_gas_caution_in_an_enclosed_space():
    # ideal-gas law: 1 mol at 25 °C and 1 atm takes 24.4654 L. Released into a closed, well-mixed
    # space that keeps its pressure by pushing out its mixed contents, G of gas fill the share
    # 1 - exp(-G/V) of V (well-mixed dilution law, common practice in ventilation design):
    # 1 mol of Cl2 into 24.4654 m^3 gives 1e6 (1 - exp(-1e-3)) = 999.5 ppm
    volume_m3 = sc.R * 298.15 / sc.atm * 1000
    ppm = safety.chlorine_ppm_in_volume(1.0, volume_m3)
    assert ppm == pytest.approx(1e6 * (1 - math.exp(-1e-3)), rel=1e-6)
    text = safety.gas_caution({"h2_total_mol": 0.0, "cl2_total_mol": 1.0}, volume_m3)
    assert "chlorine to 1,000 ppm" in text and "NIOSH REL 0.5 ppm" in text
    assert "hydrogen to" not in text
    # the amounts made are given in mol, litres and grams, and called amounts made
    assert "chlorine 1.00 mol = 24.5 L = 70.9 g" in text and "amounts made" in text
    assert "not concentrations reached" in text
    text = safety.gas_caution({"h2_total_mol": 100.0, "cl2_total_mol": 0.0}, volume_m3)
    assert f"hydrogen to {100 * (1 - math.exp(-0.1)):.1f} % by volume" in text
    assert "above its 4 % lower flammability" in text
    quiet = safety.gas_caution({"h2_total_mol": 1e-6, "cl2_total_mol": 1e-9}, 10.0)
    assert quiet.startswith("Gas produced:") and "CAUTION" not in quiet  # below both limits


def test_enclosed_space_never_holds_more_than_all_of_it():
    # issue 10: 650,661 ppm chlorine and 65 % hydrogen "in the same 10 m^3". Whatever is made,
    # the fractions stay below the gas mixture's own (H2 : Cl2 = 1 : 1 by Faraday's law for
    # 2 electrons each) and sum to at most 1
    for mol in (1.0, 1e3, 2.66e4, 1e7):
        h2, cl2 = safety.gas_fractions_in_volume(mol, mol, 10.0)
        assert 0 < h2 <= 0.5 and 0 < cl2 <= 0.5 and h2 + cl2 <= 1.0
    h2, cl2 = safety.gas_fractions_in_volume(1e7, 1e7, 10.0)
    assert h2 + cl2 == pytest.approx(1.0)
    text = safety.gas_caution({"h2_total_mol": 2.66e4, "cl2_total_mol": 2.66e4}, 10.0)
    assert "chlorine to 500,000 ppm" in text and "hydrogen to 50.0 %" in text
    assert "upper bounds" in text and "sum to at most 100 %" in text
    assert safety.gas_fractions_in_volume(0.0, 0.0, 10.0) == (0.0, 0.0)
    with pytest.raises(ValueError, match="enclosed volume"):
        safety.gas_fractions_in_volume(1.0, 1.0, 0.0)


def test_current_and_field_flags_at_their_thresholds():
    assert safety.current_flag(safety.HIGH_CURRENT_A) is None
    assert "up to 101 A" in safety.current_flag(101.0)
    assert safety.field_flag([]) is None
    assert safety.field_flag([0.49]) is None
    assert "0.5 T in the thruster gaps" in safety.field_flag([0.3, 0.5])
    assert "quench" in safety.field_flag([8.0], superconducting=True)
    assert "quench" not in safety.field_flag([0.75])
    lines = safety.run_flags({"peak_thruster_current_a": 50.0}, [0.2])
    assert len(lines) == 1 and lines[0].startswith("Gas produced:")


def test_safety_imports_only_physics():
    import ast
    from pathlib import Path

    tree = ast.parse(Path(safety.__file__).read_text(encoding="utf-8"))
    mods = {n.module for n in ast.walk(tree) if isinstance(n, ast.ImportFrom)} | {
        a.name for n in ast.walk(tree) if isinstance(n, ast.Import) for a in n.names
    }
    assert all(not m.startswith("sim") or m.startswith("sim.physics") for m in mods), mods
