"""Energy-to-level conversion and the diffuse-room check."""

from __future__ import annotations

import numpy as np
import pytest

import seatool
from seatool import levels


def test_iso1683_reference_values():
    # ISO 1683:2015 Table 1 (from memory): 20 uPa, 1 nm/s, 1 um/s^2, 1 pW.
    assert levels.REFERENCE["sound_pressure"] == 20e-6
    assert levels.REFERENCE["velocity"] == 1e-9
    assert levels.REFERENCE["acceleration"] == 1e-6
    assert levels.REFERENCE["power"] == 1e-12


def test_velocity_reference_is_a_parameter():
    # Older building-acoustics reference 5e-8 m/s shifts L_v by 20 lg 50 = 33.98 dB
    # (ISO 1683 lists 1 nm/s; arithmetic).
    v_sq = np.array([1e-6])
    d = levels.velocity_level(v_sq) - levels.velocity_level(v_sq, reference=5e-8)
    np.testing.assert_allclose(d, 20 * np.log10(50), rtol=1e-12)


def test_level_sum_of_equal_levels():
    # Two equal incoherent levels add to +3.01 dB (10 lg 2; common practice).
    assert levels.level_sum([80.0, 80.0]) == pytest.approx(80 + 10 * np.log10(2), abs=1e-12)


ROOM = """
title = "diffuse room"
[bands]
lowest = 250
highest = 4000
[subsystems.room]
kind = "cavity"
volume = {V}
modal_density = 100.0
damping = {{ band_hz = [250, 315, 400, 500, 630, 800, 1000, 1250, 1600, 2000, 2500, 3150, 4000], values = {eta} }}
[excitations.loudspeaker]
subsystem = "room"
sound_power_level = {LW}
"""


def test_diffuse_room_level_from_sound_power_and_sabine_absorption():
    # Reverberant field of a room of absorption area A: <p^2> = 4 rho c W / A, i.e.
    # Lp = Lw + 10 lg(4/A) + 10 lg(rho c W0 / p0^2) (Kuttruff, Room Acoustics, 5th ed. 2009,
    # sec. 5.x, eq. for the reverberant energy density w = 4P/(cA); from memory), with the
    # cavity loss factor from Sabine absorption eta = c A / (8 pi f V) (Sabine; ISO 3382-2).
    V, A, LW = 120.0, 25.0, 95.0
    rho, c = 1.204, 343.2
    model0 = seatool.loads(ROOM.format(V=V, eta=[0.01] * 13, LW=LW))
    f = model0.bands.centre
    eta = c * A / (8 * np.pi * f * V)
    model = seatool.loads(ROOM.format(V=V, eta=list(map(float, eta)), LW=LW))
    lp = seatool.run(model).table()["level_dB"].to_numpy()
    expected = LW + 10 * np.log10(4 / A) + 10 * np.log10(rho * c * 1e-12 / (20e-6) ** 2)
    np.testing.assert_allclose(lp, expected, atol=1e-9)


@pytest.mark.regression
def test_cavity_level_regression_value():
    # computed by hand outside the code (not published): E = 1e-6 J in V = 3 m^3 (rho0 c0 = 1.21 x 343) -> 80.74 dB.
    p_sq = levels.mean_square_pressure(1e-6, 3.0, 1.21, 343.0)
    assert float(levels.sound_pressure_level(p_sq)) == pytest.approx(80.74, abs=0.005)


@pytest.mark.consistency
def test_structure_velocity_and_acceleration_levels():
    # Consistency: restates the conversions; the reference values 1 nm/s and 1 um/s^2 are
    # those of ISO 1683:2015 (from memory).
    # <v^2> = E/M; <a^2> = w^2 <v^2> (common practice), ISO 1683 references.
    e, mass, f = 2e-5, 4.0, 1000.0
    v_sq = e / mass
    assert float(levels.velocity_level(levels.mean_square_velocity(e, mass))) == pytest.approx(
        10 * np.log10(v_sq / 1e-18), abs=1e-12
    )
    w = 2 * np.pi * f
    assert float(levels.acceleration_level(v_sq, w)) == pytest.approx(
        10 * np.log10(w**2 * v_sq / 1e-12), abs=1e-12
    )
