"""Tests for seatool.physics.tmm: closed forms, independent numerics, published trends."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from seatool.physics import porous as por
from seatool.physics import surface_absorption, tmm

RHO0, C0 = 1.21, 343.0


JCA_FOAM = {
    "model": "jca",
    "flow_resistivity": 1e4,
    "porosity": 0.98,
    "tortuosity": 1.02,
    "viscous_length": 100e-6,
    "thermal_length": 250e-6,
    "bulk_density": 20.0,
}


def test_rigid_backed_layer_matches_closed_form():
    # Allard & Atalla (2009) ch. 3: Z_s = -j Z_c cot(k_c d) at normal incidence, and
    # -j Z_c (k_c/k_x) cot(k_x d) at oblique incidence (extended reaction)
    f = np.array([300.0, 1000.0, 3000.0])
    layer = tmm.PorousLayer(0.05, "delany_bazley", 1e4)
    zc, kc = por.delany_bazley(f, 1e4)
    np.testing.assert_allclose(
        tmm.surface_impedance(f, [layer]), -1j * zc / np.tan(kc * 0.05), rtol=1e-10
    )
    th = 0.9
    zs_ext = surface_absorption.rigid_backed_impedance(
        f, zc, kc, 0.05, angle=th, reaction="extended"
    )
    np.testing.assert_allclose(tmm.surface_impedance(f, [layer], angle=th), zs_ext, rtol=1e-10)
    np.testing.assert_allclose(
        tmm.absorption(f, [layer], angle=th),
        surface_absorption.absorption_coefficient(zs_ext, angle=th),
    )


def _two_layer_impedance_ode(f, zc1, kc1, d1, d2):
    """Independent: integrate p'' + k^2 p = 0 from the rigid wall through an air gap (d2)
    and then a porous layer (d1), with p and v continuous at the interface."""
    w = 2 * math.pi * f
    k0 = w / C0

    def solve(k, rho, x0, x1, p, v):
        dp = -1j * w * rho * v  # Euler: dp/dx = -j omega rho v

        def rhs(_x, y):
            return [y[1], -(k**2) * y[0]]

        sol = solve_ivp(rhs, (x0, x1), [p, dp], rtol=1e-11, atol=1e-14)
        p1, dp1 = sol.y[0, -1], sol.y[1, -1]
        return p1, -dp1 / (1j * w * rho)

    p, v = solve(k0 + 0j, RHO0, d1 + d2, d1, 1.0 + 0j, 0.0 + 0j)  # air gap at the wall
    rho1 = zc1 * kc1 / w
    p, v = solve(kc1, rho1, d1, 0.0, p, v)
    return p / v


@pytest.mark.parametrize("f", [250.0, 1200.0])
def test_porous_plus_air_gap_against_ode(f):
    layers = [tmm.PorousLayer(0.03, **JCA_FOAM), tmm.AirLayer(0.04)]
    zc, kc = por.johnson_champoux_allard(f, 0.98, 1.02, 1e4, 100e-6, 250e-6, rho0=RHO0)
    zs_ode = _two_layer_impedance_ode(f, complex(zc), complex(kc), 0.03, 0.04)
    np.testing.assert_allclose(tmm.surface_impedance(f, layers, rho0=RHO0, c0=C0), zs_ode, rtol=1e-7)


def test_diffuse_absorption_matches_porous_module():
    # two independent quadratures (Gauss-Legendre in theta vs graded in sin^2 theta)
    f = np.array([200.0, 800.0, 3200.0])
    layer = tmm.PorousLayer(0.05, "miki", 1.5e4)
    zc, kc = por.miki(f, 1.5e4)
    a_por = surface_absorption.diffuse_absorption(f, zc, kc, 0.05, reaction="extended", n_angles=96)
    np.testing.assert_allclose(tmm.diffuse_absorption(f, [layer]), a_por, atol=1e-6)


def test_impervious_layer_on_rigid_wall_absorbs_nothing():
    # A limp impervious layer pressed on a rigid wall cannot move: no absorption
    # (the surface velocity is zero; common practice). Must not divide by zero.
    import warnings

    from seatool.physics import tmm

    with warnings.catch_warnings():
        warnings.simplefilter("error")
        a = tmm.absorption(np.array([250.0, 1000.0, 4000.0]), [tmm.LimpLayer(5.0)], backing="rigid")
    np.testing.assert_allclose(a, 0.0, atol=1e-15)
