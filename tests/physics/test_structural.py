"""Tests of seatool.physics.structural against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate, special

from seatool.materials import load_materials
from seatool.physics import beams, elastic, orthotropic_plates, plates, resonators, sandwich, shells

# steel as used throughout the project's reference sheet (PHYSICS.md conventions)
E_ST, RHO_ST, NU_ST = 210e9, 7850.0, 0.30
C0 = 343.0


def third_octave_bands(k_lo: int, k_hi: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Exact base-10 1/3-octave mid-band frequencies 10^(k/10) and edges (IEC 61260-1)."""
    k = np.arange(k_lo, k_hi + 1)
    fm = 10.0 ** (k / 10.0)
    return fm, fm * 10.0**-0.05, fm * 10.0**0.05


# ---------------------------------------------------------------------------------------
# thin plate: modal density against an exact count of simply supported plate modes
# ---------------------------------------------------------------------------------------
PLATE_A, PLATE_B, PLATE_H = 1.5, 1.2, 1e-3


def _ss_plate_frequencies(d: float, m: float, a: float, b: float, nmax: int) -> np.ndarray:
    """Exact natural frequencies f_mn = (pi/2) sqrt(D/m'') ((m/a)^2 + (n/b)^2).

    Navier solution of the simply supported Kirchhoff plate (Timoshenko &
    Woinowsky-Krieger 1959; Leissa 1969, Vibration of Plates, NASA SP-160, ch. 4).
    """
    mm, nn = np.meshgrid(np.arange(1, nmax + 1), np.arange(1, nmax + 1), indexing="ij")
    return (np.pi / 2.0 * np.sqrt(d / m) * ((mm / a) ** 2 + (nn / b) ** 2)).ravel()


def test_plate_modal_density_vs_exact_simply_supported_count() -> None:
    # independent method: enumeration of the Navier solution of the SS plate
    d = float(plates.bending_stiffness(E_ST, PLATE_H, NU_ST))
    m = RHO_ST * PLATE_H
    freqs = _ss_plate_frequencies(d, m, PLATE_A, PLATE_B, 400)
    fm, lo, hi = third_octave_bands(27, 36)  # 500 Hz ... 4 kHz
    n = plates.plate_bending_modal_density(fm, PLATE_A * PLATE_B, d, m)
    counted = np.array([np.count_nonzero((freqs >= a) & (freqs < b)) for a, b in zip(lo, hi, strict=True)])
    expected = n * (hi - lo)
    assert counted.min() >= 60
    # statistical scatter of lattice counts (observed up to about 5 % here) plus the SS
    # edge deficit (a+b)k/(2 pi) of 1-3 %: per-band tolerance 8 %, band-sum tolerance 4 %
    np.testing.assert_allclose(counted, expected, rtol=0.08)
    assert abs(counted.sum() / expected.sum() - 1.0) < 0.04


def test_plate_cumulative_count_with_weyl_edge_term() -> None:
    # Independent: lattice-point count in the quarter disk. For the SS plate the modes
    # with m = 0 or n = 0 are missing, giving N(k) = S k^2/(4 pi) - (a+b) k/(2 pi)
    # (Courant & Hilbert 1953, Methods of Mathematical Physics I, ch. VI sec. 4; the
    # boundary term is the half lattice row on each axis).
    d = float(plates.bending_stiffness(E_ST, PLATE_H, NU_ST))
    m = RHO_ST * PLATE_H
    freqs = _ss_plate_frequencies(d, m, PLATE_A, PLATE_B, 400)
    s = PLATE_A * PLATE_B
    for f in (1000.0, 2000.0, 4000.0, 8000.0):
        exact = np.count_nonzero(freqs <= f)
        n = float(plates.plate_bending_modal_density(f, s, d, m))
        k = float(plates.plate_bending_wavenumber(f, d, m))
        leading = n * f  # N = n(f) * f since n is constant
        assert abs(exact / (leading - (PLATE_A + PLATE_B) * k / (2 * np.pi)) - 1.0) < 0.015
        # the leading term alone must be within the size of the edge term
        assert abs(exact / leading - 1.0) < 0.06


def test_plate_modal_density_per_rad_factor_two_pi() -> None:
    # Count modes by angular frequency: dN/domega must be n(f)/(2 pi), not n(f).
    d = float(plates.bending_stiffness(E_ST, PLATE_H, NU_ST))
    m = RHO_ST * PLATE_H
    omegas = 2 * np.pi * _ss_plate_frequencies(d, m, PLATE_A, PLATE_B, 400)
    w1, w2 = 2 * np.pi * 2000.0, 2 * np.pi * 6000.0
    count = np.count_nonzero((omegas >= w1) & (omegas < w2))
    n_f = float(plates.plate_bending_modal_density(4000.0, PLATE_A * PLATE_B, d, m))
    assert count == pytest.approx(n_f / (2 * np.pi) * (w2 - w1), rel=0.05)
    assert count != pytest.approx(n_f * (w2 - w1), rel=0.5)


