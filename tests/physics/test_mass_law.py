"""Tests for seatool.physics.mass_law (sources beside each check)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import integrate

from seatool.physics import mass_law


def db(tau):
    return -10.0 * np.log10(tau)


FM = np.array([2000.0, 5000.0, 20000.0, 100000.0])  # f m'' [Hz kg/m^2]


def test_normal_incidence_mass_law_rule():
    # R_0 ~ 20 lg(f m'') - 42.4 dB for rho0 c0 = 415 (Vigran 2008 ch. 6; Fahy 1985 ch. 4;
    # 20 lg(pi/415) = -42.42), valid for omega m'' >> 2 rho0 c0.
    r0 = db(mass_law.transmission_mass_law_normal(FM, 1.0))
    np.testing.assert_allclose(r0, 20 * np.log10(FM) - 42.4, atol=0.1)


def test_field_incidence_mass_law_vigran_6_102():
    # Vigran (2008) eq. 6.102: R_field ~ 20 lg(f m'') - 47 dB, about 5 dB below normal
    # incidence; integral of the infinite-panel tau up to ~78 deg. Tolerance 1 dB.
    r_field = db(mass_law.transmission_mass_law_field(FM, 1.0))
    np.testing.assert_allclose(r_field, 20 * np.log10(FM) - 47.0, atol=1.0)
    r0 = db(mass_law.transmission_mass_law_normal(FM, 1.0))
    np.testing.assert_allclose(r0 - r_field, 5.0, atol=0.5)


def test_field_incidence_closed_form_equals_numerical_paris_integral():
    # Independent numerical method: scipy quad of Paris' formula with the oblique mass law.
    for f, m in [(125.0, 5.0), (500.0, 10.0), (2000.0, 30.0)]:
        for lim_deg in (78.0, 90.0, 60.0):
            lim = math.radians(lim_deg)
            num, _ = integrate.quad(
                lambda th, f=f, m=m: float(mass_law.transmission_mass_law_oblique(f, m, th))
                * math.sin(th) * math.cos(th), 0.0, lim, epsrel=1e-11)
            num /= 0.5 * math.sin(lim) ** 2
            got = mass_law.transmission_mass_law_field(f, m, theta_limit=lim)
            assert float(got) == pytest.approx(num, rel=1e-8)


def test_random_incidence_london_formula():
    # London (1950) / Beranek: R_random ~ R_0 - 10 lg(0.23 R_0) for large R_0 (from memory).
    fm = np.array([5000.0, 20000.0, 100000.0])
    r0 = db(mass_law.transmission_mass_law_normal(fm, 1.0))
    r_rand = db(mass_law.transmission_mass_law_random(fm, 1.0))
    np.testing.assert_allclose(r_rand, r0 - 10 * np.log10(0.23 * r0), atol=0.1)
