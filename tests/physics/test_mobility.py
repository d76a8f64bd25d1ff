"""Tests of seatool.physics.mobility against independent numerical solutions."""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
import pytest
from scipy import integrate

from seatool.physics import acoustic as ac
from seatool.physics import beams, plates
from seatool.physics import mobility as mob

E_ST, RHO_ST, NU_ST = 210e9, 7850.0, 0.30


def _complex_quad(func: Callable[[float], complex], a: float, b: float, **kw: object) -> complex:
    re = integrate.quad(lambda x: func(x).real, a, b, **kw)[0]
    im = integrate.quad(lambda x: func(x).imag, a, b, **kw)[0]
    return complex(re, im)


def _split_quad(func: Callable[[float], complex], peak: float) -> complex:
    """Integrate over (0, inf) with the resonance peak at `peak` resolved."""
    kw: dict[str, object] = {"limit": 800, "epsabs": 0.0, "epsrel": 1e-10}
    return (
        _complex_quad(func, 0.0, 0.9 * peak, **kw)
        + _complex_quad(func, 0.9 * peak, 1.1 * peak, points=[peak], **kw)
        + _complex_quad(func, 1.1 * peak, 10 * peak, **kw)
        + _complex_quad(func, 10 * peak, np.inf, **kw)
    )


# ---------------------------------------------------------------------------------------
# infinite plate
# ---------------------------------------------------------------------------------------
def test_plate_mobility_vs_wavenumber_integral_of_greens_function() -> None:
    # Independent: Y = (j w / (2 pi)) int_0^inf k dk / (D (1 + j eta) k^4 - m'' w^2)
    # (2-D Fourier transform of the damped Kirchhoff plate equation, exp(+j w t)).
    h = 2e-3
    d = float(plates.bending_stiffness(E_ST, h, NU_ST))
    m = RHO_ST * h
    eta = 1e-4
    w = 2 * np.pi * 1000.0
    s0 = w * np.sqrt(m / d)  # s = k^2 at resonance

    def integrand(s: float) -> complex:
        return 1.0 / (d * (1 + 1j * eta) * s**2 - m * w**2)

    y_num = 1j * w / (4 * np.pi) * _split_quad(integrand, s0)  # k dk = ds / 2
    y = complex(mob.plate_point_mobility(d, m))
    assert y.real == pytest.approx(y_num.real, rel=1e-3)
    assert abs(y_num.imag) < 1e-3 * abs(y)
    assert y.imag == 0.0


def test_plate_mobility_vs_band_averaged_modal_sum_of_finite_plate() -> None:
    # Independent: modal sum of a simply supported plate (mass-normalised modes
    # phi = 2 sin sin, drive-point average of phi^2 = 1), loss factor eta, averaged over
    # a 1/3-octave band: Re(Y) -> pi n(omega) / (2 M) = 1 / (8 sqrt(D m''))
    # (Cremer, Heckl & Petersson ch. 4; Lyon & DeJong ch. 5).
    a, b, h, eta = 1.5, 1.2, 1e-3, 0.05
    d = float(plates.bending_stiffness(E_ST, h, NU_ST))
    m = RHO_ST * h
    mass = m * a * b
    mm, nn = np.meshgrid(np.arange(1, 120), np.arange(1, 120), indexing="ij")
    wmn = (np.pi**2 * np.sqrt(d / m) * ((mm / a) ** 2 + (nn / b) ** 2)).ravel()
    fm = 2000.0
    wmn = wmn[wmn < 2 * np.pi * 8 * fm]  # modes far above the band add only mass-law terms
    f = np.linspace(fm * 10**-0.05, fm * 10**0.05, 1500)
    w = 2 * np.pi * f[:, None]
    y = (1j * w / (mass * (wmn[None, :] ** 2 * (1 + 1j * eta) - w**2))).sum(axis=1)
    re_avg = y.real.mean()
    y_inf = complex(mob.plate_point_mobility(d, m)).real
    assert re_avg == pytest.approx(y_inf, rel=0.05)
    # the same identity with the modal density: Re Y = pi n(omega) / (2M), n(omega) = n(f)/2pi
    n_f = float(plates.plate_bending_modal_density(fm, a * b, d, m))
    assert y_inf == pytest.approx(np.pi * (n_f / (2 * np.pi)) / (2 * mass), rel=1e-12)
    assert y_inf != pytest.approx(np.pi * n_f / (2 * mass), rel=0.5)  # the 2 pi trap


@pytest.mark.regression
def test_plate_mobility_regression() -> None:
    # computed by hand outside the code (Y = 1/(8 sqrt(D m'')), Cremer, Heckl & Petersson 2005, Structure-Borne Sound, 3rd ed., not
    # published): steel 1 mm, Y_inf = 0.010174 m/(N s)
    d = plates.bending_stiffness(E_ST, 1e-3, NU_ST)
    assert complex(mob.plate_point_mobility(d, RHO_ST * 1e-3)).real == pytest.approx(
        0.010174, rel=1e-4
    )