def test_plate_modal_density_equivalent_forms() -> None:
    # n = S sqrt(3)/(h c_L') = pi S f_c / c0^2 (Cremer, Heckl & Petersson; PHYSICS.md 2.1)
    d = plates.bending_stiffness(E_ST, PLATE_H, NU_ST)
    m = RHO_ST * PLATE_H
    cl = elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST)
    n = plates.plate_bending_modal_density(100.0, 2.0, d, m)
    assert n == pytest.approx(2.0 * np.sqrt(3) / (PLATE_H * cl), rel=1e-12)
    assert n == pytest.approx(np.pi * 2.0 * plates.critical_frequency(d, m, C0) / C0**2, rel=1e-12)


def test_plate_modal_density_broadcasts_over_bands() -> None:
    f = np.array([[100.0, 200.0, 400.0]])
    n = plates.plate_bending_modal_density(f, 1.0, 19.2, 7.85)
    assert n.shape == f.shape
    assert np.all(n == n.flat[0])


def test_bending_wave_group_speed_is_numerical_derivative() -> None:
    # independent: c_g = d omega / dk by central finite differences of k(omega)
    d, m = 19.23, 7.85
    f = np.array([100.0, 1000.0, 5000.0])
    df = 1e-3 * f
    dk = plates.plate_bending_wavenumber(f + df, d, m) - plates.plate_bending_wavenumber(f - df, d, m)
    cg_num = 2 * np.pi * 2 * df / dk
    np.testing.assert_allclose(plates.plate_bending_group_speed(f, d, m), cg_num, rtol=1e-6)


@pytest.mark.regression
def test_plate_regression_values_from_reference_sheet() -> None:
    # [C] values of PHYSICS.md 2.1 and 3 (computed by the sheet's author, not published)
    d = plates.bending_stiffness(E_ST, 1e-3, NU_ST)
    m = RHO_ST * 1e-3
    assert d == pytest.approx(19.231, rel=1e-4)
    assert plates.plate_bending_modal_density(1.0, 1.0, d, m) == pytest.approx(0.31945, rel=1e-4)
    assert plates.critical_frequency(d, m, C0) == pytest.approx(11963, rel=1e-3)
    assert plates.plate_bending_phase_speed(1000.0, d, m) == pytest.approx(99.17, rel=1e-3)
    assert plates.plate_bending_wavenumber(1000.0, d, m) == pytest.approx(63.36, rel=1e-3)


def test_inplane_modal_densities_against_2d_lattice_count() -> None:
    # Independent: count the modes of the 2-D wave equation on a rectangle with
    # Neumann-type (free in-plane) conditions, k = pi sqrt((m/a)^2 + (n/b)^2), m,n >= 0,
    # using the non-dispersive f = c k / (2 pi); leading term only, so a large plate.
    a, b = 20.0, 15.0
    cl = float(elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST))
    cs = float(elastic.shear_speed(E_ST, RHO_ST, NU_ST))
    mm, nn = np.meshgrid(np.arange(0, 400), np.arange(0, 400), indexing="ij")
    kk = np.pi * np.sqrt((mm / a) ** 2 + (nn / b) ** 2)
    for c, func in (
        (cl, plates.plate_inplane_longitudinal_modal_density),
        (cs, plates.plate_inplane_shear_modal_density),
    ):
        fmodes = c * kk / (2 * np.pi)
        lo, hi = 800.0, 1200.0
        count = np.count_nonzero((fmodes >= lo) & (fmodes < hi))
        expected, _ = integrate.quad(lambda x, c=c, func=func: float(func(x, a * b, c)), lo, hi)
        # Neumann edge term adds (a+b)k/(2 pi); allow 6 %
        assert count == pytest.approx(expected, rel=0.06)


def test_wave_speeds_known_relations() -> None:
    # c_S / c_L' = sqrt((1 - nu)/2) for any isotropic material (elasticity identity)
    cl = elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST)
    cs = elastic.shear_speed(E_ST, RHO_ST, NU_ST)
    assert cs / cl == pytest.approx(np.sqrt((1 - NU_ST) / 2), rel=1e-12)
    assert elastic.bar_longitudinal_speed(E_ST, RHO_ST) == pytest.approx(
        cl * np.sqrt(1 - NU_ST**2), rel=1e-12
    )


