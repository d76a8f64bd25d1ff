"""Tests of seatool.physics.air against reference atmospheres and published air properties."""

from __future__ import annotations

import numpy as np
import pytest

from seatool import materials, modelfile
from seatool.physics import air


def test_air_properties_us_standard_atmosphere_sea_level() -> None:
    # U.S. Standard Atmosphere 1976, sea level: T = 15 C, p = 101325 Pa,
    # rho = 1.2250 kg/m^3, c = 340.294 m/s (from memory)
    assert air.air_density(15.0, 101325.0) == pytest.approx(1.2250, rel=3e-4)
    assert air.air_sound_speed(15.0) == pytest.approx(340.294, rel=2e-4)


def test_air_sound_speed_iso_9613_reference_and_linear_rule() -> None:
    # ISO 9613-1: c = 343.2 sqrt(T / 293.15 K) (from memory); textbook rule
    # c = 331.3 + 0.606 t (Kinsler et al. 2000, Fundamentals of Acoustics, 4th ed., from memory)
    t = np.array([-10.0, 0.0, 20.0, 35.0])
    c = air.air_sound_speed(t)
    np.testing.assert_allclose(c, 343.2 * np.sqrt((t + 273.15) / 293.15), rtol=3e-4)
    np.testing.assert_allclose(c, 331.3 + 0.606 * t, rtol=2e-3)


def test_air_density_scales_with_pressure() -> None:
    assert air.air_density(20.0, 2 * 101325.0) == pytest.approx(2 * air.air_density(20.0))


def test_default_air_density_against_standard_atmosphere() -> None:
    # U.S. Standard Atmosphere 1976, sea level: rho = 1.2250 kg/m^3 at 15 C, 101325 Pa
    # (from memory); the ideal-gas law at the same pressure scales it by 288.15 / 293.15 to
    # 1.2041 kg/m^3 at 20 C (CIPM-2007 formula for dry air, Picard et al. 2008: 1.2041;
    # from memory).
    assert air.AIR_DENSITY == pytest.approx(1.2250 * 288.15 / 293.15, abs=5e-4)


def test_default_air_sound_speed_against_cramer() -> None:
    # Cramer (1993), J. Acoust. Soc. Am. 93(5), 2510-2516: dry air at 0 C and 101.325 kPa,
    # c = 331.46 m/s (from memory); ideal-gas scaling sqrt(T / 273.15 K) to 20 C gives
    # 343.4 m/s. ISO 9613-1 reference 343.2 m/s at 293.15 K. Tolerance 0.1 %.
    assert air.AIR_SOUND_SPEED == pytest.approx(331.46 * np.sqrt(293.15 / 273.15), rel=1e-3)


def test_one_default_air_everywhere() -> None:
    # One definition (common practice): the model reader's default fluid and the built-in
    # fluid "air" are the physics defaults, and the ideal-gas functions agree at 20 C.
    assert modelfile.DEFAULT_FLUID == {
        "density": air.AIR_DENSITY,
        "sound_speed": air.AIR_SOUND_SPEED,
    }
    builtin = materials.load_fluids()["air"]
    assert (builtin.density, builtin.sound_speed) == (air.AIR_DENSITY, air.AIR_SOUND_SPEED)
    assert float(air.air_density(air.AIR_TEMPERATURE_C, air.AIR_PRESSURE)) == pytest.approx(
        air.AIR_DENSITY, abs=5e-4
    )
    assert float(air.air_sound_speed(air.AIR_TEMPERATURE_C)) == pytest.approx(
        air.AIR_SOUND_SPEED, abs=0.05
    )
