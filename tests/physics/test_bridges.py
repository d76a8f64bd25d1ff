"""Structure-borne bridges across a trim (seatool.physics.bridges).

References used by the checks:
* Sharp, B.H. (1978), Noise Control Eng. 11, sound bridges: rigid point connections at
  spacing e add Delta R = 20 lg(e f_c) - 45 dB to the transmission loss, f_c the critical
  frequency of the driven leaf, and rigid line connections at spacing b add
  10 lg(b f_c) - 18 dB (both from memory);
* the radiated power of an infinite plate driven by a point or line force, by numerical
  integration of its wavenumber spectrum over the radiating wavenumbers (an independent
  numerical method: the full plate response with bending stiffness and damping, scipy quad),
  against the mass-controlled closed forms of the module.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import integrate

from seatool.physics import bridges, mobility

C0, RHO0 = 343.0, 1.2


def _plate(h: float, e: float, rho: float, nu: float) -> tuple[float, float, float]:
    d = e * h**3 / (12.0 * (1.0 - nu**2))
    m = rho * h
    return d, m, C0**2 / (2.0 * math.pi) * math.sqrt(m / d)


GYPSUM = _plate(0.0125, 2.5e9, 700.0, 0.3)  # 12.5 mm board (round handbook values, from memory)


@pytest.mark.parametrize("spacing", [0.3, 0.6, 1.2])
def test_rigid_point_bridges_give_sharps_sound_bridge_term(spacing):
    d, m, fc = GYPSUM
    r = bridges.point_bridge_power_ratio(
        500.0, 1.0 / spacing**2, np.inf, m, cover_bending_stiffness=d, c0=C0
    )
    sharp = 20.0 * math.log10(spacing * fc) - 45.0  # Sharp 1978, from memory
    assert -10.0 * math.log10(float(r)) == pytest.approx(sharp, abs=1.0)


def _radiated_point(f: float, d: float, m: float, eta: float) -> float:
    """rho0 omega / (2 pi) int_0^k0 |V(k)|^2 k / sqrt(k0^2 - k^2) dk for F = 1 N."""
    w = 2 * math.pi * f
    k0 = w / C0

    def v2(k: float) -> float:
        return w**2 / abs(d * (1 + 1j * eta) * k**4 - m * w**2) ** 2

    # k = k0 sin t removes the edge singularity: k dk / sqrt(k0^2 - k^2) = k0 sin t dt
    val, _ = integrate.quad(lambda t: v2(k0 * math.sin(t)) * k0 * math.sin(t), 0, math.pi / 2)
    return RHO0 * w / (2 * math.pi) * val


def _radiated_line(f: float, d: float, m: float, eta: float) -> float:
    """rho0 omega / (2 pi) int_-k0^k0 |V(kx)|^2 / sqrt(k0^2 - kx^2) dkx for F' = 1 N/m."""
    w = 2 * math.pi * f
    k0 = w / C0

    def v2(k: float) -> float:
        return w**2 / abs(d * (1 + 1j * eta) * k**4 - m * w**2) ** 2

    val, _ = integrate.quad(lambda t: v2(k0 * math.sin(t)), -math.pi / 2, math.pi / 2)
    return RHO0 * w / (2 * math.pi) * val


@pytest.mark.parametrize("ratio", [0.02, 0.1, 0.3])
def test_point_and_line_radiation_against_wavenumber_integral(ratio):
    # Below coincidence the closed forms rho0 F^2/(2 pi c0 m^2) and rho0 F'^2/(2 omega m^2)
    # (module Notes) against the full plate response; the stiffness term changes the
    # integral by about (f/f_c)^2: tolerance 1 % + 2 (f/f_c)^2.
    d, m, fc = GYPSUM
    f = ratio * fc
    tol = 0.01 + 2 * ratio**2
    # point: r = n |T|^2/(2 pi c0^2 m^2) with T = F/v1 = 1 per unit velocity -> use a
    # rigid bridge on a footprint of mass impedance 1 N s/m: T = 1/(1/Z2) = Z2.
    w = 2 * math.pi * f
    area = 1.0 / (w * m)  # j omega m A = j: |T| = 1 for a limp cover
    r_pt = bridges.point_bridge_power_ratio(f, 1.0, np.inf, m, footprint_area=area, c0=C0)
    w_point = float(r_pt) * RHO0 * C0  # power per unit force, n = 1, v1 = 1
    assert w_point == pytest.approx(_radiated_point(f, d, m, 0.01), rel=tol)
    width = 1.0 / (w * m)
    r_ln = bridges.line_bridge_power_ratio(f, 1.0, np.inf, m, width=width, c0=C0)
    w_line = float(r_ln) * RHO0 * C0
    assert w_line == pytest.approx(_radiated_line(f, d, m, 0.01), rel=tol)


def _line_impedance(f: float, d: float, m: float, eta: float) -> complex:
    """F'/v(0) of an infinite plate under a line force, by the inverse wavenumber transform.

    v(0) = (j omega F' / pi) int_0^inf dk / (D (1 + j eta) k^4 - m omega^2); with k = k_B s
    the integral is (k_B / (m omega^2)) int_0^inf ds / ((1 + j eta) s^4 - 1), evaluated by
    scipy quad with a break point at the bending wavenumber s = 1.
    """
    w = 2 * math.pi * f
    k_b = (m * w**2 / d) ** 0.25

    def g(s: float) -> complex:
        return 1.0 / ((1 + 1j * eta) * s**4 - 1.0)

    parts = []
    for take in (lambda z: z.real, lambda z: z.imag):
        near, _ = integrate.quad(lambda s, t=take: t(g(s)), 0, 2, points=[1.0], limit=800)
        far, _ = integrate.quad(lambda s, t=take: t(g(s)), 2, np.inf)
        parts.append(near + far)
    integral = complex(parts[0], parts[1]) * k_b / (m * w**2)
    return 1.0 / (1j * w / math.pi * integral)


