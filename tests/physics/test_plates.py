"""Tests of seatool.physics.plates against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate

from seatool.materials import load_materials
from seatool.physics import beams, elastic, plates, resonators

# steel: typical handbook values (Cremer, Heckl & Petersson 2005, Structure-Borne Sound, 3rd ed. Table 3.1; from memory)
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


@pytest.mark.consistency
def test_plate_modal_density_equivalent_forms() -> None:
    # Consistency: two algebraic forms of one formula; the independent check is the exact
    # count of simply supported plate modes
    # (test_plate_modal_density_vs_exact_simply_supported_count).
    # n = S sqrt(3)/(h c_L') = pi S f_c / c0^2 (Cremer, Heckl & Petersson 2005)
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
def test_plate_regression_values() -> None:
    # computed by hand outside the code (not published)
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
