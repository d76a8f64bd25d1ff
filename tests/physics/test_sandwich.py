"""Tests of seatool.physics.sandwich against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate, optimize

from seatool.physics import plates, sandwich


def third_octave_bands(k_lo: int, k_hi: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Exact base-10 1/3-octave mid-band frequencies 10^(k/10) and edges (IEC 61260-1)."""
    k = np.arange(k_lo, k_hi + 1)
    fm = 10.0 ** (k / 10.0)
    return fm, fm * 10.0**-0.05, fm * 10.0**0.05


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
    counted = np.array(
        [np.count_nonzero((fmodes >= x) & (fmodes < y)) for x, y in zip(lo, hi, strict=True)]
    )
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


def test_sandwich_critical_frequency_is_where_the_phase_speed_is_c0() -> None:
    # Independent numerical method: the root of sandwich_phase_speed(f) = c0 found by
    # scipy.optimize.brentq on ln f (the phase speed rises monotonically), to 1e-9.
    for sec in (SANDWICH, sandwich.sandwich_section(210e9, 0.3, 0.5e-3, 7850.0, 5e6, 40e-3, 30.0)):
        for c0 in (343.0, 1480.0):
            root = optimize.brentq(
                lambda x, s=sec, c=c0: float(sandwich.sandwich_phase_speed(np.exp(x), s)) - c,
                np.log(1e-3),
                np.log(1e9),
                xtol=1e-13,
            )
            got = sandwich.sandwich_critical_frequency(sec, c0)
            assert got == pytest.approx(float(np.exp(root)), rel=1e-9)


def test_sandwich_critical_frequency_limits() -> None:
    # Textbook plate critical frequency f_c = c0^2/(2 pi) sqrt(m''/D) (Cremer, Heckl &
    # Petersson 2005, ch. 3; plates.critical_frequency): of the whole section with a rigid
    # core in shear, of the faces alone with no sandwich (parallel-axis) stiffness.
    sec = SANDWICH
    m = sec.surface_density
    rigid = sandwich.SandwichSection(
        sec.face_bending_stiffness, sec.sandwich_bending_stiffness, 1e20, m
    )
    assert sandwich.sandwich_critical_frequency(rigid, 343.0) == pytest.approx(
        float(plates.critical_frequency(sec.total_bending_stiffness, m, 343.0)), rel=1e-9
    )
    faces = sandwich.SandwichSection(sec.face_bending_stiffness, 1e-12, sec.shear_stiffness, m)
    assert sandwich.sandwich_critical_frequency(faces, 343.0) == pytest.approx(
        float(plates.critical_frequency(sec.face_bending_stiffness, m, 343.0)), rel=1e-6
    )
