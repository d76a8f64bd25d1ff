"""Tests for seatool.physics.surface_absorption: published coefficients, limits, independent numerics."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad, solve_ivp
from scipy.optimize import minimize_scalar

from seatool.physics import porous as por
from seatool.physics import surface_absorption

RHO0, C0 = 1.21, 343.0


Z0 = RHO0 * C0


def test_similarity_property():
    # exact invariance of the empirical laws: alpha(f, sigma, d) = alpha(l f, l sigma, d/l)
    f = np.array([250.0, 500.0, 1000.0])
    a1 = surface_absorption.absorption_coefficient(
        surface_absorption.rigid_backed_impedance(f, *por.delany_bazley(f, 1e4), 0.05)
    )
    f2 = 2 * f
    a2 = surface_absorption.absorption_coefficient(
        surface_absorption.rigid_backed_impedance(f2, *por.delany_bazley(f2, 2e4), 0.025)
    )
    np.testing.assert_allclose(a1, a2, rtol=1e-12)


@pytest.mark.regression
def test_rigid_backed_regression_table():
    # regression: computed by hand outside the code (sigma = 10 kPa s/m^2, d = 50 mm), not published
    f = np.array([250.0, 500.0, 1000.0, 2000.0, 4000.0])
    a_db = surface_absorption.absorption_coefficient(
        surface_absorption.rigid_backed_impedance(f, *por.delany_bazley(f, 1e4), 0.05)
    )
    a_mi = surface_absorption.absorption_coefficient(
        surface_absorption.rigid_backed_impedance(f, *por.miki(f, 1e4), 0.05)
    )
    np.testing.assert_allclose(a_db, [0.172, 0.496, 0.885, 0.986, 0.973], atol=1.5e-3)
    np.testing.assert_allclose(a_mi, [0.192, 0.485, 0.883, 0.982, 0.971], atol=1.5e-3)


def _surface_impedance_by_ode(f, zc, kc, d):
    """Independent: integrate p'' + kc^2 p = 0 from the rigid wall (p'=0) to the surface."""
    w = 2 * math.pi * f
    rho = zc * kc / w  # equivalent density of the fluid layer

    def rhs(_x, y):
        return [y[1], -(kc**2) * y[0]]

    sol = solve_ivp(rhs, (d, 0.0), [1.0 + 0j, 0.0 + 0j], rtol=1e-11, atol=1e-13)
    p, dp = sol.y[0, -1], sol.y[1, -1]
    v = -dp / (1j * w * rho)  # Euler: j omega rho v = -dp/dx, v along +x (into the layer)
    return p / v


@pytest.mark.parametrize("f", [300.0, 1000.0, 3000.0])
def test_rigid_backed_closed_form_vs_ode(f):
    zc, kc = por.delany_bazley(f, 1.5e4, rho0=RHO0, c0=C0)
    d = 0.04
    zs = surface_absorption.rigid_backed_impedance(f, zc, kc, d, c0=C0)
    zs_ode = _surface_impedance_by_ode(f, complex(zc), complex(kc), d)
    np.testing.assert_allclose(zs, zs_ode, rtol=1e-7)
    # Allard & Atalla (2009) ch. 3: Z_s = -j Z_c cot(k_c d)
    np.testing.assert_allclose(zs, -1j * zc / np.tan(kc * d), rtol=1e-12)
    a = surface_absorption.absorption_coefficient(zs, rho0=RHO0, c0=C0)
    a_ode = 1 - abs((zs_ode - Z0) / (zs_ode + Z0)) ** 2
    np.testing.assert_allclose(a, a_ode, rtol=1e-6)


def test_extended_reaction_tends_to_local_for_dense_layer():
    # Snell refraction: for |k_c| >> k0 the wave inside travels normally -> local reaction
    f = 1000.0
    k0 = 2 * math.pi * f / C0
    kc = 40 * k0 * (1 - 0.3j)
    zc = 20 * Z0 * (1 - 0.5j)
    th = np.array([0.3, 0.8, 1.3])
    z_loc = surface_absorption.rigid_backed_impedance(f, zc, kc, 0.03, angle=th, reaction="local")
    z_ext = surface_absorption.rigid_backed_impedance(
        f, zc, kc, 0.03, angle=th, reaction="extended"
    )
    np.testing.assert_allclose(z_ext, z_loc, rtol=1e-3)


def test_paris_quadrature_matches_closed_form_local():
    # London (1950) / Morse & Bolt (1944) closed form vs Paris integral by scipy.integrate.quad
    for zeta in (1.0, 2.0 - 1.0j, 0.5 + 3.0j, 4.0 + 0.2j):
        zs = zeta * Z0
        closed = surface_absorption.statistical_absorption_local(zs, rho0=RHO0, c0=C0)
        num = quad(
            lambda t, zs=zs: (
                surface_absorption.absorption_coefficient(zs, angle=t, rho0=RHO0, c0=C0) * math.sin(2 * t)
            ),
            0,
            math.pi / 2,
        )[0]
        np.testing.assert_allclose(closed, num, rtol=1e-9)
        np.testing.assert_allclose(
            surface_absorption.paris_integral(
                lambda t, zs=zs: surface_absorption.absorption_coefficient(zs, angle=t, rho0=RHO0, c0=C0)
            ),
            num,
            rtol=1e-8,
        )
    # analytic value at zeta = 1 from the closed form: 8 (3/2 - 2 ln 2) = 0.9096
    np.testing.assert_allclose(
        surface_absorption.statistical_absorption_local(Z0, rho0=RHO0, c0=C0), 8 * (1.5 - 2 * math.log(2)), rtol=1e-12
    )


def test_paris_maximum_0951():
    # from memory (Paris 1928; Kuttruff 2009, Room Acoustics, 5th ed., ch. 2): max over real zeta of the locally reacting diffuse
    # absorption is 0.951 near zeta = 1.6. Independent method: numerical optimisation of the
    # quadrature (not the closed form).
    def neg(r):
        return -float(
            quad(
                lambda t: (
                    surface_absorption.absorption_coefficient(r * Z0, angle=t) * math.sin(2 * t)
                ),
                0,
                math.pi / 2,
            )[0]
        )

    res = minimize_scalar(neg, bounds=(0.5, 5.0), method="bounded", options={"xatol": 1e-8})
    assert abs(-res.fun - 0.951) < 6e-4
    assert 1.5 < res.x < 1.65
    # and over complex zeta: the optimum is real (adding reactance only lowers it)
    assert surface_absorption.statistical_absorption_local((res.x + 0.3j) * Z0) < -res.fun


def test_diffuse_absorption_local_vs_extended_and_bounds():
    f = np.array([250.0, 1000.0, 4000.0])
    zc, kc = por.delany_bazley(f, 1e4)
    a_loc = surface_absorption.diffuse_absorption(f, zc, kc, 0.05, reaction="local")
    a_ext = surface_absorption.diffuse_absorption(f, zc, kc, 0.05, reaction="extended")
    zs = surface_absorption.rigid_backed_impedance(f, zc, kc, 0.05)
    np.testing.assert_allclose(
        a_loc, surface_absorption.statistical_absorption_local(zs), rtol=1e-6
    )
    assert a_loc.shape == a_ext.shape == f.shape
    assert np.all((a_ext > 0) & (a_ext < 1))
    # a light fibrous layer is not locally reacting: the two differ noticeably somewhere
    assert np.max(np.abs(a_ext - a_loc)) > 0.01
