"""Radiation efficiency of curved panels and cylinders (Szechenyi's statistical method).

Checks of :func:`seatool.physics.radiation_curved.radiation_efficiency_curved_panel`:

1. radius -> infinity gives the flat band value (Leppington et al. 1982, band-averaged);
2. far above the ring frequency the flat value is recovered;
3. an independent modal sum: exact natural frequencies of a simply supported (shear
   diaphragm) curved panel from the Donnell-Mushtari equations, Wallace's (1972) modal
   radiation efficiency of each resonant mode at its own frequency (numerical integral),
   equal-weight average over the modes of the band (SEA equipartition), over a small
   ensemble of panels;
4. the published qualitative result (Szechenyi 1971): below the ring frequency a curved
   panel radiates more than the flat panel of the same size.

Material data: aluminium E = 70 GPa, rho = 2700 kg/m^3, nu = 0.33 (the project's built-in
values, from memory of handbook tables); c0 = 343 m/s. The critical frequency is computed
here from its textbook definition f_c = c0^2/(2 pi) sqrt(m''/D).
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
import pytest

from seatool.physics import radiation as rad
from seatool.physics import radiation_curved, radiation_modal

C0 = 343.0
E_AL, RHO_AL, NU_AL = 70e9, 2700.0, 0.33
G10 = 10.0**0.3  # base-10 octave ratio, IEC 61260-1


def wall(h: float, e: float = E_AL, rho: float = RHO_AL, nu: float = NU_AL) -> tuple[float, float]:
    """Critical frequency f_c and quasi-longitudinal speed c_L' (textbook definitions)."""
    d = e * h**3 / (12.0 * (1.0 - nu**2))
    fc = C0**2 / (2.0 * math.pi) * math.sqrt(rho * h / d)
    return fc, math.sqrt(e / (rho * (1.0 - nu**2)))