# ---------------------------------------------------------------------------------------
# coincidence frequency: Long (2006) Architectural Acoustics, Table 9.1
# ---------------------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("material", "fch_published"),
    [
        # Long (2006) Table 9.1 "Product of plate thickness and critical frequency in air";
        # the table note says variations of 10 % are not uncommon
        ("steel", 12.4),
        ("aluminium", 12.0),
        ("glass", 12.7),
        ("gypsum_board", 38.0),
        ("concrete", 19.0),
        ("plywood", 20.0),
    ],
)
def test_critical_frequency_thickness_product_long_table_9_1(
    material: str, fch_published: float
) -> None:
    mat = load_materials()[material]
    h = 0.01
    d = plates.bending_stiffness(mat.youngs_modulus, h, mat.poisson_ratio)
    fc = plates.critical_frequency(d, mat.density * h, C0)
    assert fc * h == pytest.approx(fch_published, rel=0.10)
    # textbook form f_c = c0^2 sqrt(12) / (2 pi h c_L') (Cremer 1942; Long eq. 9.48)
    cl = elastic.plate_longitudinal_speed(mat.youngs_modulus, mat.density, mat.poisson_ratio)
    assert fc == pytest.approx(C0**2 * np.sqrt(12.0) / (2 * np.pi * h * cl), rel=1e-12)


def test_at_critical_frequency_bending_speed_equals_sound_speed() -> None:
    d, m = 19.23, 7.85
    fc = plates.critical_frequency(d, m, C0)
    assert plates.plate_bending_phase_speed(fc, d, m) == pytest.approx(C0, rel=1e-12)


# ---------------------------------------------------------------------------------------
# orthotropic and ribbed plates
# ---------------------------------------------------------------------------------------
def test_orthotropic_modal_density_vs_exact_navier_count() -> None:
    # Independent: SS orthotropic plate, Navier solution
    # m'' omega^2 = D_x (m pi/a)^4 + 2H (m pi/a)^2 (n pi/b)^2 + D_y (n pi/b)^4
    # (Timoshenko & Woinowsky-Krieger 1959 sec. 87; Leissa 1969 ch. 11).
    a, b, m = 2.0, 1.5, 10.0
    dx, dy, hh = 400.0, 25.0, 40.0  # strongly orthotropic, H != sqrt(DxDy) = 100
    kx = np.arange(1, 600)[:, None] * np.pi / a
    ky = np.arange(1, 600)[None, :] * np.pi / b
    omega = np.sqrt((dx * kx**4 + 2 * hh * kx**2 * ky**2 + dy * ky**4) / m)
    fmodes = (omega / (2 * np.pi)).ravel()
    fm, lo, hi = third_octave_bands(28, 34)
    counted = np.array([np.count_nonzero((fmodes >= x) & (fmodes < y)) for x, y in zip(lo, hi, strict=True)])
    n = orthotropic_plates.orthotropic_plate_modal_density(fm, a * b, dx, dy, m, torsional_stiffness=hh)
    assert counted.min() > 40
    np.testing.assert_allclose(counted, n * (hi - lo), rtol=0.12)
    assert abs(counted.sum() / (n * (hi - lo)).sum() - 1.0) < 0.05


def test_orthotropic_modal_density_angle_integral_by_quad() -> None:
    # independent numerical integration of (S/pi) * int sqrt(m/D(phi)) dphi
    s, m, dx, dy, hh = 2.0, 12.0, 300.0, 30.0, 20.0

    def integrand(phi: float) -> float:
        c2, s2 = np.cos(phi) ** 2, np.sin(phi) ** 2
        return float(np.sqrt(m / (dx * c2**2 + 2 * hh * c2 * s2 + dy * s2**2)))

    ref = s / np.pi * integrate.quad(integrand, 0.0, np.pi / 2, epsabs=0, epsrel=1e-12)[0]
    n = orthotropic_plates.orthotropic_plate_modal_density(500.0, s, dx, dy, m, torsional_stiffness=hh)
    assert n == pytest.approx(ref, rel=1e-9)


def test_orthotropic_huber_case_reduces_to_geometric_mean() -> None:
    # H = sqrt(Dx Dy): closed form (S/2) sqrt(m'') / (Dx Dy)^(1/4) (Lyon & DeJong, from memory)
    dx, dy, m = 90.0, 10.0, 5.0
    n = orthotropic_plates.orthotropic_plate_modal_density([100.0, 1000.0], 1.0, dx, dy, m)
    np.testing.assert_allclose(n, 0.5 * np.sqrt(m) / (dx * dy) ** 0.25, rtol=1e-12)
    iso = orthotropic_plates.orthotropic_plate_modal_density(100.0, 1.0, 30.0, 30.0, m, torsional_stiffness=30.0)
    assert iso == pytest.approx(plates.plate_bending_modal_density(100.0, 1.0, 30.0, m), rel=1e-12)


