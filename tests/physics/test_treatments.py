"""Tests for the built-in treatment library seatool.catalogue (data integrity, loader,
overrides, conversion to transfer-matrix layers)."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

from seatool import catalogue as trt
from seatool.physics import damping_layers, tmm


@pytest.fixture(scope="module")
def lib():
    return trt.load_treatments()


def test_library_contents_and_provenance(lib):
    kinds = {t.kind for t in lib.values()}
    assert kinds == {"porous", "heavy_layer", "viscoelastic", "buildup"}
    for name in (
        "glass_fibre_light",
        "mineral_wool_dense",
        "pu_foam_open_cell",
        "heavy_layer_2kg",
        "heavy_layer_5kg",
        "damping_sheet_free",
        "vem_core_constrained",
    ):
        assert name in lib
    # every built-in row is invented data and must say so
    assert all(t.source == "invented, typical" for t in lib.values())


def test_frozen_and_override(lib):
    t = lib["glass_fibre_light"]
    with pytest.raises(dataclasses.FrozenInstanceError):
        t.thickness = 0.05  # type: ignore[misc]
    t2 = t.replace(thickness=0.05, source="user")
    assert t2.thickness == 0.05 and t.thickness == 0.025
    t3 = dataclasses.replace(t, flow_resistivity=2e4)
    assert t3.flow_resistivity == 2e4
    with pytest.raises(ValueError, match="porosity"):
        t.replace(porosity=1.5)
    with pytest.raises(ValueError, match="thermal_length"):
        t.replace(thermal_length=1e-6)


def test_heavy_layer_masses(lib):
    assert math.isclose(lib["heavy_layer_2kg"].mass_per_area, 2.0, rel_tol=0.01)
    assert math.isclose(lib["heavy_layer_5kg"].mass_per_area, 5.0, rel_tol=0.01)


def test_porous_parameters_physical(lib):
    # JCA consistency (Allard & Atalla 2009): phi <= 1, alpha_inf >= 1, Lambda' >= Lambda
    for t in lib.values():
        if t.kind == "porous":
            assert 0 < t.porosity <= 1 and t.tortuosity >= 1
            assert t.thermal_length >= t.viscous_length


def test_modulus_tables(lib):
    sheet = lib["damping_sheet_free"].modulus
    core = lib["vem_core_constrained"].modulus
    assert sheet is not None and sheet.quantity == "young"
    assert core is not None and core.quantity == "shear"
    g = damping_layers.complex_modulus(np.array([10.0, 10000.0]), core)
    np.testing.assert_allclose(g.real, [2.0e5, 8.0e6])


def test_buildups_to_tmm_layers_and_mass(lib):
    layers = trt.buildup_layers("spring_mass_5kg", lib)
    assert isinstance(layers[0], tmm.PorousLayer) and isinstance(layers[1], tmm.LimpLayer)
    expected = lib["pu_foam_open_cell"].mass_per_area + lib["heavy_layer_5kg"].mass_per_area
    np.testing.assert_allclose(tmm.mass_per_area(layers), expected)
    single = trt.buildup_layers("glass_fibre_light", lib, model="miki")
    assert isinstance(single[0], tmm.PorousLayer) and single[0].model == "miki"
    with pytest.raises(KeyError, match="unknown treatment"):
        trt.buildup_layers("no_such_layer", lib)


def test_loader_rejects_bad_tables(tmp_path):
    header = (
        "name,kind,description,thickness_m,density_kg_m3,flow_resistivity_Pa_s_m2,porosity,"
        "tortuosity,viscous_length_m,thermal_length_m,poisson,modulus_kind,modulus_table,"
        "layers,source,notes\n"
    )
    p = tmp_path / "t.csv"
    p.write_text(header + "a,buildup,,,,,,,,,,,,missing_layer,user,\n")
    with pytest.raises(ValueError, match="missing_layer"):
        trt.load_treatments(p)
    p.write_text(header + "b,heavy_layer,,-0.001,1000,,,,,,,,,,user,\n")
    with pytest.raises(ValueError, match="thickness"):
        trt.load_treatments(p)


def test_library_absorber_sanity(lib):
    # common practice: a thin porous absorber absorbs well from about its quarter-wave
    # frequency upwards (c/(4 d) = 3.4 kHz for 25 mm) and little at low frequencies: diffuse
    # absorption > 0.7 at 4 kHz, < 0.2 at 125 Hz. Checks the invented data are typical.
    layers = trt.buildup_layers("absorber_blanket_25mm", lib)
    a = tmm.diffuse_absorption(np.array([125.0, 4000.0]), layers)
    assert a[0] < 0.2 and a[1] > 0.7


def test_damping_sheet_gives_typical_loss_factor(lib):
    # common practice (no published source confirmed): bitumen-type treatments on vehicle sheet metal give
    # composite loss factors of about 0.05-0.3
    s = lib["damping_sheet_free"]
    res = damping_layers.free_layer_damping(
        np.array([100.0, 1000.0]), 0.8e-3, 210e9, 7850.0, s.thickness, s.density, s.modulus
    )
    assert np.all((res.loss_factor > 0.02) & (res.loss_factor < 0.3))
    np.testing.assert_allclose(res.added_mass_per_area, s.mass_per_area)
