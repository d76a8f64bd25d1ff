"""Tests for seatool.physics.porous: published coefficients, limits, independent numerics."""

from __future__ import annotations

import math
import warnings

import numpy as np
import pytest
from scipy.special import jv

from seatool.physics import air, surface_absorption
from seatool.physics import porous as por

RHO0, C0 = 1.21, 343.0


Z0 = RHO0 * C0


@pytest.mark.parametrize("sigma", [5e3, 2e4, 6e4])
def test_delany_bazley_published_coefficients(sigma):
    # Delany & Bazley (1970), Applied Acoustics 3, 105-116 (as quoted in
    # secondary sources; the paper was not re-read):
    # Z = rho0 c0 (1 + 0.0571 X^-0.754 - j 0.087 X^-0.732),
    # k = (omega/c0)(1 + 0.0978 X^-0.700 - j 0.189 X^-0.595), X = rho0 f/sigma
    x = np.array([0.02, 0.1, 0.5, 0.9])
    f = x * sigma / RHO0
    z, k = por.delany_bazley(f, sigma, rho0=RHO0, c0=C0)
    z_ref = Z0 * (1 + 0.0571 * x**-0.754 - 1j * 0.087 * x**-0.732)
    k_ref = 2 * np.pi * f / C0 * (1 + 0.0978 * x**-0.700 - 1j * 0.189 * x**-0.595)
    np.testing.assert_allclose(z, z_ref, rtol=1e-12)
    np.testing.assert_allclose(k, k_ref, rtol=1e-12)
    # exp(+j omega t): exp(-j k x) must decay (Im k < 0) and the layer is passive (Re Z > 0);
    # the reactance of a porous medium is negative (mass-like density lags)
    assert np.all(k.imag < 0)
    assert np.all(z.real > Z0)
    assert np.all(z.imag < 0)


def test_delany_bazley_close_to_1970_form():
    # Delany & Bazley (1970) as quoted in secondary sources: the paper's form with (10^3 f/sigma) and coefficients
    # 9.08/0.75, 11.9/0.73, 10.8/0.70, 10.3/0.59 "gives very close results": within 3 %.
    sigma = 1e4
    f = np.array([150.0, 400.0, 1000.0, 3000.0, 7000.0])
    z, k = por.delany_bazley(f, sigma)
    ff = 1e3 * f / sigma
    z70 = Z0 * (1 + 9.08 * ff**-0.75 - 1j * 11.9 * ff**-0.73)
    k70 = 2 * np.pi * f / C0 * (1 + 10.8 * ff**-0.70 - 1j * 10.3 * ff**-0.59)
    assert np.all(np.abs(z / z70 - 1) < 0.03)
    assert np.all(np.abs(k / k70 - 1) < 0.03)


@pytest.mark.parametrize("sigma", [8e3, 3e4])
def test_miki_published_coefficients(sigma):
    # Miki (1990), J. Acoust. Soc. Jpn (E) 11, 19-24, published with F = 10^3 f/sigma:
    # Z = rho0 c0 (1 + 5.50 F^-0.632 - j 8.43 F^-0.632),
    # k = (omega/c0)(1 + 7.81 F^-0.618 - j 11.41 F^-0.618)
    # (Miki 1990, J. Acoust. Soc. Jpn (E) 11(1), 19-24; coefficients as quoted in
    # secondary sources); checks our conversion to f/sigma.
    f = np.array([0.02, 0.2, 0.8]) * sigma / RHO0
    z, k = por.miki(f, sigma, rho0=RHO0, c0=C0)
    ff = 1e3 * f / sigma
    z_ref = Z0 * (1 + 5.50 * ff**-0.632 - 1j * 8.43 * ff**-0.632)
    k_ref = 2 * np.pi * f / C0 * (1 + 7.81 * ff**-0.618 - 1j * 11.41 * ff**-0.618)
    np.testing.assert_allclose(z, z_ref, rtol=2e-3)
    np.testing.assert_allclose(k, k_ref, rtol=2e-3)
    assert np.all(k.imag < 0) and np.all(z.real > 0)


def test_validity_warning():
    # Delany & Bazley (1970): fitted range 0.01 < rho0 f/sigma < 1
    assert issubclass(por.ValidityWarning, UserWarning)
    with pytest.warns(por.ValidityWarning, match="outside"):
        por.delany_bazley(50.0, 2e4)  # X = 0.003
    with pytest.warns(por.ValidityWarning, match="outside"):
        por.miki(20000.0, 5e3)  # X = 4.8
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        por.delany_bazley([200.0, 2000.0], 2e4)  # X = 0.012 .. 0.12: no warning


def test_miki_removes_negative_resistance():
    # Miki (1990, J. Acoust. Soc. Jpn (E) 11(1), 19-24) motivation: Delany-Bazley can give Re(Z_s) < 0 for a
    # thin layer at low X; Miki's model stays positive-real.
    f, sigma, d = 125.0, 2e4, 0.025
    with pytest.warns(por.ValidityWarning):
        zs_db = surface_absorption.rigid_backed_impedance(f, *por.delany_bazley(f, sigma), d)
    with pytest.warns(por.ValidityWarning):
        zs_mi = surface_absorption.rigid_backed_impedance(f, *por.miki(f, sigma), d)
    assert zs_db.real < 0 < zs_mi.real


PHI, ALPHA_INF, SIGMA, LAM, LAM_T = 0.97, 1.05, 2e4, 80e-6, 160e-6