def test_ribbed_plate_smeared_stiffness() -> None:
    # Timoshenko & Woinowsky-Krieger sec. 86: D_x = D + E I / d, D_y = H = D.
    e, h, nu = 70e9, 2e-3, 0.33
    i_rib = orthotropic_plates.rib_second_moment_rectangular(5e-3, 30e-3, h)
    # parallel-axis theorem checked by direct numerical integration of z^2 over the rib
    z_lo, z_hi = h / 2, h / 2 + 30e-3
    i_num = 5e-3 * integrate.quad(lambda z: z**2, z_lo, z_hi)[0]
    assert i_rib == pytest.approx(i_num, rel=1e-12)
    dx, dy, hh = orthotropic_plates.ribbed_plate_stiffness(e, h, nu, i_rib, 0.15)
    d = plates.bending_stiffness(e, h, nu)
    assert dx == pytest.approx(d + e * i_num / 0.15, rel=1e-12)
    assert dy == pytest.approx(d) and hh == pytest.approx(d)
    # the ribs raise the stiffness: more than one coincidence frequency, n below the skin's
    fl, fh = orthotropic_plates.orthotropic_critical_frequencies(dx, dy, 2700 * h, C0)
    assert fl < fh
    assert orthotropic_plates.orthotropic_plate_modal_density(
        100.0, 1.0, dx, dy, 2700 * h, torsional_stiffness=hh
    ) < plates.plate_bending_modal_density(100.0, 1.0, d, 2700 * h)


def test_bay_frequency_is_first_strip_mode() -> None:
    # bending wavelength at f_bay equals twice the bay width (half a wavelength per bay)
    d, m, width = 50.0, 5.4, 0.2
    f_bay = orthotropic_plates.ribbed_plate_bay_frequency(width, d, m)
    k = plates.plate_bending_wavenumber(f_bay, d, m)
    assert 2 * np.pi / k == pytest.approx(2 * width, rel=1e-12)


# ---------------------------------------------------------------------------------------
# sandwich panel
# ---------------------------------------------------------------------------------------
SANDWICH = sandwich.sandwich_section(70e9, 0.33, 1e-3, 2700.0, 40e6, 20e-3, 50.0)


def test_sandwich_low_and_high_frequency_limits() -> None:
    sec = SANDWICH
    m = sec.surface_density
    f_low, f_high = 0.1, 1e7
    k_low = sandwich.sandwich_wavenumber(f_low, sec)
    k_high = sandwich.sandwich_wavenumber(f_high, sec)
    # whole-section bending (D_f + D_0) at low and face-sheet bending (D_f) at high f
    assert k_low == pytest.approx(
        plates.plate_bending_wavenumber(f_low, sec.total_bending_stiffness, m), rel=1e-3
    )
    assert k_high == pytest.approx(
        plates.plate_bending_wavenumber(f_high, sec.face_bending_stiffness, m), rel=2e-2
    )
    # and the modal density follows
    s = 1.0
    assert sandwich.sandwich_modal_density(f_low, s, sec) == pytest.approx(
        plates.plate_bending_modal_density(f_low, s, sec.total_bending_stiffness, m), rel=2e-3
    )
    assert sandwich.sandwich_modal_density(f_high, s, sec) == pytest.approx(
        plates.plate_bending_modal_density(f_high, s, sec.face_bending_stiffness, m), rel=5e-2
    )


def test_sandwich_intermediate_shear_regime() -> None:
    # where core shear governs, m'' omega^2 ~ S k^2: phase speed -> sqrt(S/m'') (Allen 1969)
    sec = sandwich.sandwich_section(70e9, 0.33, 0.2e-3, 2700.0, 5e6, 50e-3, 30.0)
    c_shear = np.sqrt(sec.shear_stiffness / sec.surface_density)
    f = np.logspace(1, 6, 400)
    cp = sandwich.sandwich_phase_speed(f, sec)
    # the phase speed rises as sqrt(f) at both ends (bending) and has a plateau at the
    # core shear wave speed in between
    slope = np.gradient(np.log(cp), np.log(f))
    assert slope[0] == pytest.approx(0.5, abs=0.05)
    assert slope[-1] == pytest.approx(0.5, abs=0.05)
    i = np.argmin(slope)
    assert slope[i] < 0.05
    assert cp[i] == pytest.approx(c_shear, rel=0.02)


