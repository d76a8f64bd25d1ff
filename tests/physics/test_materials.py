"""Tests of the built-in material and fluid tables (seatool.materials)."""

from __future__ import annotations

import dataclasses

import pytest

from seatool.materials import Fluid, Material, air_at, load_fluids, load_materials
from seatool.physics import elastic

REQUIRED_MATERIALS = {
    "steel",
    "aluminium",
    "glass",
    "plywood",
    "gypsum_board",
    "concrete",
    "pmma",
    "polycarbonate",
    "cfrp_quasi_isotropic",
}


def test_tables_contain_required_entries_with_sources() -> None:
    mats = load_materials()
    fluids = load_fluids()
    assert REQUIRED_MATERIALS <= set(mats)
    assert {"air", "water"} <= set(fluids)
    items: list[Material | Fluid] = [*mats.values(), *fluids.values()]
    for item in items:
        assert item.source.strip(), f"{item.name} has no source"
        low = item.source.lower()
        assert any(w in low for w in ("from memory", "common practice", "table", "iso", "ideal"))


def test_entries_are_frozen_dataclasses() -> None:
    steel = load_materials()["steel"]
    with pytest.raises(dataclasses.FrozenInstanceError):
        steel.density = 1.0  # type: ignore[misc]


def test_replace_overrides_and_marks_source() -> None:
    steel = load_materials()["steel"]
    damped = steel.replace(loss_factor=0.02)
    assert damped.loss_factor == 0.02
    assert damped.density == steel.density
    assert "modified" in damped.source
    assert steel.loss_factor != 0.02  # original untouched
    with pytest.raises(ValueError, match="poisson_ratio"):
        steel.replace(poisson_ratio=0.7)


@pytest.mark.parametrize(
    ("kwargs", "name"),
    [
        ({"density": -1.0}, "density"),
        ({"youngs_modulus": 0.0}, "youngs_modulus"),
        ({"loss_factor": -0.1}, "loss_factor"),
    ],
)
def test_invalid_material_raises(kwargs: dict[str, float], name: str) -> None:
    base = {"density": 1.0, "youngs_modulus": 1.0, "poisson_ratio": 0.3, "loss_factor": 0.0}
    base.update(kwargs)
    with pytest.raises(ValueError, match=name):
        Material("x", **base)  # type: ignore[arg-type]


def test_invalid_fluid_raises() -> None:
    with pytest.raises(ValueError, match="sound_speed"):
        Fluid(name="x", density=1.0, sound_speed=-1.0)


def test_shear_modulus_property() -> None:
    alu = load_materials()["aluminium"]
    assert alu.shear_modulus == pytest.approx(
        float(elastic.shear_modulus(alu.youngs_modulus, alu.poisson_ratio))
    )


def test_air_row_consistent_with_ideal_gas_function() -> None:
    air_table = load_fluids()["air"]
    air = air_at(20.0, 101325.0)
    assert air.density == pytest.approx(air_table.density, rel=1e-3)
    assert air.sound_speed == pytest.approx(air_table.sound_speed, rel=1e-3)
    assert air.characteristic_impedance == pytest.approx(air.density * air.sound_speed)


def test_air_at_us_standard_atmosphere() -> None:
    # U.S. Standard Atmosphere 1976 sea level (15 C, 101325 Pa): 1.2250 kg/m^3, 340.294 m/s
    # (from memory)
    air = air_at(15.0, 101325.0)
    assert air.density == pytest.approx(1.2250, rel=3e-4)
    assert air.sound_speed == pytest.approx(340.294, rel=2e-4)


def test_water_values_plausible() -> None:
    # Kinsler et al. (2000) Fundamentals of Acoustics Table A10: fresh water 20 C,
    # 998 kg/m^3 and 1481 m/s (from memory)
    water = load_fluids()["water"]
    assert water.density == pytest.approx(998.0, rel=2e-3)
    assert water.sound_speed == pytest.approx(1481.0, rel=2e-3)


@pytest.mark.parametrize(
    ("material", "fch"),
    # Long (2006), Architectural Acoustics, Table 9.1 (f_c h in air, 20 C), +-10 %
    [("steel", 12.4), ("aluminium", 12.0), ("glass", 12.7), ("gypsum_board", 38.0)],
)
def test_table_materials_reproduce_long_coincidence_products(material: str, fch: float) -> None:
    m = load_materials()[material]
    cl = elastic.plate_longitudinal_speed(m.youngs_modulus, m.density, m.poisson_ratio)
    assert 343.0**2 * 12**0.5 / (2 * 3.141592653589793 * cl) == pytest.approx(fch, rel=0.10)