# ---------------------------------------------------------------------------------------
# beams
# ---------------------------------------------------------------------------------------
SEC = beams.rectangular_section(0.03, 0.01)
MPRIME = RHO_ST * SEC.area
EI = E_ST * SEC.second_moment_y


def test_beam_mobility_vs_wavenumber_integral() -> None:
    # Independent: Y = (j w / pi) int_0^inf dk / (EI (1 + j eta) k^4 - m' w^2)
    eta = 1e-4
    f = 500.0
    w = 2 * np.pi * f
    kb = (w**2 * MPRIME / EI) ** 0.25

    def integrand(k: float) -> complex:
        return 1.0 / (EI * (1 + 1j * eta) * k**4 - MPRIME * w**2)

    y_num = 1j * w / np.pi * _split_quad(integrand, kb)
    y = complex(mob.beam_point_mobility(f, E_ST, SEC.second_moment_y, MPRIME))
    assert y.real == pytest.approx(y_num.real, rel=1e-3)
    assert y.imag == pytest.approx(y_num.imag, rel=1e-3)  # sign: mass-like, exp(+j w t)
    assert y.imag < 0


def _finite_beam_end_mobility(f: float, eta: float, length: float) -> complex:
    """Free-end force mobility of a long damped beam, clamped far end, by a 4x4 solve.

    EI (1 + j eta) w'''' - m' w^2 w = F delta(x - 0+) with w''(0) = 0, EI' w'''(0) = F,
    w(L) = w'(L) = 0; basis exp(-jkx), exp(-kx), exp(jk(x-L)), exp(k(x-L)).
    """
    w = 2 * np.pi * f
    eic = EI * (1 + 1j * eta)
    k = (w**2 * MPRIME / eic) ** 0.25
    k = k if k.imag < 0 else np.conj(k)  # outgoing, decaying exp(-jkx)
    lam = np.array([-1j * k, -k, 1j * k, k])  # exponents
    shift = np.array([0.0, 0.0, -length, -length])

    def row(x: float, order: int) -> np.ndarray:
        return lam**order * np.exp(lam * (x + shift))

    a = np.array([row(0.0, 2), eic * row(0.0, 3), row(length, 0), row(length, 1)])
    rhs = np.array([0.0, 1.0, 0.0, 0.0], dtype=complex)
    coef = np.linalg.solve(a, rhs)
    return complex(1j * w * (row(0.0, 0) @ coef))


def test_beam_end_mobility_vs_boundary_value_solution() -> None:
    for f in (200.0, 2000.0):
        eta = 0.01
        kb = float(beams.beam_bending_wavenumber(f, E_ST, SEC.second_moment_y, MPRIME))
        length = 8000.0 / kb  # far-end reflection exp(-eta k L / 2) negligible
        y_num = _finite_beam_end_mobility(f, eta, length)
        y = complex(mob.beam_end_mobility(f, E_ST, SEC.second_moment_y, MPRIME))
        assert abs(y_num - y) < 0.01 * abs(y)  # O(eta) difference from the damping


# ---------------------------------------------------------------------------------------
# rods and torsion
# ---------------------------------------------------------------------------------------
def _finite_rod_end_mobility(stiffness: float, inertia: float, f: float, eta: float) -> complex:
    """End mobility of a long damped 1-D wave guide (rod: EA, rho A; torsion: GJ, rho I_p).

    -K (1 + j eta) u'' - I w^2 u = F delta(x - 0+), free at 0 -> K' u'(0) = -F; fixed at L.
    """
    w = 2 * np.pi * f
    kc = stiffness * (1 + 1j * eta)
    k = w * np.sqrt(inertia / kc)
    k = k if k.imag < 0 else np.conj(k)
    length = 4000.0 / k.real
    lam = np.array([-1j * k, 1j * k])
    shift = np.array([0.0, -length])
    a = np.array([kc * lam * np.exp(lam * shift), np.exp(lam * (length + shift))])
    coef = np.linalg.solve(a, np.array([-1.0, 0.0], dtype=complex))
    return complex(1j * w * (np.exp(lam * shift) @ coef))


def test_rod_mobilities_vs_boundary_value_solution() -> None:
    area = 1e-3
    y_num = _finite_rod_end_mobility(E_ST * area, RHO_ST * area, 1000.0, 0.01)
    y_end = complex(mob.rod_end_mobility(E_ST, RHO_ST, area))
    assert abs(y_num - y_end) < 0.01 * abs(y_end)
    # infinite rod: wavenumber integral (j w / pi) int_0^inf dk / (EA' k^2 - rho A w^2)
    w, eta = 2 * np.pi * 1000.0, 1e-4
    k0 = w * np.sqrt(RHO_ST / E_ST)

    def integrand(k: float) -> complex:
        return 1.0 / (E_ST * area * (1 + 1j * eta) * k**2 - RHO_ST * area * w**2)

    y_inf_num = 1j * w / np.pi * _split_quad(integrand, k0)
    y_inf = complex(mob.rod_point_mobility(E_ST, RHO_ST, area))
    assert y_inf.real == pytest.approx(y_inf_num.real, rel=1e-3)
    assert abs(y_inf_num.imag) < 2e-3 * abs(y_inf)