def test_sandwich_wavenumber_solves_sixth_order_polynomial() -> None:
    # independent root finding: numpy.roots of
    # D_f D_0 x^3 + (D_f + D_0) S x^2 - m w^2 D_0 x - m w^2 S = 0, x = k^2
    sec = SANDWICH
    df, d0, s, m = (
        sec.face_bending_stiffness,
        sec.sandwich_bending_stiffness,
        sec.shear_stiffness,
        sec.surface_density,
    )
    for f in (10.0, 300.0, 3000.0, 30000.0):
        w2 = (2 * np.pi * f) ** 2
        roots = np.roots([df * d0, (df + d0) * s, -m * w2 * d0, -m * w2 * s])
        x = max(r.real for r in roots if abs(r.imag) < 1e-9 * abs(r) and r.real > 0)
        assert sandwich.sandwich_wavenumber(f, sec) == pytest.approx(np.sqrt(x), rel=1e-10)


def test_sandwich_group_speed_is_numerical_derivative() -> None:
    sec = SANDWICH
    f = np.array([50.0, 500.0, 5000.0, 50000.0])
    df = 1e-4 * f
    dk = sandwich.sandwich_wavenumber(f + df, sec) - sandwich.sandwich_wavenumber(f - df, sec)
    np.testing.assert_allclose(
        sandwich.sandwich_group_speed(f, sec), 2 * np.pi * 2 * df / dk, rtol=1e-5
    )


def test_sandwich_modal_density_vs_simply_supported_count() -> None:
    # SS sandwich plate: modes at k^2 = (m pi/a)^2 + (n pi/b)^2 with the same dispersion;
    # omega(k) is evaluated directly from the dispersion relation (no root finding).
    sec = SANDWICH
    a, b = 2.0, 1.5
    kx = np.arange(1, 400)[:, None] * np.pi / a
    ky = np.arange(1, 400)[None, :] * np.pi / b
    k2 = kx**2 + ky**2
    bb = sec.face_bending_stiffness + sec.sandwich_bending_stiffness * sec.shear_stiffness / (
        sec.sandwich_bending_stiffness * k2 + sec.shear_stiffness
    )
    fmodes = (np.sqrt(k2**2 * bb / sec.surface_density) / (2 * np.pi)).ravel()
    fm, lo, hi = third_octave_bands(33, 43)  # 2 kHz ... 20 kHz: shear-dominated range
    counted = np.array([np.count_nonzero((fmodes >= x) & (fmodes < y)) for x, y in zip(lo, hi, strict=True)])
    expected = np.array(
        [
            integrate.quad(lambda f: float(sandwich.sandwich_modal_density(f, a * b, sec)), x, y)[0]
            for x, y in zip(lo, hi, strict=True)
        ]
    )
    assert counted.min() > 30
    np.testing.assert_allclose(counted, expected, rtol=0.15)


def test_sandwich_section_properties() -> None:
    # Allen (1969): D_0 = E' t d^2 / 2, S = G d^2 / c; independent check of D_0 + D_f by
    # integrating E' z^2 over the two faces
    ep = 70e9 / (1 - 0.33**2)
    t, c = 1e-3, 20e-3
    d_num = 2 * ep * integrate.quad(lambda z: z**2, c / 2, c / 2 + t)[0]
    assert SANDWICH.total_bending_stiffness == pytest.approx(d_num, rel=1e-12)
    assert SANDWICH.shear_stiffness == pytest.approx(40e6 * (c + t) ** 2 / c)
    assert SANDWICH.surface_density == pytest.approx(2 * 2700 * t + 50 * c)


# ---------------------------------------------------------------------------------------
# cylindrical shell
# ---------------------------------------------------------------------------------------
def test_cylinder_ratio_closed_form_vs_quadrature() -> None:
    # independent: direct scipy quadrature of (2/pi) int nu / sqrt(nu^2 - cos^4 phi) dphi
    for nu in (0.05, 0.3, 0.8, 0.97, 1.03, 1.5, 4.0):
        phi0 = np.arccos(np.sqrt(min(nu, 1.0)))
        val = integrate.quad(
            lambda p, nu=nu: nu / np.sqrt(max(nu**2 - np.cos(p) ** 4, 1e-300)),
            phi0,
            np.pi / 2,
            limit=400,
            epsrel=1e-10,
        )[0]
        assert shells.cylinder_modal_density_ratio(nu) == pytest.approx(2 / np.pi * val, rel=1e-6)