def third_octaves(k_lo: int, k_hi: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Exact base-10 mid-band frequencies 10^(k/10) and band edges (IEC 61260-1)."""
    fm = 10.0 ** (np.arange(k_lo, k_hi + 1) / 10.0)
    return fm, fm * G10 ** (-1 / 6), fm * G10 ** (1 / 6)


# ------------------------------------------------------------------------------------------
# 1. flat limit
# ------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("h", "l1", "l2"), [(1.5e-3, 1.5, 1.0), (3e-3, 2.4, 2.9), (1e-3, 0.6, 1.8)]
)
def test_infinite_radius_reproduces_leppington_band(h, l1, l2):
    # Leppington, Broadbent & Heron (1982) band-averaged over frequency
    # (radiation_efficiency_band, itself checked against Wallace modal averages); bands from
    # far below to above coincidence; tolerance 2 % ("a few %"), 1 % away from the
    # coincidence band.
    fc, cl = wall(h)
    fm, lo, hi = third_octaves(17, 43)
    got = radiation_curved.radiation_efficiency_curved_panel(
        fm, l1, l2, fc, 1e7, longitudinal_speed=cl, poisson_ratio=NU_AL,
        f_lower=lo, f_upper=hi, c0=C0,
    )  # fmt: skip
    flat = rad.radiation_efficiency_band(fm, l1, l2, fc, f_lower=lo, f_upper=hi, c0=C0)
    np.testing.assert_allclose(got, flat, rtol=0.02)
    away = (hi < 0.8 * fc) | (lo > 1.25 * fc)
    np.testing.assert_allclose(got[away], flat[away], rtol=0.01)


def test_closed_cylinder_flat_limit_is_maidanik_edge_term_with_end_perimeter():
    # A closed cylinder has no straight edges along the axis: its edges are the two end
    # circles, perimeter P = 2 l2. Maidanik's (1962) edge-mode term (P lambda_c / S) g2 with
    # that perimeter is Leppington's formula times l2 / (l1 + l2) (Leppington's form is
    # Maidanik's edge term with P = 2 (l1 + l2)). Below coincidence, large radius.
    fc, cl = wall(1.5e-3)
    l1, l2 = 1.5, 1.0
    fm, lo, hi = third_octaves(20, 35)
    got = radiation_curved.radiation_efficiency_curved_panel(
        fm, l1, l2, fc, 1e7, longitudinal_speed=cl, poisson_ratio=NU_AL, closed=True,
        f_lower=lo, f_upper=hi, c0=C0,
    )  # fmt: skip
    edge = rad.radiation_efficiency_band(
        fm, l1, l2, fc, method="maidanik", corner_factor=0.0, f_lower=lo, f_upper=hi, c0=C0
    )
    np.testing.assert_allclose(got, edge * l2 / (l1 + l2), rtol=0.01)


# ------------------------------------------------------------------------------------------
# 2. far above the ring frequency
# ------------------------------------------------------------------------------------------


@pytest.mark.parametrize("closed", [False, True])
def test_far_above_ring_frequency_tends_to_flat_value(closed):
    # Szechenyi (1971): above the ring frequency the shell radiates like the flat panel.
    # Fuselage-like panel (R = 2 m, h = 1.5 mm, f_r = 429 Hz); bands from 4 f_r to below
    # coincidence (f_c = 8 kHz): within 3 % (open panel); 5 % for the closed cylinder, whose
    # only radiating edge class (modes with small k_y, near the axial direction) is the one the
    # membrane term acts on longest (4 % at 2 kHz in development). The flat reference for the
    # closed cylinder is the edge term of its two end circles (previous test).
    h, radius, l1, l2 = 1.5e-3, 2.0, 1.5, 1.0
    fc, cl = wall(h)
    f_r = cl / (2 * math.pi * radius)
    fm, lo, hi = third_octaves(33, 37)  # 2 ... 5 kHz
    assert lo[0] > 4 * f_r and hi[-1] < 0.8 * fc
    got = radiation_curved.radiation_efficiency_curved_panel(
        fm, l1, l2, fc, radius, longitudinal_speed=cl, poisson_ratio=NU_AL, closed=closed,
        f_lower=lo, f_upper=hi, c0=C0,
    )  # fmt: skip
    flat = rad.radiation_efficiency_band(fm, l1, l2, fc, f_lower=lo, f_upper=hi, c0=C0)
    if closed:
        flat = flat * l2 / (l1 + l2)
    np.testing.assert_allclose(got, flat, rtol=0.05 if closed else 0.03)


# ------------------------------------------------------------------------------------------
# 3. independent modal reference: Donnell-Mushtari modes, Wallace modal sigma
# ------------------------------------------------------------------------------------------

H_P, R_P = 1.5e-3, 2.0  # aluminium fuselage-like skin: f_r = 429 Hz, f_m = 405 Hz, f_c = 8 kHz
# deterministic ensemble of developed panel sizes around 1.5 m x 1.0 m (axial x arc)
PANELS = [(1.5, 1.0)] + [(1.2 + 0.6 * x, 0.8 + 0.4 * y) for x, y in
          [(0.1, 0.7), (0.35, 0.2), (0.6, 0.9), (0.85, 0.4), (0.2, 0.45), (0.5, 0.05),
           (0.75, 0.6)]]  # fmt: skip


def donnell_panel_modes(
    lx: float, ly: float, mmax: int = 40, nmax: int = 30
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(m, n, f_mn) of the flexural modes of a shear-diaphragm curved panel.

    Donnell-Mushtari frequency matrix (Leissa 1973, Vibration of Shells, NASA SP-288, ch. 2,
    from memory; as in tests/physics/test_plates.py) for w ~ sin(m pi x/lx) sin(n pi y/ly)
    on all four edges: lambda = m pi a/lx, circumferential parameter n pi a/ly,
    k = h^2/(12 a^2); the lowest eigenvalue Omega^2 = rho (1 - nu^2) a^2 omega^2 / E is the
    flexural mode.
    """
    a, nu = R_P, NU_AL
    m = np.arange(1, mmax + 1)[:, None] * np.ones((1, nmax))
    n = np.ones((mmax, 1)) * np.arange(1, nmax + 1)[None, :]
    lam, ne = m * np.pi * a / lx, n * np.pi * a / ly
    kk = H_P**2 / (12 * a**2)
    mat = np.zeros((*lam.shape, 3, 3))
    mat[..., 0, 0] = lam**2 + (1 - nu) / 2 * ne**2
    mat[..., 0, 1] = mat[..., 1, 0] = (1 + nu) / 2 * lam * ne
    mat[..., 0, 2] = mat[..., 2, 0] = nu * lam
    mat[..., 1, 1] = (1 - nu) / 2 * lam**2 + ne**2
    mat[..., 1, 2] = mat[..., 2, 1] = ne
    mat[..., 2, 2] = 1 + kk * (lam**2 + ne**2) ** 2
    om2 = np.linalg.eigvalsh(mat)[..., 0]
    _, cl = wall(H_P)
    f = np.sqrt(om2) * cl / (2 * np.pi * a)
    return m.ravel().astype(int), n.ravel().astype(int), f.ravel()


def modal_reference(f_mid: float) -> tuple[float, float, float, int]:
    """Ensemble means of modal/statistical, modal/flat and the smallest mode count."""
    fc, cl = wall(H_P)
    lo, hi = f_mid * G10 ** (-1 / 6), f_mid * G10 ** (1 / 6)
    to_stat, to_flat, counts = [], [], []
    for lx, ly in PANELS:
        mm, nn, ff = donnell_panel_modes(lx, ly)
        sel = (ff >= lo) & (ff < hi)
        modal = np.mean([radiation_modal.modal_radiation_efficiency_wallace(f, i, j, lx, ly, c0=C0)
                         for i, j, f in zip(mm[sel], nn[sel], ff[sel], strict=True)])  # fmt: skip
        stat = radiation_curved.radiation_efficiency_curved_panel(
            f_mid, lx, ly, fc, R_P, longitudinal_speed=cl, poisson_ratio=NU_AL,
            f_lower=lo, f_upper=hi, c0=C0,
        )  # fmt: skip
        flat = rad.radiation_efficiency_band(f_mid, lx, ly, fc, f_lower=lo, f_upper=hi, c0=C0)
        to_stat.append(modal / float(stat))
        to_flat.append(modal / float(flat))
        counts.append(int(sel.sum()))
    return float(np.mean(to_stat)), float(np.mean(to_flat)), float(np.min(to_flat)), min(counts)


@pytest.mark.parametrize("f_mid", [199.53, 251.19, 316.23])
def test_below_ring_frequency_against_donnell_wallace_modal_average(f_mid):
    # Bands wholly below f_m = 405 Hz with >= 7 modes per panel. The ensemble mean of
    # modal/statistical was 0.93, 2.46, 1.52 in development (0.74, 2.11, 1.25 with the
    # continuous count, lattice=False) (a few low-order modes such as
    # (2,1), (3,1) with sigma ~ 1 dominate a band mean and fall in or out of a band; single
    # panels scatter from 0.1 to 6). Tolerance: a factor 2.5 on the ensemble mean.
    to_stat, to_flat, _, count = modal_reference(f_mid)
    assert count >= 7
    assert 1 / 2.5 < to_stat < 2.5
    # the curvature effect itself, from the independent reference: the modal average of the
    # curved panel is many times the flat-panel band value (check 4, modal side; 5.7, 23,
    # 19 in development)
    assert to_flat > 3.0


def test_band_containing_membrane_frequency_within_3_db_of_modal_average():
    # The band that contains f_m (355-447 Hz): the band region of the wavenumber plane runs
    # along the axial axis there, and the strip next to it holds no mode of the lattice
    # (first lattice cell, counted with the bending share of each mode's frequency, see
    # radiation_efficiency_curved_panel). Goal: within 3 dB of the modal average.
    # modal/statistical 0.70 in development (+1.6 dB); 0.48 (+3.2 dB) when only fast modes
    # left the strip, 0.28 with the continuous count. The modal average is still above the
    # flat value (5.5 times).
    to_stat, to_flat, _, count = modal_reference(398.11)
    assert count >= 25
    assert 10 ** (-0.3) < to_stat < 10**0.3
    assert to_flat > 2.0


def test_no_step_across_the_membrane_frequency_that_the_modal_average_lacks():
    # Ensemble-mean band values (equal weight over the 8 panels) from the band below f_m to
    # two bands above it. The modal average falls in every band (-4.9, -4.7, -0.5 dB in
    # development). The statistical value must fall too (no flat part followed by a cliff:
    # +0.1, -7.8 dB before the strip correction) and stay within 2.5 dB of the modal
    # average in each band (largest 1.9 dB, in the 316 Hz band; 3.2 dB in the f_m band
    # before).
    fc, cl = wall(H_P)
    modal, stat = [], []
    for f_mid in (316.23, 398.11, 501.19, 630.96):
        lo, hi = f_mid * G10 ** (-1 / 6), f_mid * G10 ** (1 / 6)
        m_p, s_p = [], []
        for lx, ly in PANELS:
            mm, nn, ff = donnell_panel_modes(lx, ly)
            sel = (ff >= lo) & (ff < hi)
            m_p.append(np.mean([radiation_modal.modal_radiation_efficiency_wallace(f, i, j, lx, ly, c0=C0)
                                for i, j, f in zip(mm[sel], nn[sel], ff[sel], strict=True)]))  # fmt: skip
            s_p.append(float(radiation_curved.radiation_efficiency_curved_panel(
                f_mid, lx, ly, fc, R_P, longitudinal_speed=cl, poisson_ratio=NU_AL,
                f_lower=lo, f_upper=hi, c0=C0,
            )))  # fmt: skip
        modal.append(10 * math.log10(np.mean(m_p)))
        stat.append(10 * math.log10(np.mean(s_p)))
    assert np.all(np.diff(modal) < 0.0)
    assert np.all(np.diff(stat) < 0.0)
    np.testing.assert_allclose(stat, modal, atol=2.5)


@pytest.mark.parametrize("f_mid", [501.19, 630.96])
def test_above_membrane_frequency_against_donnell_wallace_modal_average(f_mid):
    # Above f_m the count is dense (>= 30 modes per panel); ensemble mean within 10 %
    # (1.04, 1.05 in development; 0.97, 1.02 before the strip correction of slow modes).
    to_stat, _, _, count = modal_reference(f_mid)
    assert count >= 30
    assert to_stat == pytest.approx(1.0, abs=0.10)


def test_edge_mode_class_value_against_wallace_for_lattice_modes():
    # The modal edge-mode expression (derived here from the wavenumber transform of a
    # simply supported mode) against Wallace's numerical modal integral, for the edge-class
    # modes (k_p > k, k_x < k or k_y < k) of the 1.5 m x 1.0 m panel between 300 and 450 Hz.
    # Tolerance: geometric mean of Wallace/formula within 25 %, each mode within a factor 2
    # (modal values of low-order modes fluctuate with the mode parity).
    lx, ly = PANELS[0]
    mm, nn, ff = donnell_panel_modes(lx, ly)
    ratios = []
    for i, j, f in zip(mm, nn, ff, strict=True):
        if not 300.0 <= f < 450.0:
            continue
        kx, ky, k = i * np.pi / lx, j * np.pi / ly, 2 * np.pi * f / C0
        if kx**2 + ky**2 <= k**2 or (kx >= k and ky >= k):
            continue
        short, long_ = min(lx, ly), max(lx, ly)
        cap = (0.5 - 0.15 * short / long_) * math.sqrt(k * short)
        s = np.array(kx**2 + ky**2)
        formula = radiation_curved._mode_class_sigma(
            s, np.array(kx**2 / s), np.array(k), np.array(lx), np.array(ly), np.array(cap), False
        )
        ratios.append(radiation_modal.modal_radiation_efficiency_wallace(f, int(i), int(j), lx, ly, c0=C0)
                      / float(formula))  # fmt: skip
    assert len(ratios) >= 10
    r = np.array(ratios)
    assert math.exp(np.mean(np.log(r))) == pytest.approx(1.0, abs=0.25)
    assert np.all((r > 0.5) & (r < 2.0))


# ------------------------------------------------------------------------------------------
# 4. qualitative result and interface
# ------------------------------------------------------------------------------------------


@pytest.mark.parametrize("closed", [False, True])
def test_curved_radiates_more_than_flat_below_ring_frequency(closed):
    # Szechenyi (1971): below the ring frequency membrane stiffening makes modes acoustically
    # fast, so the cylinder radiates more than the flat panel; the effect fades above f_r.
    h, radius, l1, l2 = 1.5e-3, 2.0, 1.5, 1.0
    fc, cl = wall(h)
    f_r = cl / (2 * math.pi * radius)
    fm, lo, hi = third_octaves(17, 39)
    curved = radiation_curved.radiation_efficiency_curved_panel(
        fm, l1, l2, fc, radius, longitudinal_speed=cl, poisson_ratio=NU_AL, closed=closed,
        f_lower=lo, f_upper=hi, c0=C0,
    )  # fmt: skip
    flat = radiation_curved.radiation_efficiency_curved_panel(
        fm, l1, l2, fc, 1e7, longitudinal_speed=cl, poisson_ratio=NU_AL, closed=closed,
        f_lower=lo, f_upper=hi, c0=C0,
    )  # fmt: skip
    ratio = curved / flat
    # An acoustically fast mode needs k > k_x >= pi/l1 (the first axial mode of the
    # supported ends): in lower bands (below 100 Hz here) a closed cylinder has none, and
    # the first cell of the mode lattice (Xie, Thompson & Jones 2004) is left empty.
    fast_possible = 2 * math.pi * fm / C0 > math.pi / l1
    below = (hi < f_r) & fast_possible
    assert np.all(ratio[below] > 2.0)
    far = lo > 4 * f_r
    assert np.all(np.abs(ratio[far] - 1.0) < (0.05 if closed else 0.03))
    assert np.all(ratio[fast_possible] >= 0.99)


def test_broadcasting_and_default_band_edges():
    fc, cl = wall(1.5e-3)
    f = np.array([[200.0, 400.0], [800.0, 1600.0]])
    got = radiation_curved.radiation_efficiency_curved_panel(
        f, 1.5, 1.0, fc, 2.0, longitudinal_speed=cl
    )
    assert got.shape == f.shape
    lo, hi = f * G10 ** (-1 / 6), f * G10 ** (1 / 6)
    explicit = radiation_curved.radiation_efficiency_curved_panel(
        f, 1.5, 1.0, fc, 2.0, longitudinal_speed=cl, f_lower=lo, f_upper=hi
    )
    np.testing.assert_allclose(got, explicit, rtol=1e-12)
    radii = np.array([1.0, 2.0, 4.0])
    per_radius = radiation_curved.radiation_efficiency_curved_panel(
        300.0, 1.5, 1.0, fc, radii, longitudinal_speed=cl
    )
    single = [float(radiation_curved.radiation_efficiency_curved_panel(300.0, 1.5, 1.0, fc, r,
                                                          longitudinal_speed=cl))
              for r in radii]  # fmt: skip
    np.testing.assert_allclose(per_radius, single, rtol=1e-12)
    assert (
        np.ndim(
            radiation_curved.radiation_efficiency_curved_panel(
                300.0, 1.5, 1.0, fc, 2.0, longitudinal_speed=cl
            )
        )
        == 0
    )


def test_quadrature_converged():
    # default node counts against four times as many (band containing f_m, the hardest)
    fc, cl = wall(1.5e-3)
    fm, lo, hi = third_octaves(20, 30)
    kw: dict[str, Any] = {
        "longitudinal_speed": cl,
        "poisson_ratio": NU_AL,
        "f_lower": lo,
        "f_upper": hi,
    }
    got = radiation_curved.radiation_efficiency_curved_panel(fm, 1.5, 1.0, fc, 2.0, **kw)
    fine = radiation_curved.radiation_efficiency_curved_panel(
        fm, 1.5, 1.0, fc, 2.0, n_angle=96, n_wavenumber=48, **kw
    )
    np.testing.assert_allclose(got, fine, rtol=0.01)


@pytest.mark.parametrize(
    ("kwargs", "name"),
    [
        ({"radius": 0.0}, "radius"),
        ({"longitudinal_speed": -1.0}, "longitudinal_speed"),
        ({"poisson_ratio": 0.5}, "poisson_ratio"),
        ({"l2": 0.0}, "l2"),
        ({"f_lower": 300.0, "f_upper": 200.0}, "f_upper"),
        ({"n_angle": 1}, "n_angle"),
    ],
)
def test_invalid_input_raises_value_error_naming_argument(kwargs, name):
    args = {"f": 250.0, "l1": 1.5, "l2": 1.0, "f_c": 8000.0, "radius": 2.0,
            "longitudinal_speed": 5400.0} | kwargs  # fmt: skip
    with pytest.raises(ValueError, match=name):
        radiation_curved.radiation_efficiency_curved_panel(**args)
