"""Tests for seatool.physics.radiation_modal.

Sources of the check values are given beside each test. Material data (steel E = 210 GPa,
rho = 7850 kg/m^3, nu = 0.3, c0 = 343 m/s) are typical handbook values (Cremer, Heckl & Petersson 2005, Structure-Borne Sound, 3rd ed.
Table 3.1; from memory); the critical frequency is computed here from its textbook definition
f_c = c0^2/(2 pi) sqrt(m''/D), independently of the code under test.
"""

from __future__ import annotations

import math

import pytest
from scipy import integrate

from seatool.physics import radiation_modal

C0 = 343.0


def freq_for_ka(ka: float, a: float) -> float:
    return ka * C0 / (2.0 * math.pi * a)


def wallace_asymptote(k: float, m: int, n: int, a: float, b: float) -> float:
    """Wallace (1972) low-frequency asymptotes with first corrections (Wallace 1972, J. Acoust.
    Soc. Am. 51(3B), 946-952, from memory; the even-even correction coefficient 1/28 is the
    one that numerical integration of the exact integral gives)."""
    cm = 1.0 - (8.0 if m % 2 else 24.0) / (m * math.pi) ** 2
    cn = 1.0 - (8.0 if n % 2 else 24.0) / (n * math.pi) ** 2
    pre = 1.0 / (math.pi**5 * m**2 * n**2)
    if m % 2 and n % 2:
        return 32 * k**2 * a * b * pre * (1 - k**2 * a * b / 12 * (cm * a / b + cn * b / a))
    if m % 2 and not n % 2:
        return (8 * k**4 * a * b**3 / 3 * pre
                * (1 - k**2 * a * b / 20 * (cm * a / b + cn * b / a)))
    if n % 2 and not m % 2:
        return (8 * k**4 * a**3 * b / 3 * pre
                * (1 - k**2 * a * b / 20 * (cm * a / b + cn * b / a)))
    return 2 * k**6 * a**3 * b**3 / 15 * pre * (1 - k**2 * a * b / 28 * (cm * a / b + cn * b / a))


@pytest.mark.parametrize(
    ("m", "n", "a", "b", "ka", "rtol"),
    [
        (1, 1, 1.0, 1.0, 0.05, 1e-4),   # odd-odd, Wallace 1972 (from memory)
        (1, 1, 1.0, 1.0, 0.3, 2e-4),    # first correction term matters here
        (1, 1, 1.0, 0.6, 0.3, 2e-4),
        (3, 1, 1.0, 0.7, 0.2, 1e-3),
        (1, 2, 1.0, 1.0, 0.1, 1e-3),    # odd-even
        (2, 1, 1.2, 0.8, 0.1, 1e-3),    # even-odd
        (2, 2, 1.0, 1.0, 0.1, 1e-3),    # even-even (correction coefficient 1/28)
    ],
)
def test_wallace_low_frequency_asymptotes(m, n, a, b, ka, rtol):
    f = freq_for_ka(ka, a)
    k = 2 * math.pi * f / C0
    got = radiation_modal.modal_radiation_efficiency_wallace(f, m, n, a, b, c0=C0)
    assert got == pytest.approx(wallace_asymptote(k, m, n, a, b), rel=rtol)


def test_wallace_quadrature_matches_adaptive_scipy_integral():
    # Independent numerical method: scipy adaptive dblquad on the Vigran (2008) eq. 6.46 form,
    # at k a = 12 with a mode whose x-wavenumber is supersonic (integrand peak inside).
    a, b, m, n = 1.0, 0.8, 3, 6
    f = freq_for_ka(12.0, a)
    k = 2 * math.pi * f / C0

    def factor(arg: float, q: int) -> float:
        trig = math.cos if q % 2 else math.sin
        x = arg / (q * math.pi)
        if abs(x - 1.0) < 1e-9:
            return q * math.pi / 4.0
        return trig(arg / 2.0) / (x * x - 1.0)

    def integrand(theta: float, phi: float) -> float:
        al = k * a * math.sin(theta) * math.cos(phi)
        be = k * b * math.sin(theta) * math.sin(phi)
        return (factor(al, m) * factor(be, n)) ** 2 * math.sin(theta)

    val, _ = integrate.dblquad(integrand, 0.0, math.pi / 2, 0.0, math.pi / 2,
                               epsabs=0.0, epsrel=1e-9)
    ref = 64 * k**2 * a * b / (math.pi**6 * m**2 * n**2) * val
    got = radiation_modal.modal_radiation_efficiency_wallace(f, m, n, a, b, c0=C0)
    assert got == pytest.approx(ref, rel=1e-6)


def test_wallace_single_mode_tends_to_one_well_above_its_coincidence():
    # A (1,1) mode at k a >> pi radiates like a piston-ish plane wave: sigma -> 1
    # (Wallace 1972, Fig. 2 trend; values 1.109/1.027/1.006 at k a = 10/20/40 are computed by hand outside the
    # code, not published).
    vals = [radiation_modal.modal_radiation_efficiency_wallace(freq_for_ka(ka, 1.0), 1, 1, 1.0, 1.0)
            for ka in (10.0, 20.0, 40.0)]
    assert abs(vals[2] - 1.0) < abs(vals[1] - 1.0) < abs(vals[0] - 1.0) < 0.15
    assert vals[2] == pytest.approx(1.0, abs=0.01)


def test_wallace_rejects_bad_input():
    with pytest.raises(ValueError, match="mode indices"):
        radiation_modal.modal_radiation_efficiency_wallace(100.0, 0, 1, 1.0, 1.0)
    with pytest.raises(ValueError, match="a must be"):
        radiation_modal.modal_radiation_efficiency_wallace(100.0, 1, 1, -1.0, 1.0)