def test_cylinder_ratio_asymptotes() -> None:
    # low: (2/pi) Gamma(1/4)^2 / (4 sqrt(2 pi)) sqrt(nu) (PHYSICS.md 2.5, derived);
    # high: 1 + 3/(16 nu^2)
    c_low = 2 / np.pi * special.gamma(0.25) ** 2 / (4 * np.sqrt(2 * np.pi))
    nu = np.array([1e-4, 1e-3])
    np.testing.assert_allclose(shells.cylinder_modal_density_ratio(nu) / np.sqrt(nu), c_low, rtol=1e-3)
    nu = np.array([20.0, 50.0])
    np.testing.assert_allclose(
        shells.cylinder_modal_density_ratio(nu), 1 + 3 / (16 * nu**2), rtol=1e-4
    )
    assert np.isinf(shells.cylinder_modal_density_ratio(1.0))


def _donnell_mode_frequencies(
    e: float, rho: float, nu: float, h: float, a: float, length: float, mmax: int, nmax: int
) -> tuple[np.ndarray, np.ndarray]:
    """All three Donnell-Mushtari branches of a closed shear-diaphragm cylinder.

    Frequency matrix of Leissa (1973), Vibration of Shells, NASA SP-288, ch. 2 (from
    memory), modes sin(m pi x/L) cos(n theta): lambda = m pi a / L, k = h^2/(12 a^2),
    Omega^2 = rho (1 - nu^2) a^2 omega^2 / E are the eigenvalues of the 3x3 matrix.
    Returns frequencies [Hz] and multiplicities (2 for n >= 1: sine and cosine modes).
    """
    lam = (np.arange(1, mmax + 1) * np.pi * a / length)[:, None] * np.ones((1, nmax + 1))
    n = np.ones((mmax, 1)) * np.arange(0, nmax + 1)[None, :]
    kk = h**2 / (12 * a**2)
    mat = np.zeros((*lam.shape, 3, 3))
    mat[..., 0, 0] = lam**2 + (1 - nu) / 2 * n**2
    mat[..., 0, 1] = mat[..., 1, 0] = (1 + nu) / 2 * lam * n
    mat[..., 0, 2] = mat[..., 2, 0] = nu * lam
    mat[..., 1, 1] = (1 - nu) / 2 * lam**2 + n**2
    mat[..., 1, 2] = mat[..., 2, 1] = n
    mat[..., 2, 2] = 1 + kk * (lam**2 + n**2) ** 2
    om2 = np.linalg.eigvalsh(mat)
    c_lp = np.sqrt(e / (rho * (1 - nu**2)))
    f = np.sqrt(np.abs(om2)) * c_lp / (2 * np.pi * a)
    mult = np.broadcast_to(np.where(n >= 1, 2, 1)[..., None], f.shape)
    return f.ravel(), mult.ravel()


def test_shell_modal_density_vs_donnell_mode_count() -> None:
    # Independent: count the natural frequencies of a closed cylinder from the full
    # Donnell-Mushtari equations (all branches), over (m, n); compare band counts with
    # the band integral of the asymptotic flexural modal density.
    e, rho, nu, h, a, length = E_ST, RHO_ST, NU_ST, 1e-3, 0.5, 2.0
    fmodes, mult = _donnell_mode_frequencies(e, rho, nu, h, a, length, 140, 110)
    area = 2 * np.pi * a * length
    f_peak = float(shells.ring_frequency(a, elastic.plate_longitudinal_speed(e, rho, nu))) * np.sqrt(
        1 - nu**2
    )
    fm, lo, hi = third_octave_bands(24, 37)  # 250 Hz ... 5 kHz, f_r = 1726 Hz
    ratios = []
    for x, y in zip(lo, hi, strict=True):
        count = mult[(fmodes >= x) & (fmodes < y)].sum()
        pts = [f_peak] if x < f_peak < y else None
        pred = integrate.quad(
            lambda f: float(shells.shell_bending_modal_density(f, area, a, h, e, rho, nu)),
            x,
            y,
            points=pts,
            limit=200,
        )[0]
        assert count >= 40
        ratios.append(count / pred)
    ratios_arr = np.array(ratios)
    assert np.all(np.abs(ratios_arr - 1) < 0.10)
    assert np.mean(np.abs(ratios_arr - 1)) < 0.03
    # well above the ring frequency the shell tends to the flat plate
    n_p = plates.plate_bending_modal_density(
        1.0, area, plates.bending_stiffness(e, h, nu), rho * h
    )
    assert shells.shell_bending_modal_density(10 * f_peak, area, a, h, e, rho, nu) == pytest.approx(
        n_p, rel=0.01
    )


