"""Built-up variance of a plate radiating into a cavity against a random-matrix Monte Carlo.

Both subsystems have random natural frequencies (Gaussian orthogonal ensemble, unfolded to
the stated mean spacing) and random mode shapes. With random mode shapes, the coupling
coefficient of plate mode j and cavity mode k (the overlap integral of the two shapes over
the plate surface) is taken as a zero-mean Gaussian variable, independent between pairs
of modes (a sum over many uncorrelated wavelength-sized patches; common practice in
random-matrix models of coupled systems). The plate is driven by a unit
point force (Gaussian mode shape at the drive point). The tests compute the coupled modal
response themselves, solve per frequency line, average the energies over the band and
compare the ensemble relative variances with :func:`seatool.analysis.confidence.
relative_variances` for the same model with SEA loss factors fitted to the ensemble means.
"""

from __future__ import annotations

import numpy as np
from scipy.linalg import eigvalsh_tridiagonal

from seatool.analysis.confidence import relative_variances
from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem


def _goe(rng: np.random.Generator, half: float, size: int = 200) -> np.ndarray:
    """GOE eigenvalues (Dumitriu & Edelman 2002 tridiagonal model, beta = 1) unfolded to
    unit mean spacing with the Wigner semicircle, centred, within +-half."""
    radius = np.sqrt(2.0 * size)
    diag = rng.normal(0.0, 1.0, size)
    off = np.sqrt(rng.chisquare(np.arange(size - 1, 0, -1))) / np.sqrt(2.0)
    lam = np.clip(eigvalsh_tridiagonal(diag, off) / radius, -1.0, 1.0)
    u = size * (lam * np.sqrt(1.0 - lam**2) + np.arcsin(lam)) / np.pi
    return u[np.abs(u) <= half]


def plate_cavity_monte_carlo(
    draws: int,
    seed: int,
    *,
    overlap: tuple[float, float] = (1.0, 1.0),
    modes: tuple[float, float] = (6.0, 10.0),
    coupling: float = 0.002,
    pad: float = 15.0,
) -> dict[str, np.ndarray]:
    """Band energies of a point-driven plate (1) coupled over its surface to a cavity (2).

    Mass-normalised modal equations with viscous-type damping and a stiffness-type
    coupling matrix ``coupling * omega_c^2 * G`` (G with independent standard normal
    entries); modes within ``pad`` mean spacings of the band are kept. The band is 2 % of
    the 1 kHz centre wide, sampled at a third of the half-power bandwidth. Per frequency
    the cavity is eliminated exactly (its block is diagonal): (D1 - C D2^-1 C^T) q1 = phi,
    q2 = -D2^-1 C^T q1.
    """
    rng = np.random.default_rng(seed)
    wc = 2 * np.pi * 1000.0
    dw = 0.02 * wc
    d1, d2 = dw / modes[0], dw / modes[1]
    eta1, eta2 = overlap[0] * d1 / wc, overlap[1] * d2 / wc
    half_bw = min(overlap[0] * d1, overlap[1] * d2) / 2
    w = np.linspace(wc - dw / 2, wc + dw / 2, int(np.ceil(3 * dw / half_bw)))
    e1, e2, p_in = np.empty(draws), np.empty(draws), np.empty(draws)
    for t in range(draws):
        w1 = wc + d1 * _goe(rng, modes[0] / 2 + pad)
        w2 = wc + d2 * _goe(rng, modes[1] / 2 + pad)
        phi = rng.standard_normal(w1.size)
        c = rng.standard_normal((w1.size, w2.size)) * coupling * wc**2
        den1 = w1**2 - w[:, None] ** 2 + 1j * eta1 * w[:, None] * w1
        den2 = w2**2 - w[:, None] ** 2 + 1j * eta2 * w[:, None] * w2
        schur = -(c[None] / den2[:, None, :]) @ c.T
        schur[:, np.arange(w1.size), np.arange(w1.size)] += den1
        rhs = np.broadcast_to(phi, (w.size, w1.size))[..., None]
        q1 = np.linalg.solve(schur, rhs)[..., 0]
        q2 = -(q1 @ c) / den2
        e1[t] = np.mean(0.5 * w**2 * (np.abs(q1) ** 2).sum(1))
        e2[t] = np.mean(0.5 * w**2 * (np.abs(q2) ** 2).sum(1))
        p_in[t] = np.mean(0.5 * np.real(1j * w * (phi * q1).sum(1)))
    return {
        "E1": e1,
        "E2": e2,
        "P": p_in,
        "eta": np.array([eta1, eta2]),
        "n": np.array([1 / d1, 1 / d2]) * 2 * np.pi,
        "wc": np.array(wc),
        "dw": np.array(dw),
    }


