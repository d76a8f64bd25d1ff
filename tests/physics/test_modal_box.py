"""Tests of seatool.physics.modal_box and modal_coupled (modes, coupling integrals, solver)."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate

from seatool.physics import acoustic as ac
from seatool.physics import modal_box as mb
from seatool.physics import modal_coupled as mc


def test_square_plate_frequency_parameters() -> None:
    # Leissa (1969), Vibration of Plates, NASA SP-160, table for the SSSS square plate:
    # lambda = omega a^2 sqrt(rho h / D) = 19.739 (1,1), 49.348 (1,2), 78.957 (2,2)
    # (= 2 pi^2, 5 pi^2, 8 pi^2; from memory).
    a, d, m = 0.7, 95.0, 5.4
    modes = mb.plate_modes(a, a, d, m, f_max=400.0)
    lam = 2 * np.pi * modes.frequency * a**2 * np.sqrt(m / d)
    assert lam[0] == pytest.approx(19.739, abs=2e-3)
    assert lam[1] == pytest.approx(49.348, abs=2e-3)
    assert lam[2] == pytest.approx(49.348, abs=2e-3)
    assert lam[3] == pytest.approx(78.957, abs=2e-3)
    assert modes.modal_mass == pytest.approx(m * a * a / 4)


def test_plate_mode_count_follows_asymptotic_density() -> None:
    # Asymptotic mode count of a thin plate N(f) = S f sqrt(m''/D) / 2 minus the edge
    # correction for simply supported edges, P sqrt(f)/(2 sqrt(2 pi)) (m''/D)^(1/4)
    # (Cremer, Heckl & Petersson 2005, Structure-Borne Sound, ch. 7; Bolotin's edge term,
    # from memory). Tolerance 3 %.
    a, b, d, m, f = 1.1, 0.8, 40.0, 7.8, 3000.0
    n = len(mb.plate_modes(a, b, d, m, f))
    k = np.sqrt(2 * np.pi * f) * (m / d) ** 0.25
    expected = a * b * k**2 / (4 * np.pi) - 2 * (a + b) * k / (4 * np.pi)
    assert n == pytest.approx(expected, rel=0.03)


def test_cavity_mode_count_follows_morse_bolt() -> None:
    # Morse & Bolt (1944): N(f) = 4 pi f^3 V/(3 c^3) + pi f^2 S/(4 c^2) + f L/(8 c);
    # the exact count of a box fluctuates about it by a few percent at a few hundred modes.
    lx, ly, lz, c = 2.1, 1.6, 1.3, 343.0
    for f in (400.0, 700.0):
        modes = mb.cavity_modes(lx, ly, lz, c, f)
        v, s, ell = ac.rectangular_cavity_geometry(lx, ly, lz)
        expected = float(ac.cavity_mode_count(f, v, s, ell, c))
        assert len(modes) == pytest.approx(expected, rel=0.05)
    assert modes.frequency[0] == 0.0
    # first axial mode c / (2 lx)
    assert modes.frequency[1] == pytest.approx(c / (2 * lx))


def test_cavity_norm_by_quadrature() -> None:
    # Lambda = integral of psi^2 over the box, by numerical quadrature (independent method)
    dims = (1.2, 0.9, 0.7)
    modes = mb.cavity_modes(*dims, 343.0, 800.0)
    x = [np.polynomial.legendre.leggauss(24) for _ in range(3)]
    for n in (0, 1, 5, 17, 40):
        idx = modes.index[n]
        total = 1.0
        for ax in range(3):
            nodes, w = x[ax]
            s = 0.5 * dims[ax] * (nodes + 1)
            total *= 0.5 * dims[ax] * np.sum(w * np.cos(idx[ax] * np.pi * s / dims[ax]) ** 2)
        assert modes.norm[n] == pytest.approx(total, rel=1e-10)


@pytest.mark.parametrize(
    ("p", "a", "m", "length", "x0"),
    [(1, 0.5, 0, 1.3, 0.2), (3, 0.5, 2, 1.3, 0.4), (2, 0.4, 3, 0.8, 0.0), (4, 1.0, 4, 1.0, 0.0),
     (5, 0.3, 7, 1.1, 0.55), (1, 0.6, 1, 1.2, 0.3)],
)
def test_sine_cosine_integral_by_quadrature(
    p: int, a: float, m: int, length: float, x0: float
) -> None:
    def integrand(s: float) -> float:
        return float(np.sin(p * np.pi * s / a) * np.cos(m * np.pi * (x0 + s) / length))

    ref, _ = integrate.quad(integrand, 0.0, a, epsabs=1e-13, limit=200)
    assert mb.sine_cosine_integral(p, a, m, length, x0) == pytest.approx(ref, abs=1e-12)


def test_full_face_integral_matches_dowell_closed_form() -> None:
    # Dowell, Gorman & Smith (1977): panel filling the side, integral of
    # sin(p pi x/a) cos(m pi x/a) = a p [1 - (-1)^(p+m)] / (pi (p^2 - m^2)), 0 for p = m.
    a = 0.9
    for p in range(1, 6):
        for m in range(0, 7):
            ref = 0.0 if p == m else a * p * (1 - (-1) ** (p + m)) / (np.pi * (p * p - m * m))
            assert mb.sine_cosine_integral(p, a, m, a, 0.0) == pytest.approx(ref, abs=1e-13)


def test_coupling_matrix_by_surface_quadrature() -> None:
    dims = (1.0, 0.8, 0.6)
    cav = mb.cavity_modes(*dims, 343.0, 900.0)
    plate = mb.plate_modes(0.5, 0.3, 30.0, 5.0, 900.0)
    nodes, w = np.polynomial.legendre.leggauss(40)
    for face, off in (("z0", (0.2, 0.3)), ("x1", (0.1, 0.2)), ("y1", (0.4, 0.15))):
        c = mb.coupling_matrix(plate, cav, face, off)
        u, v, n_ax, far = mb.face_axes(face)
        su = off[0] + 0.5 * plate.a * (nodes + 1)
        sv = off[1] + 0.5 * plate.b * (nodes + 1)
        uu, vv = np.meshgrid(su, sv, indexing="ij")
        ww = np.outer(w, w) * 0.25 * plate.a * plate.b
        for n in (0, 3, 11, 29, 59):
            for k in (0, 2, 7):
                pt = np.zeros((3,) + uu.shape)
                pt[u], pt[v] = uu, vv
                pt[n_ax] = dims[n_ax] if far else 0.0
                psi = np.prod(
                    [np.cos(cav.index[n, i] * np.pi * pt[i] / dims[i]) for i in range(3)], axis=0
                )
                phi = np.sin(plate.p[k] * np.pi * (uu - off[0]) / plate.a) * np.sin(
                    plate.q[k] * np.pi * (vv - off[1]) / plate.b
                )
                assert c[n, k] == pytest.approx(np.sum(ww * psi * phi), abs=1e-10)


def test_sine_exponential_integral_by_quadrature() -> None:
    a = 0.45
    for p in (1, 2, 5):
        for k in (0.0, 3.0, p * np.pi / a, -p * np.pi / a, 20.0):
            re, _ = integrate.quad(lambda s, p=p, k=k: np.sin(p * np.pi * s / a) * np.cos(k * s), 0, a)
            im, _ = integrate.quad(lambda s, p=p, k=k: -np.sin(p * np.pi * s / a) * np.sin(k * s), 0, a)
            got = complex(mb.sine_exponential_integral(p, a, k))
            assert got == pytest.approx(complex(re, im), abs=1e-12)


def test_diffuse_directions_cover_the_half_space_uniformly() -> None:
    # uniform over the solid angle of a half space: <cos theta> = 1/2, <cos^2 theta> = 1/3
    d, w = mb.diffuse_field_directions(8, 16)
    assert w.sum() == pytest.approx(1.0)
    assert np.sum(w * np.cos(d[:, 0])) == pytest.approx(0.5, rel=1e-12)
    assert np.sum(w * np.cos(d[:, 0]) ** 2) == pytest.approx(1 / 3, rel=1e-12)
    assert np.sum(w * np.sin(d[:, 0]) ** 2 * np.cos(d[:, 1]) ** 2) == pytest.approx(1 / 3)


def test_bad_face_and_points_are_refused() -> None:
    with pytest.raises(ValueError, match="face must be one of"):
        mb.face_axes("z2")
    cav = mb.cavity_modes(1.0, 1.0, 1.0, 343.0, 200.0)
    with pytest.raises(ValueError, match="inside the box"):
        mb.cavity_mode_shape(cav, (0.5, 0.5, 1.5))
    with pytest.raises(ValueError, match="does not fit"):
        mb.sine_cosine_integral(1, 0.6, 1, 1.0, 0.5)


def test_reduced_solves_agree_with_the_full_system() -> None:
    # The two eliminations are exact rearrangements: compare with the full (K + N) solve.
    rng = np.random.default_rng(3)
    cav = mb.cavity_modes(1.0, 0.8, 0.6, 343.0, 700.0)
    plate = mb.plate_modes(0.6, 0.5, 20.0, 5.4, 900.0)
    c = mb.coupling_matrix(plate, cav, "z0", (0.2, 0.15))
    w = 2 * np.pi * np.linspace(20.0, 500.0, 37)
    z = mc.modal_impedance(w, plate.frequency, plate.modal_mass, 0.01)
    y = mc.cavity_modal_admittance_term(w, cav.frequency, cav.norm, 0.02, density=1.2,
                                        sound_speed=343.0)  # fmt: skip
    f = rng.standard_normal((len(plate), 2))
    q = rng.standard_normal((len(cav), 2)) * 1e-3
    v0, p0 = mc.solve_coupled_full(z, y, c, f, q)
    for keep in ("structure", "cavity"):
        v, p = mc.solve_coupled(z, y, c, f, q, keep=keep)  # type: ignore[arg-type]
        np.testing.assert_allclose(v, v0, rtol=1e-8, atol=1e-12 * np.abs(v0).max())
        np.testing.assert_allclose(p, p0, rtol=1e-8, atol=1e-12 * np.abs(p0).max())


def test_band_lines_resolve_the_narrowest_peak() -> None:
    f, w, b = mc.band_lines(np.array([89.1, 112.2]), np.array([112.2, 141.3]), 0.01)
    assert np.diff(f[b == 0]).max() <= 0.01 * 89.1 / 4 + 1e-12
    np.testing.assert_allclose(mc.line_average(np.ones_like(f), w, b, 2), 1.0)