@pytest.mark.parametrize("spacing", [0.3, 0.6, 1.2])
def test_rigid_line_bridges_from_the_wavenumber_integrals(spacing):
    # Independent route for rigid line bridges at spacing b on a plate cover: the line
    # impedance of the infinite plate by the inverse wavenumber transform of its response
    # (no closed form used), times the power the line-driven plate radiates by the
    # wavenumber integral of its full response (stiffness and damping), over the bare base
    # radiating rho0 c0 per unit area. It gives the module's value within 0.3 dB at
    # f = 0.18 f_c and Delta R = 10 lg(b f_c) - 10 lg(2 c0 / pi) = 10 lg(b f_c) - 23.4 dB
    # (c0 = 343 m/s). Sharp (1978, Noise Control Eng. 11; as quoted by Bies & Hansen,
    # Engineering Noise Control, sec. 8.2; constant from memory) gives 10 lg(b f_c) - 18 dB:
    # 5.4 dB less bridge power. For rigid point bridges the same route agrees with Sharp's
    # 20 lg(e f_c) - 45 dB within 0.2 dB (test above), so the two remembered constants are
    # not consistent with one derivation; the model keeps the derived value, the larger
    # (conservative) bridge power, and the difference is stated in docs/theory/treatment.md.
    d, m, fc = GYPSUM
    f = 500.0
    z = _line_impedance(f, d, m, 1e-3)
    np.testing.assert_allclose(  # the closed form 2 m c_B (1 + j) of the module's Notes
        z, 2 * m * math.sqrt(2 * math.pi * f) * (d / m) ** 0.25 * (1 + 1j), rtol=2e-3
    )
    radiated = abs(z) ** 2 * _radiated_line(f, d, m, 1e-3)  # per length, v1 = 1 m/s
    ratio = radiated / (spacing * RHO0 * C0)
    got = bridges.line_bridge_power_ratio(
        f, 1.0 / spacing, np.inf, m, cover_bending_stiffness=d, c0=C0
    )
    assert -10 * math.log10(float(got)) == pytest.approx(-10 * math.log10(ratio), abs=0.3)
    derived = 10 * math.log10(spacing * fc) - 10 * math.log10(2 * C0 / math.pi)
    assert -10 * math.log10(ratio) == pytest.approx(derived, abs=0.3)
    sharp = 10 * math.log10(spacing * fc) - 18.0  # Sharp 1978, from memory
    assert derived - sharp == pytest.approx(-5.4, abs=0.1)


def test_point_impedance_is_the_infinite_plate_value():
    # Rigid bridge on an elastic cover with no footprint: |T| = 8 sqrt(D m''), the inverse of
    # the infinite-plate drive-point mobility (Cremer, Heckl & Petersson 2005).
    d, m, _ = GYPSUM
    r = bridges.point_bridge_power_ratio(300.0, 1.0, np.inf, m, cover_bending_stiffness=d, c0=C0)
    z = 1.0 / abs(complex(mobility.plate_point_mobility(d, m)))
    assert float(r) == pytest.approx(z**2 / (2 * math.pi * C0**2 * m**2), rel=1e-12)


def test_soft_fixings_transmit_less_than_rigid_ones_below_their_resonance():
    f = np.array([100.0, 200.0, 400.0])
    rigid = bridges.point_bridge_power_ratio(f, 4.0, np.inf, 5.0, footprint_area=3e-4)
    soft = bridges.point_bridge_power_ratio(f, 4.0, 1e2, 5.0, footprint_area=3e-4)
    # fixing-footprint resonance sqrt(k/(m A))/(2 pi) = 41 Hz; above it the spring isolates
    assert np.all(soft < rigid)


def test_bridged_insertion_loss_is_limited_by_the_bridges():
    il = np.array([10.0, 30.0, 50.0, 70.0])
    r = 1e-4  # -10 lg r = 40 dB
    got = bridges.bridged_insertion_loss(il, r)
    assert np.all(got <= 40.0 + 1e-12)
    assert np.all(got <= il)
    assert got[0] == pytest.approx(10.0, abs=0.01)  # far below the ceiling: the trim's own
    assert got[3] == pytest.approx(40.0, abs=0.01)  # far above: the ceiling
    np.testing.assert_allclose(bridges.bridged_insertion_loss(il, 0.0), il)


@pytest.mark.parametrize(
    ("kwargs", "name"),
    [({"stiffness": 0.0}, "stiffness"), ({"per_area": -1.0}, "per_area"),
     ({"cover_mass_per_area": 0.0}, "cover_mass_per_area")],
)  # fmt: skip
def test_invalid_input_names_the_argument(kwargs, name):
    args = {"per_area": 4.0, "stiffness": np.inf, "cover_mass_per_area": 5.0} | kwargs
    with pytest.raises(ValueError, match=name):
        bridges.point_bridge_power_ratio(100.0, **args)
