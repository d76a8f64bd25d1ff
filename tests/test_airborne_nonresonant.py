"""A diffuse field on a panel face: resonant input and non-resonant (mass-law) transmission.

Checks:
1. the level difference across a single panel, from the solved model, converges to the
   field-incidence mass law below coincidence, R_field = R_0 - 5 dB with
   R_0 = 20 lg(omega m'' / (2 rho c)) (Vigran 2008, Building Acoustics, sec. 6.2, field
   incidence about 5 dB below normal incidence; Fahy & Gardonio 2007, ch. 5; from memory
   for the section numbers); without the non-resonant part the model is 20-26 dB above it;
2. both parts appear as separate paths and sources; the switch, the receiver choice and
   the refusal of a path declared twice;
3. the rail cab's rolling-noise share at 500 Hz (regression, against the about 42 % the
   issue estimates).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from seatool import modelfile
from seatool.analysis.paths import contributions, paths
from seatool.errors import InputError
from seatool.physics import coupling, mobility, transmission
from seatool.physics.air import AIR_DENSITY, AIR_SOUND_SPEED
from seatool.results import run

LAB = """
title = "single panel between a diffuse field and a receiving room (test)"
[bands]
spacing = "third-octave"
lowest = 100
highest = 5000
[subsystems.panel]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 3.0
ly = 4.0
damping = 0.01
[subsystems.room]
kind = "cavity"
dimensions = [5.0, 4.0, 3.0]
damping = 0.01
[subsystems.outside]
kind = "exterior"
[connections.panel_room]
kind = "radiation"
between = ["panel", "room"]
[connections.panel_out]
kind = "radiation"
between = ["panel", "outside"]
[excitations.field]
subsystem = "panel"
diffuse_sound_pressure_level = 100
"""

STEEL_DENSITY = 7850.0  # kg/m^3, the built-in steel (common practice)


def _level_difference(text: str) -> tuple[np.ndarray, np.ndarray]:
    """R = 10 lg(W_incident / W_into_room) per band from the solved model."""
    m = modelfile.loads(text)
    r = run(m)
    w_room = r.solution.dissipated_power[m.index()["room"]]
    p2 = (2e-5) ** 2 * 10.0**10.0
    w_inc = p2 * 12.0 / (4.0 * AIR_DENSITY * AIR_SOUND_SPEED)
    return m.bands.centre, 10.0 * np.log10(w_inc / w_room)


def test_single_panel_converges_to_field_incidence_mass_law():
    f, r_model = _level_difference(LAB)
    m2 = STEEL_DENSITY * 0.002
    r0 = 20.0 * np.log10(2 * math.pi * f * m2 / (2 * AIR_DENSITY * AIR_SOUND_SPEED))
    r_field = r0 - 5.0  # Vigran 2008 (field incidence), from memory
    # 2 mm steel: f_c about 6 kHz; bands 200 Hz - 2.5 kHz are below f_c / 2 and large
    # enough for the panel (k sqrt(S) > 12). Tolerance 1.5 dB (the model gives -0.9 .. +0.8).
    sel = (f > 180) & (f < 2800)
    np.testing.assert_array_less(np.abs(r_model[sel] - r_field[sel]), 1.5)


def test_without_the_nonresonant_part_the_panel_is_far_above_the_mass_law():
    f, r_on = _level_difference(LAB)
    _, r_off = _level_difference(LAB + "nonresonant = false\n")
    sel = (f > 180) & (f < 2800)
    # the resonant path alone: 22-26 dB above (the missing path)
    assert np.all(r_off[sel] - r_on[sel] > 15.0)


def test_transmitted_power_is_the_cavity_coupling_power_at_the_same_pressure():
    # Consistency (not an outside check): the power a diffuse field of <p^2> sends through
    # S tau equals omega eta_NR E of a room at that <p^2> (Crocker & Price 1969 coupling).
    f, s, v, p2 = np.array([200.0, 800.0]), 12.0, 60.0, 4.0
    tau = transmission.transmission_nonresonant(f, 15.7, 3.0, 4.0, 6000.0)
    eta = coupling.clf_nonresonant(f, s, tau, v, c0=AIR_SOUND_SPEED)
    energy = p2 * v / (AIR_DENSITY * AIR_SOUND_SPEED**2)
    w = mobility.diffuse_field_transmitted_power(p2, s, tau, AIR_DENSITY, AIR_SOUND_SPEED)
    np.testing.assert_allclose(w, 2 * np.pi * f * eta * energy, rtol=1e-12)


def test_both_parts_are_separate_paths_and_sources():
    m = modelfile.loads(LAB)
    names = {e.name: e for e in m.excitations}
    assert set(names) == {"field", "field (non-resonant)"}
    assert names["field (non-resonant)"].subsystem == "room"
    assert names["field (non-resonant)"].through == "panel"
    t = paths(m, "room")
    band = t[t.band_hz == 500]
    got = {(s, p) for s, p in zip(band.source, band.path, strict=True)}
    assert ("field", "panel > room") in got
    assert ("field (non-resonant)", "panel > room") in got
    assert band.share.sum() == pytest.approx(1.0, abs=1e-9)


def test_receiver_must_be_named_when_the_panel_faces_two_cavities():
    two = LAB.replace(
        '[subsystems.outside]\nkind = "exterior"',
        '[subsystems.outside]\nkind = "cavity"\ndimensions = [4.0, 4.0, 3.0]\ndamping = 0.01',
    )
    with pytest.raises(InputError, match="nonresonant_into"):
        modelfile.loads(two)
    m = modelfile.loads(two + 'nonresonant_into = "room"\n')
    assert [e.subsystem for e in m.excitations] == ["panel", "room"]
    with pytest.raises(InputError, match="not on a face"):
        modelfile.loads(
            two.replace(
                '[connections.panel_out]\nkind = "radiation"\nbetween = ["panel", "outside"]', ""
            )
            + 'nonresonant_into = "outside"\n'
        )


def test_declared_twice_is_refused():
    twice = LAB.replace(
        '[subsystems.outside]\nkind = "exterior"',
        '[subsystems.outside]\nkind = "exterior"\n[subsystems.source_room]\nkind = "cavity"\n'
        "dimensions = [4.0, 4.0, 3.0]\ndamping = 0.01",
    ).replace(
        "[excitations.field]",
        '[connections.mass_law]\nkind = "nonresonant"\nbetween = ["source_room", "room"]\n'
        'through = "panel"\n[excitations.field]',
    )
    with pytest.raises(InputError, match="declared twice") as err:
        modelfile.loads(twice)
    assert "excitations.field.nonresonant" in str(err.value)
    modelfile.loads(twice + "nonresonant = false\n")  # switched off: accepted


@pytest.mark.regression
def test_rail_cab_rolling_noise_share_at_500_hz():
    # Before: 3.2 % (resonant input only). The issue estimates about 42 %; computed here:
    # 1.6 % resonant + 41.1 % non-resonant = 42.7 %. Tolerance: 35-50 %.
    m = modelfile.load("models/rail_cab.toml")
    c = contributions(m, "cab_air")
    c500 = c[c.band_hz == 500]
    share = c500[c500.source.str.startswith("rolling_noise")].share.sum()
    assert 0.35 < share < 0.50