def test_ring_frequency_is_breathing_mode_of_donnell_equations() -> None:
    # independent: n = 0 breathing mode of a very long cylinder (lambda -> 0) from the
    # Donnell-Mushtari matrix equals c_L' / (2 pi a)
    fmodes, mult = _donnell_mode_frequencies(E_ST, RHO_ST, NU_ST, 1e-3, 1.0, 1e4, 1, 0)
    fr = shells.ring_frequency(1.0, elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST))
    assert fmodes.max() == pytest.approx(fr, rel=1e-6)


@pytest.mark.regression
def test_ring_frequency_regression() -> None:
    # [C] PHYSICS.md 2.5: steel, a = 1 m -> 863 Hz (computed by the sheet's author)
    fr = shells.ring_frequency(1.0, elastic.plate_longitudinal_speed(E_ST, RHO_ST, NU_ST))
    assert fr == pytest.approx(863, rel=2e-3)


# ---------------------------------------------------------------------------------------
# beams
# ---------------------------------------------------------------------------------------
def test_beam_bending_modal_density_vs_exact_ss_beam_count() -> None:
    # Independent: SS Euler-Bernoulli beam, f_n = (pi/2) (n/L)^2 sqrt(EI/m')
    # (Cremer, Heckl & Petersson; Blevins 1979, Formulas for Natural Frequency, Table 8-1)
    sec = beams.rectangular_section(0.02, 0.01)
    length = 6.0
    mprime = RHO_ST * sec.area
    for i in (sec.second_moment_y, sec.second_moment_z):
        fn = np.pi / 2 * (np.arange(1, 3000) / length) ** 2 * np.sqrt(E_ST * i / mprime)
        fm, lo, hi = third_octave_bands(27, 37)
        counted = np.array([np.count_nonzero((fn >= x) & (fn < y)) for x, y in zip(lo, hi, strict=True)])
        expected = np.array(
            [
                integrate.quad(
                    lambda f, i=i: float(beams.beam_bending_modal_density(f, length, E_ST, i, mprime)),
                    x,
                    y,
                )[0]
                for x, y in zip(lo, hi, strict=True)
            ]
        )
        # 1-D counts are exact up to +-1 mode
        assert np.all(np.abs(counted - expected) <= 1.0)
        assert np.abs(counted.sum() - expected.sum()) <= 1.0


@pytest.mark.regression
def test_beam_regression_values_from_reference_sheet() -> None:
    # [C] PHYSICS.md 2.3: steel, h = 10 mm (bending in the thickness), L = 1 m
    sec = beams.rectangular_section(0.05, 0.01)
    m = RHO_ST * sec.area
    assert beams.beam_bending_phase_speed(100.0, E_ST, sec.second_moment_y, m) == pytest.approx(
        96.86, rel=1e-3
    )
    assert beams.beam_bending_modal_density(1000.0, 1.0, E_ST, sec.second_moment_y, m) == (
        pytest.approx(3.26e-3, rel=2e-3)
    )


def test_rod_and_torsion_modal_density_vs_exact_count() -> None:
    # free-free rod: f_n = n c / (2L) (Blevins 1979 Table 8-16, from memory); same for torsion
    length = 3.0
    sec = beams.circular_section(0.04, 0.03)
    g = E_ST / (2 * (1 + NU_ST))
    c_t = beams.torsion_speed(g, sec.torsion_constant, RHO_ST, sec.polar_moment)
    assert c_t == pytest.approx(np.sqrt(g / RHO_ST), rel=1e-12)  # circular: J = I_p
    c_l = elastic.bar_longitudinal_speed(E_ST, RHO_ST)
    for c, func in ((c_l, beams.longitudinal_modal_density), (c_t, beams.torsion_modal_density)):
        fn = np.arange(1, 400) * c / (2 * length)
        count = np.count_nonzero((fn >= 5000) & (fn < 20000))
        assert abs(count - float(func(10000.0, length, c)) * 15000) <= 1.0


@pytest.mark.parametrize(
    ("aspect", "beta"),
    # Timoshenko & Goodier (1951) Theory of Elasticity, table in sec. 93, J = beta a t^3
    # (from memory)
    [(1.0, 0.141), (1.5, 0.196), (2.0, 0.229), (3.0, 0.263), (5.0, 0.291), (10.0, 0.312)],
)
def test_rectangular_torsion_constant_timoshenko_table(aspect: float, beta: float) -> None:
    t = 0.01
    sec = beams.rectangular_section(aspect * t, t)
    assert sec.torsion_constant / (aspect * t * t**3) == pytest.approx(beta, abs=1.5e-3)


