"""Confidence bands of a solved model: the built-up variance against a random-matrix Monte
Carlo of two point-coupled subsystems, single-subsystem consistency, and the table."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from scipy.linalg import eigvalsh_tridiagonal

import seatool
from seatool.analysis.confidence import column_name, confidence_bands, relative_variances
from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem
from seatool.physics.variance import relative_variance_band

MODELS = Path(__file__).resolve().parents[1] / "models"


def _goe(rng: np.random.Generator, size: int = 300, half: float = 80.0) -> np.ndarray:
    """GOE eigenvalues (Dumitriu & Edelman 2002 tridiagonal model, beta = 1) unfolded to
    unit mean spacing with the Wigner semicircle, centred, within +-half."""
    radius = np.sqrt(2.0 * size)
    diag = rng.normal(0.0, 1.0, size)
    off = np.sqrt(rng.chisquare(np.arange(size - 1, 0, -1))) / np.sqrt(2.0)
    lam = np.clip(eigvalsh_tridiagonal(diag, off) / radius, -1.0, 1.0)
    u = size * (lam * np.sqrt(1.0 - lam**2) + np.arcsin(lam)) / np.pi
    return u[np.abs(u) <= half]


def _coupled_monte_carlo(
    draws: int, seed: int, *, m: tuple[float, float], modes: tuple[float, float], spring: float
) -> dict[str, np.ndarray]:
    """Two random subsystems (GOE natural frequencies, Gaussian mass-normalised mode shapes)
    joined by a point spring, unit point force on subsystem 1. Receptances are modal sums
    with hysteretic damping; the spring force follows exactly from the two point
    receptances (a rank-one coupling). Band energies E = (omega^2 / 2) sum |q_j|^2 are
    averaged over a narrow band (2 % of the centre) holding ``modes`` natural frequencies
    of each subsystem, sampled at a third of the half-power bandwidth."""
    rng = np.random.default_rng(seed)
    wc = 2 * np.pi * 1000.0
    dw = 0.02 * wc
    d1, d2 = dw / modes[0], dw / modes[1]
    eta1, eta2 = m[0] * d1 / wc, m[1] * d2 / wc
    half_bw = min(m[0] * d1, m[1] * d2) / 2
    w = np.linspace(wc - dw / 2, wc + dw / 2, int(np.ceil(3 * dw / half_bw)))[:, None]
    e1, e2, p_in = np.empty(draws), np.empty(draws), np.empty(draws)
    for t in range(draws):
        w1, w2 = wc + d1 * _goe(rng), wc + d2 * _goe(rng)
        p0, pc1 = rng.standard_normal((2, w1.size))
        pc2 = rng.standard_normal(w2.size)
        den1 = w1**2 - w**2 + 1j * eta1 * w * w1
        den2 = w2**2 - w**2 + 1j * eta2 * w * w2
        g10 = (pc1 * p0 / den1).sum(1)
        fs = spring * g10 / (1 + spring * ((pc1**2 / den1).sum(1) + (pc2**2 / den2).sum(1)))
        q1 = (p0 - pc1 * fs[:, None]) / den1
        q2 = pc2 * fs[:, None] / den2
        u0 = (p0 * q1).sum(1)
        e1[t] = np.mean(0.5 * w[:, 0] ** 2 * (np.abs(q1) ** 2).sum(1))
        e2[t] = np.mean(0.5 * w[:, 0] ** 2 * (np.abs(q2) ** 2).sum(1))
        p_in[t] = np.mean(0.5 * np.real(1j * w[:, 0] * u0))
    return {
        "E1": e1,
        "E2": e2,
        "P": p_in,
        "eta": np.array([eta1, eta2]),
        "n": np.array([1 / d1, 1 / d2]) * 2 * np.pi,
        "wc": np.array(wc),
        "dw": np.array(dw),
    }


def _rel_var(x: np.ndarray) -> tuple[float, float]:
    """Relative variance and its delta-method standard error over independent draws."""
    mu1, mu2 = x.mean(), (x**2).mean()
    grad = np.array([-2 * mu2 / mu1**3, 1 / mu1**2])
    cov = np.cov(np.vstack([x, x**2])) / x.size
    return float(mu2 / mu1**2 - 1), float(np.sqrt(grad @ cov @ grad))


def test_built_up_variance_vs_coupled_monte_carlo() -> None:
    # Independent reference: the coupled random-matrix Monte Carlo above (300 draws).
    mc = _coupled_monte_carlo(300, 3, m=(1.0, 2.0), modes=(10.0, 20.0), spring=3e3)
    e1, e2, p = mc["E1"].mean(), mc["E2"].mean(), mc["P"].mean()
    n1, n2 = mc["n"]
    eta1, eta2 = mc["eta"]
    # SEA fitted to the ensemble means: eta_12 from subsystem 2's balance with reciprocity;
    # subsystem 1's balance must then hold with the measured input power (SEA itself)
    eta12 = eta2 * e2 / (e1 - n1 * e2 / n2)
    w = float(mc["wc"])
    assert p == pytest.approx(w * (eta1 + eta12) * e1 - w * eta12 * n1 / n2 * e2, rel=1e-2)
    # the same model on a one-band axis: scale n and eta so that modes in band and modal
    # overlap match (the propagation depends on ratios of loss factors only)
    bands = BandAxis.from_range(1000, 1000)
    s = float(mc["dw"]) / (2 * np.pi) / bands.width[0]
    model = Model(
        bands,
        (
            Subsystem("a", "structure", np.array([n1 * s]), np.array([eta1 / s])),
            Subsystem("b", "structure", np.array([n2 * s]), np.array([eta2 / s])),
        ),
        (Connection("c", "a", "b", np.array([eta12 / s]), kind="point"),),
        (Excitation("f", "a", "power", power=np.array([p / s])),),
    )
    pred = relative_variances(model, np.array([[e1], [e2]]))[:, 0]
    r1, se1 = _rel_var(mc["E1"])
    r2, se2 = _rel_var(mc["E2"])
    # directly driven subsystem: Monte Carlo 0.161 (standard error about 0.013),
    # predicted 0.162; tolerance 3 standard errors
    assert abs(pred[0] - r1) <= 3 * se1
    # driven through the point spring: Monte Carlo 0.62 (standard error about 0.06),
    # predicted 0.84. The Monte Carlo estimate is heavy-tailed: 400-draw runs of the same
    # case with seeds 101-103 gave 1.09 +- 0.27, 0.99 +- 0.09, 0.82 +- 0.16 (mean of the
    # four 0.88; docs/theory/variance.md); tolerance: a factor of 1.4 beyond 2 standard
    # errors. Without the junction-point term the prediction is 0.24, without the
    # product term 0.72.
    assert r2 / 1.4 - 2 * se2 <= pred[1] <= 1.4 * r2 + 2 * se2
    assert r2 > 2.0 * r1  # variance grows along the transmission path


def test_single_subsystem_is_the_band_formula() -> None:
    # one subsystem with a power input: the propagation must return the band formula
    bands = BandAxis.from_range(100, 1000)
    nb = len(bands)
    n, eta = np.full(nb, 0.05), np.full(nb, 0.02)
    model = Model(
        bands,
        (Subsystem("a", "structure", n, eta, quantity="velocity", mass=2.0),),
        (),
        (Excitation("f", "a", "power", power=np.ones(nb)),),
    )
    res = seatool.run(model)
    r2 = relative_variances(model, res.energy)[0]
    expect = relative_variance_band(bands.centre * n * eta, n * bands.width, alpha=3.0)
    np.testing.assert_allclose(r2, expect, rtol=1e-12)


def test_confidence_table_of_a_model() -> None:
    model = seatool.load(MODELS / "two_rooms.toml")
    res = seatool.run(model)
    df = confidence_bands(model, res)
    cols = {"level_p05_dB", "level_p50_dB", "level_p95_dB", "level_dB", "relative_variance"}
    assert cols <= set(df.columns)
    assert len(df) == len(model.subsystems) * len(model.bands)
    assert np.all(df["level_p05_dB"] <= df["level_p50_dB"])
    assert np.all(df["level_p50_dB"] <= df["level_dB"] + 1e-12)  # Gamma median < mean
    assert np.all(df["level_dB"] <= df["level_p95_dB"])
    # the receiving room is driven through the pane: wider bands than the source room
    wide = df.groupby("subsystem")["relative_variance"].median()
    assert wide["receiving_room"] > wide["source_room"]
    assert "verify by measurement" in df.attrs["caution"]
    assert column_name(0.05) == "level_p05_dB" and column_name(0.975) == "level_p97_5_dB"


def test_solve_csv_has_confidence_columns(tmp_path: Path) -> None:
    import pandas as pd

    from seatool.cli import main

    out = tmp_path / "r.csv"
    assert main(["solve", str(MODELS / "two_rooms.toml"), "--csv", str(out)]) == 0
    df = pd.read_csv(out, comment="#")
    assert {"level_p05_dB", "level_p50_dB", "level_p95_dB", "relative_variance"} <= set(df)
    assert np.all(df["level_p05_dB"] <= df["level_dB"]) and np.all(
        df["level_dB"] <= df["level_p95_dB"]
    )