def test_torsion_mobilities_vs_boundary_value_solution() -> None:
    sec = beams.rectangular_section(0.04, 0.01)
    g = E_ST / (2 * (1 + NU_ST))
    y_num = _finite_rod_end_mobility(
        g * sec.torsion_constant, RHO_ST * sec.polar_moment, 3000.0, 0.01
    )
    y_end = complex(mob.torsion_end_mobility(g, sec.torsion_constant, RHO_ST, sec.polar_moment))
    assert abs(y_num - y_end) < 0.01 * abs(y_end)
    c_t = float(beams.torsion_speed(g, sec.torsion_constant, RHO_ST, sec.polar_moment))
    assert y_end.real == pytest.approx(1 / (RHO_ST * sec.polar_moment * c_t))
    y_inf = complex(mob.torsion_point_mobility(g, sec.torsion_constant, RHO_ST, sec.polar_moment))
    assert y_inf == pytest.approx(0.5 * y_end)


# ---------------------------------------------------------------------------------------
# power input
# ---------------------------------------------------------------------------------------
def test_point_force_power_vs_time_average() -> None:
    # Independent: time average of F(t) v(t) over one period, F(t) = sqrt(2) F cos(w t),
    # v(t) = Re(Y sqrt(2) F exp(j w t)).
    f_rms, y = 3.0, 0.02 - 0.013j
    t = np.linspace(0.0, 1.0, 20001)[:-1]  # one period of w = 2 pi
    force = np.sqrt(2) * f_rms * np.cos(2 * np.pi * t)
    vel = (y * np.sqrt(2) * f_rms * np.exp(2j * np.pi * t)).real
    assert mob.point_force_power(f_rms, y) == pytest.approx(np.mean(force * vel), rel=1e-9)
    with pytest.raises(ValueError, match="mobility"):
        mob.point_force_power(1.0, -0.1 + 0j)


def test_diffuse_field_power_reproduces_cremer_above_coincidence() -> None:
    # Cremer (1942) resonant transmission above coincidence (Akust. Z. 7, 81-104, from memory):
    # tau = (pi / (2 eta)) (f_c / f) (rho c / (pi f m''))^2.
    # SEA route: diffuse field -> panel (this function), panel energy E = P / (w eta),
    # radiated power W = rho c sigma S E / M into the far side, tau = W / (S <p^2>/(4 rho c)).
    rho, c = 1.21, 343.0
    h, eta, area = 1e-3, 0.01, 4.0
    d = float(plates.bending_stiffness(E_ST, h, NU_ST))
    m = RHO_ST * h
    fc = float(plates.critical_frequency(d, m, c))
    p2 = 1.0
    for f in (3 * fc, 10 * fc):
        w = 2 * np.pi * f
        n = float(plates.plate_bending_modal_density(f, area, d, m))
        sigma = 1.0  # well above coincidence
        p_in = float(mob.diffuse_field_power_input(f, p2, sigma, n, m, c))
        energy = p_in / (w * eta)
        w_rad = rho * c * sigma * area * energy / (m * area)
        tau = w_rad / (area * p2 / (4 * rho * c))
        tau_cremer = np.pi / (2 * eta) * (fc / f) * (rho * c / (np.pi * f * m)) ** 2
        assert tau == pytest.approx(tau_cremer, rel=1e-9)


def test_diffuse_field_power_gives_modal_energy_equipartition() -> None:
    # SEA reciprocity check: a panel losing energy only by radiation into the driving
    # cavity reaches the cavity's modal energy, E_p / n_p = E_c / n_c (Lyon & DeJong).
    rho, c = 1.21, 343.0
    h, area, f = 2e-3, 1.5, 1000.0
    d = float(plates.bending_stiffness(E_ST, h, NU_ST))
    m = RHO_ST * h
    n_p = float(plates.plate_bending_modal_density(f, area, d, m))
    v = 10.0
    n_c = float(ac.cavity_modal_density(f, v, 1.0, 1.0, c, terms="volume"))
    sigma, p2 = 0.3, 0.5
    w = 2 * np.pi * f
    eta_pc = rho * c * sigma / (w * m)
    e_c = p2 * v / (rho * c**2)
    e_p = float(mob.diffuse_field_power_input(f, p2, sigma, n_p, m, c)) / (w * eta_pc)
    assert e_p / n_p == pytest.approx(e_c / n_c, rel=1e-12)


@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: mob.plate_point_mobility(-1.0, 1.0), "bending_stiffness"),
        (lambda: mob.beam_point_mobility(100.0, 1e9, 1e-8, 0.0), "mass_per_length"),
        (lambda: mob.rod_end_mobility(1e9, 1e3, -1.0), "area"),
        (lambda: mob.diffuse_field_power_input(100.0, -1.0, 1.0, 1.0, 1.0, 343.0), "pressure"),
    ],
)
def test_invalid_input(call, name: str) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(ValueError, match=name):
        call()
