"""Tests for seatool.physics.transmission (sources beside each check)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from seatool.physics import mass_law
from seatool.physics import transmission as tr

RHO0, C0 = 1.21, 343.0  # rho0 c0 = 415 Pa s/m, project reference values


def db(tau):
    return -10.0 * np.log10(tau)


def test_limp_limit_of_infinite_panel():
    # With f_c -> infinity the elastic panel is the limp mass law (Fahy 1985 ch. 4).
    th = np.linspace(0.0, 1.5, 7)
    np.testing.assert_allclose(tr.transmission_infinite_panel(800.0, th, 12.0, 1e12, 0.01),
                               mass_law.transmission_mass_law_oblique(800.0, 12.0, th), rtol=1e-9)


def test_infinite_panel_total_transmission_at_coincidence_without_damping():
    # Coincidence angle sin^2 theta = f_c/f: Z_p = 0 and tau = 1 for eta = 0 (Cremer 1942).
    f, fc = 4000.0, 1000.0
    th = math.asin(math.sqrt(fc / f))
    assert float(tr.transmission_infinite_panel(f, th, 20.0, fc, 0.0)) == pytest.approx(1.0)


@pytest.mark.parametrize(("m", "fc", "ratio"), [(7.85, 11963.0, 4.0), (7.85, 11963.0, 8.0),
                                                (20.0, 600.0, 4.0), (20.0, 600.0, 8.0)])
def test_cremer_equals_random_incidence_integral_well_above_coincidence(m, fc, ratio):
    # Cremer (1942): asymptotic evaluation of the random-incidence integral of the infinite
    # panel tau (checked here by adaptive quadrature, an independent numerical method) for
    # f >> f_c and eta >> radiation damping (eta = 0.01). Tolerance 1.2 dB.
    f = ratio * fc
    num = tr.transmission_infinite_panel_diffuse(f, m, fc, 0.01)
    cremer = tr.transmission_cremer(f, m, fc, 0.01)
    assert float(db(num)) == pytest.approx(float(db(cremer)), abs=1.2)


@pytest.mark.consistency
def test_cremer_formula_dB_form():
    # Consistency: the dB form of the same formula. The independent check of Cremer's
    # result is tests/physics/test_tmm_transmission.py::test_cremer_above_coincidence
    # (the random-incidence angular integral of the infinite plate).
    # R = 20 lg(pi f m''/(rho0 c0)) + 10 lg(2 eta f/(pi f_c)) (Cremer 1942, Akust. Z. 7, 81-104).
    f, m, fc, eta = 16000.0, 7.85, 11963.0, 0.01
    expect = (20 * math.log10(math.pi * f * m / (RHO0 * C0))
              + 10 * math.log10(2 * eta * f / (math.pi * fc)))
    assert float(db(tr.transmission_cremer(f, m, fc, eta, rho0=RHO0, c0=C0))) == pytest.approx(expect, abs=1e-9)
    assert np.isnan(tr.transmission_cremer(500.0, m, fc, eta, rho0=RHO0, c0=C0))


def test_nonresonant_typical_wall_close_to_field_mass_law():
    # Vigran (2008) sec. 6.x: the field-incidence mass law (eq. 6.102, 20 lg(f m'') - 47)
    # describes forced transmission of walls of ordinary size (~10 m^2) below f_c.
    # Finite-panel EN ISO 12354-1 forced term for a 3.2 m x 3.2 m wall: within 1.5 dB.
    f = np.array([125.0, 250.0, 500.0, 1000.0])
    m = 20.0
    tau = tr.transmission_nonresonant(f, m, 3.2, 3.2, 5000.0)
    np.testing.assert_allclose(db(tau), 20 * np.log10(f * m) - 47.0, atol=1.5)


def test_nonresonant_size_effect():
    # Sewell (1970) size effect (from memory): below f_c a small panel radiates its forced
    # waves less efficiently than a large one, so it transmits less (higher R), for panels
    # still larger than about a sixth of a wavelength (k0 sqrt(S) = 2 here).
    small = tr.transmission_nonresonant(250.0, 10.0, 0.5, 0.4, 5000.0)
    large = tr.transmission_nonresonant(250.0, 10.0, 4.0, 3.0, 5000.0)
    assert float(small) < float(large)


def test_nonresonant_zero_above_coincidence_and_stiffness_factor():
    f = np.array([200.0, 1000.0, 2000.0, 4000.0])
    fc = 2000.0
    base = tr.transmission_nonresonant(f, 10.0, 1.5, 1.2, fc)
    stiff = tr.transmission_nonresonant(f, 10.0, 1.5, 1.2, fc, stiffness_factor=True)
    assert np.all(base[2:] == 0.0)
    assert np.all(stiff[2:] == 0.0)
    np.testing.assert_allclose(stiff[:2] / base[:2], 1.0 / (1.0 - (f[:2] / fc) ** 2) ** 2)


def test_sharp_regions():
    # Sharp (1978) as given by Bies & Hansen (from memory): below f_c/2 within 1 dB of the
    # field-incidence mass law of Vigran eq. 6.102; above f_c equal to Cremer's formula;
    # continuous at f_c/2 and f_c.
    m, fc, eta = 15.0, 2500.0, 0.02
    f_low = np.array([100.0, 400.0, 1000.0])
    np.testing.assert_allclose(tr.transmission_loss_sharp(f_low, m, fc, eta),
                               20 * np.log10(f_low * m) - 47.0, atol=1.0)
    f_high = np.array([3000.0, 10000.0])
    np.testing.assert_allclose(tr.transmission_loss_sharp(f_high, m, fc, eta),
                               db(tr.transmission_cremer(f_high, m, fc, eta)), atol=1e-9)
    for edge in (0.5 * fc, fc):
        lo = tr.transmission_loss_sharp(edge * (1 - 1e-9), m, fc, eta)
        hi = tr.transmission_loss_sharp(edge * (1 + 1e-9), m, fc, eta)
        assert float(lo) == pytest.approx(float(hi), abs=1e-6)


def test_mass_air_mass_frequency():
    # f_0 ~ 60 sqrt((m1 + m2)/(m1 m2 d)) Hz (Long 2006 sec. 9; common rule, adiabatic air).
    f0 = tr.mass_air_mass_frequency(10.0, 10.0, 0.1)
    assert float(f0) == pytest.approx(60.0 * math.sqrt(20.0 / (100.0 * 0.1)), rel=0.01)
    iso = tr.mass_air_mass_frequency(10.0, 10.0, 0.1, isothermal=True)
    assert float(f0 / iso) == pytest.approx(math.sqrt(1.4))


def test_conversions_and_validation():
    np.testing.assert_allclose(tr.transmission_from_loss(tr.loss_from_transmission([0.1, 1e-3])),
                               [0.1, 1e-3])
    assert float(tr.loss_from_transmission(0.01)) == pytest.approx(20.0)
    with pytest.raises(ValueError, match="m_area"):
        mass_law.transmission_mass_law_normal(100.0, -1.0)
    with pytest.raises(ValueError, match="theta"):
        mass_law.transmission_mass_law_oblique(100.0, 1.0, 2.0)
    with pytest.raises(ValueError, match="theta_limit"):
        mass_law.transmission_mass_law_field(100.0, 1.0, theta_limit=0.0)
    with pytest.raises(ValueError, match="eta"):
        tr.transmission_cremer(1e4, 1.0, 1e3, 0.0)