def test_torsion_speed_rectangular_below_shear_speed() -> None:
    sec = beams.rectangular_section(0.05, 0.01)
    g = E_ST / (2 * (1 + NU_ST))
    c_t = beams.torsion_speed(g, sec.torsion_constant, RHO_ST, sec.polar_moment)
    assert c_t < np.sqrt(g / RHO_ST)


# ---------------------------------------------------------------------------------------
# resonator
# ---------------------------------------------------------------------------------------
def test_resonator_natural_frequency() -> None:
    # independent: eigenvalue of the 1-DOF system K x = omega^2 M x via numpy.linalg
    m, k = 2.5, 4.0e6
    w2 = np.linalg.eigvals(np.array([[k / m]]))[0]
    assert resonators.resonator_natural_frequency(m, k) == pytest.approx(np.sqrt(w2) / (2 * np.pi))


def test_resonator_sharp_modal_density_holds_one_mode() -> None:
    fm, lo, hi = third_octave_bands(20, 30)
    n = resonators.resonator_modal_density(lo, hi, 333.0)
    assert np.sum(n * (hi - lo)) == pytest.approx(1.0)
    assert np.count_nonzero(n) == 1
    assert lo[n > 0][0] <= 333.0 < hi[n > 0][0]


def test_resonator_lorentzian_fraction_vs_numerical_response_integral() -> None:
    # independent: band integral of the mean-square velocity of a viscously damped SDOF
    # under a white force spectrum, |Y|^2 = w^2 / ((k - m w^2)^2 + (c w)^2), normalised
    # by its integral over all frequencies; c = eta sqrt(k m) gives loss factor eta at f0.
    m, k, eta = 1.0, (2 * np.pi * 500.0) ** 2, 0.02
    f0 = float(resonators.resonator_natural_frequency(m, k))
    c = eta * np.sqrt(k * m)

    def y2(f: float) -> float:
        w = 2 * np.pi * f
        return w**2 / ((k - m * w**2) ** 2 + (c * w) ** 2)

    total = integrate.quad(y2, 0, np.inf, points=None, limit=500)[0]
    fm, lo, hi = third_octave_bands(25, 29)  # 316 ... 794 Hz; f0 in the 500 Hz band
    for x, y in zip(lo, hi, strict=True):
        num = integrate.quad(y2, x, y, points=[f0] if x < f0 < y else None, limit=200)[0] / total
        frac = float(resonators.resonator_band_fraction(x, y, f0, eta))
        assert frac == pytest.approx(num, abs=0.01, rel=0.2)
    # adjacent bands: smooth option sums to (almost) one mode
    fm, lo, hi = third_octave_bands(10, 40)
    n = resonators.resonator_modal_density(lo, hi, f0, loss_factor=eta)
    # missing Lorentzian tails outside 10 Hz ... 10 kHz: (eta f0 / 2 pi) (1/490 + 1/9500)
    assert np.sum(n * (hi - lo)) == pytest.approx(1.0, abs=4e-3)
    assert np.sum(n * (hi - lo)) < 1.0


def test_resonator_smooth_option_continuous_at_band_edge() -> None:
    # f0 just below / above a band edge: sharp option jumps, smooth option does not
    lo, hi = 891.25, 1122.0
    n_lo = resonators.resonator_modal_density(lo, hi, lo * (1 - 1e-6), loss_factor=0.05)
    n_hi = resonators.resonator_modal_density(lo, hi, lo * (1 + 1e-6), loss_factor=0.05)
    assert n_lo == pytest.approx(n_hi, rel=1e-4)
    assert resonators.resonator_modal_density(lo, hi, lo * (1 - 1e-6)) == 0.0


# ---------------------------------------------------------------------------------------
# invalid input
# ---------------------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: plates.bending_stiffness(210e9, -1e-3, 0.3), "thickness"),
        (lambda: plates.bending_stiffness(210e9, 1e-3, 0.6), "poisson_ratio"),
        (lambda: plates.plate_bending_modal_density(-1.0, 1.0, 1.0, 1.0), "f"),
        (lambda: plates.plate_bending_modal_density(1.0, 0.0, 1.0, 1.0), "area"),
        (lambda: beams.beam_bending_wavenumber(100.0, 1e9, 0.0, 1.0), "second_moment"),
        (lambda: beams.circular_section(0.01, 0.02), "inner_diameter"),
        (lambda: resonators.resonator_modal_density(200.0, 100.0, 150.0), "f_upper"),
    ],
)
def test_invalid_input_raises_value_error_naming_argument(call, name: str) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(ValueError, match=name):
        call()