def test_jca_density_limits():
    # Johnson et al. (1987): omega -> 0, rho_eq -> sigma/(j omega) (Darcy);
    # omega -> inf, rho_eq -> alpha_inf rho0 / phi
    f_lo = np.array([1e-3, 1e-2])
    rho_lo = por.jca_effective_density(f_lo, PHI, ALPHA_INF, SIGMA, LAM, rho0=RHO0)
    np.testing.assert_allclose(rho_lo * 1j * 2 * np.pi * f_lo / SIGMA, 1.0, rtol=1e-4)
    rho_hi = por.jca_effective_density(1e9, PHI, ALPHA_INF, SIGMA, LAM, rho0=RHO0)
    np.testing.assert_allclose(rho_hi, ALPHA_INF * RHO0 / PHI, rtol=2e-3)
    assert np.all(rho_lo.imag < 0)  # passive, exp(+j omega t)


def test_jca_bulk_modulus_limits():
    # Champoux & Allard (1991): K -> P0 (isothermal) at low f, gamma P0 (adiabatic) at high f
    k_lo = por.jca_bulk_modulus(1e-3, PHI, LAM_T) * PHI
    k_hi = por.jca_bulk_modulus(1e9, PHI, LAM_T) * PHI
    np.testing.assert_allclose(k_lo, 101325.0, rtol=1e-5)
    np.testing.assert_allclose(k_hi, 1.4 * 101325.0, rtol=2e-3)
    k_mid = por.jca_bulk_modulus(np.logspace(1, 5, 9), PHI, LAM_T)
    assert np.all(k_mid.imag > 0)  # passive: Im(1/K) < 0 for exp(+j omega t)


def test_jca_vs_exact_circular_pores():
    # Independent exact solution for straight circular pores of radius a (Zwikker & Kosten
    # 1949; Stinson 1991), with sigma = 8 eta/(phi a^2), alpha_inf = 1, Lambda = Lambda' = a.
    # JCA matches both limits exactly and interpolates between them; Johnson et al. (1987)
    # report errors of a few per cent for this geometry (from memory) -> tolerances 6 % and 2 %.
    a, phi = 100e-6, 0.9
    eta, pr = air.AIR_VISCOSITY, air.AIR_PRANDTL
    sigma = 8 * eta / (phi * a**2)
    f = np.logspace(0, 6, 61)
    w = 2 * np.pi * f

    def bessel_ratio(s):
        z = s * np.sqrt(-1j)
        return 2 * jv(1, z) / (z * jv(0, z))

    s = a * np.sqrt(w * RHO0 / eta)
    rho_exact = RHO0 / (1 - bessel_ratio(s)) / phi
    k_exact = 1.4 * 101325.0 / (1 + 0.4 * bessel_ratio(s * np.sqrt(pr))) / phi
    rho = por.jca_effective_density(f, phi, 1.0, sigma, a)
    kk = por.jca_bulk_modulus(f, phi, a)
    assert np.max(np.abs(rho / rho_exact - 1)) < 0.06
    assert np.max(np.abs(kk / k_exact - 1)) < 0.02
    # and the limits agree to high accuracy at the ends of the range
    np.testing.assert_allclose(rho[0], rho_exact[0], rtol=1e-3)
    np.testing.assert_allclose(kk[0], k_exact[0], rtol=1e-3)


def test_jca_wave_properties_and_high_frequency_speed():
    f = np.array([100.0, 1000.0, 1e11])  # boundary-layer corrections fall only as f^-1/2
    zc, kc = por.johnson_champoux_allard(f, PHI, ALPHA_INF, SIGMA, LAM, LAM_T, rho0=RHO0)
    assert np.all(zc.real > 0) and np.all(kc.imag < 0)
    # high-frequency limit: c = c_adiabatic/sqrt(alpha_inf), c_ad = sqrt(gamma P0/rho0)
    c_ad = math.sqrt(1.4 * 101325.0 / RHO0)
    np.testing.assert_allclose(
        2 * np.pi * f[-1] / kc[-1].real, c_ad / math.sqrt(ALPHA_INF), rtol=2e-3
    )


def test_limp_frame_limits():
    # Panneton (2007) limp model: heavy frame -> rigid-frame density; locked fluid -> rho_t
    rho_eq = por.jca_effective_density(np.array([50.0, 500.0]), PHI, ALPHA_INF, SIGMA, LAM, rho0=RHO0)
    np.testing.assert_allclose(por.limp_frame_density(rho_eq, 1e9, PHI, rho0=RHO0), rho_eq, rtol=1e-6)
    np.testing.assert_allclose(
        por.limp_frame_density(1e12 * (1 - 1j), 30.0, PHI, rho0=RHO0), 30.0 + PHI * RHO0, rtol=1e-9
    )
    with pytest.raises(ValueError, match="bulk_density"):
        por.johnson_champoux_allard(100.0, PHI, ALPHA_INF, SIGMA, LAM, LAM_T, frame="limp", rho0=RHO0)


def test_invalid_inputs():
    with pytest.raises(ValueError, match="flow_resistivity"):
        por.delany_bazley(1000.0, -1.0)
    with pytest.raises(ValueError, match="porosity"):
        por.jca_effective_density(100.0, 1.2, 1.0, 1e4, 1e-4)
    with pytest.raises(ValueError, match="tortuosity"):
        por.jca_effective_density(100.0, 0.9, 0.5, 1e4, 1e-4)
    with pytest.raises(ValueError, match="thickness"):
        surface_absorption.rigid_backed_impedance(100.0, Z0, 1.0, 0.0)