def rel_var(x: np.ndarray) -> tuple[float, float]:
    """Relative variance and its delta-method standard error over independent draws."""
    mu1, mu2 = x.mean(), (x**2).mean()
    grad = np.array([-2 * mu2 / mu1**3, 1 / mu1**2])
    cov = np.cov(np.vstack([x, x**2])) / x.size
    return float(mu2 / mu1**2 - 1), float(np.sqrt(grad @ cov @ grad))


def predicted(mc: dict[str, np.ndarray], kind: str) -> tuple[np.ndarray, float, float]:
    """relative_variances of the two-subsystem SEA model fitted to the ensemble means:
    (r^2 of plate and cavity, eta_12 / eta_1, relative misfit of the plate's balance)."""
    e1, e2, p = mc["E1"].mean(), mc["E2"].mean(), mc["P"].mean()
    n1, n2 = mc["n"]
    eta1, eta2 = mc["eta"]
    eta12 = eta2 * e2 / (e1 - n1 * e2 / n2)  # cavity balance with reciprocity
    w = float(mc["wc"])
    misfit = p / (w * (eta1 + eta12) * e1 - w * eta12 * n1 / n2 * e2) - 1.0
    bands = BandAxis.from_range(1000, 1000)
    s = float(mc["dw"]) / (2 * np.pi) / bands.width[0]  # same modes in band and overlap
    model = Model(
        bands,
        (
            Subsystem("plate", "structure", np.array([n1 * s]), np.array([eta1 / s])),
            Subsystem("cavity", "structure", np.array([n2 * s]), np.array([eta2 / s])),
        ),
        (Connection("radiation", "plate", "cavity", np.array([eta12 / s]), kind=kind),),
        (Excitation("force", "plate", "power", power=np.array([p / s])),),
    )
    return relative_variances(model, np.array([[e1], [e2]]))[:, 0], eta12 / eta1, misfit


def test_plate_cavity_variance_vs_monte_carlo() -> None:
    mc = plate_cavity_monte_carlo(300, 7)
    pred, ratio, misfit = predicted(mc, "radiation")
    assert abs(misfit) < 0.01  # SEA holds for the ensemble means (power balance of the plate)
    assert 0.3 < ratio < 3.0  # coupling comparable to damping: the case of interest
    r1, se1 = rel_var(mc["E1"])
    r2, se2 = rel_var(mc["E2"])
    assert se1 < 0.2 * r1 and se2 < 0.2 * r2  # the Monte Carlo resolves the variances
    # Monte Carlo 0.240 +- 0.022 (plate) and 0.208 +- 0.020 (cavity); predicted 0.202 and
    # 0.207. Tolerance: 3 delta-method standard errors (other seeds and overlaps:
    # docs/theory/variance.md, section 4, with the cases where the estimate is 20-30 % low)
    assert abs(pred[0] - r1) <= 3 * se1
    assert abs(pred[1] - r2) <= 3 * se2
    # the cavity's input is distributed: treated as a point junction it would be far off
    point, _, _ = predicted(mc, "point")
    assert point[1] > r2 + 10 * se2
