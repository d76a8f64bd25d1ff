"""Confidence bands of a solved model: the built-up variance against a random-matrix Monte
Carlo of two point-coupled subsystems, single-subsystem consistency, and the table."""

from __future__ import annotations

from pathlib import Path

import coupled_monte_carlo as cmc
import numpy as np
import pytest

import seatool
from seatool.analysis.confidence import column_name, confidence_bands, relative_variances
from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem
from seatool.physics.variance import relative_variance_band

MODELS = Path(__file__).resolve().parents[1] / "models"


def _fitted_model(mc: dict[str, np.ndarray], kind: str) -> tuple[Model, np.ndarray]:
    """The two-subsystem SEA model of a point-junction Monte Carlo, loss factors fitted to
    its ensemble means, on a one-band axis (n and eta scaled so that modes in band and
    modal overlap match: the propagation depends on ratios of loss factors only)."""
    e1, e2, p = mc["E1"].mean(), mc["E2"].mean(), mc["P"].mean()
    n1, n2 = mc["n"]
    eta1, eta2 = mc["eta"]
    # eta_12 from subsystem 2's balance with reciprocity; subsystem 1's balance must then
    # hold with the measured input power (SEA itself)
    eta12 = eta2 * e2 / (e1 - n1 * e2 / n2)
    w = float(mc["wc"])
    assert p == pytest.approx(w * (eta1 + eta12) * e1 - w * eta12 * n1 / n2 * e2, rel=1e-2)
    bands = BandAxis.from_range(1000, 1000)
    s = float(mc["dw"]) / (2 * np.pi) / bands.width[0]
    model = Model(
        bands,
        (
            Subsystem("a", "structure", np.array([n1 * s]), np.array([eta1 / s])),
            Subsystem("b", "structure", np.array([n2 * s]), np.array([eta2 / s])),
        ),
        (Connection("c", "a", "b", np.array([eta12 / s]), kind=kind),),
        (Excitation("f", "a", "power", power=np.array([p / s])),),
    )
    return model, np.array([[e1], [e2]])


def test_built_up_variance_vs_coupled_monte_carlo() -> None:
    # Independent reference: two GOE subsystems joined by a soft point spring
    # (tests/coupled_monte_carlo.py, |k G| << 1 at the junction), 4000 draws (8 s of CPU).
    mc = cmc.point_junction(4000, 301, m=(1.0, 2.0), modes=(10.0, 20.0), spring=3e3)
    model, energy = _fitted_model(mc, "mount")  # a soft spring: a resilient mount
    pred = relative_variances(model, energy)[:, 0]
    r1, se1 = cmc.rel_var(mc["E1"])
    r2, se2 = cmc.rel_var(mc["E2"])
    # directly driven subsystem: Monte Carlo 0.163 +- 0.004, predicted 0.162; tolerance 3
    # standard errors + 0.5 % (the window allowance of tests/physics/test_variance.py)
    assert abs(pred[0] - r1) <= 3 * se1 + 0.005 * r1
    # driven through the spring: Monte Carlo 0.903 +- 0.042 (this seed; seven seeds of
    # 3000-4000 draws: 0.90-1.05), predicted 0.990. Over the soft-spring cases of
    # docs/theory/variance.md, section 4 the prediction is 0.98-1.11 of the Monte Carlo:
    # tolerance 15 % plus 3 standard errors (formerly a factor 1.4 plus 2 standard errors on
    # 300 draws).
    assert se2 < 0.06 * r2  # the Monte Carlo resolves the variance to 6 %
    assert abs(pred[1] - r2) <= 0.15 * r2 + 3 * se2, (pred[1], r2, se2)
    assert r2 > 2.0 * r1  # variance grows along the transmission path
    # Each junction term is needed: read as a rigid point (no cross-modal term of the
    # spring force) the prediction is 0.843, 7 % low here but 31 % low at modal overlap 2
    # (section 4); without the product term it would be lower still.
    model_rigid, _ = _fitted_model(mc, "point")
    rigid = relative_variances(model_rigid, energy)[:, 0]
    assert rigid[1] < pred[1] - 0.1


def test_rigid_point_junction_is_conservative() -> None:
    # A stiff spring (|k G| of order one: the force is set by the two driving-point
    # receptances, whose resonances smooth it) read as a rigid point connection: the
    # prediction overestimates the receiver's variance (Monte Carlo 0.512 +- 0.043 with
    # 1500 draws, predicted 0.822; 1.06-1.6 over the stiff cases of section 4): it is an
    # upper estimate. Tolerance: within 3 standard errors above the Monte Carlo, and not
    # more than 1.7 times it.
    mc = cmc.point_junction(1500, 401, m=(1.0, 2.0), modes=(10.0, 20.0), spring=1e6)
    model, energy = _fitted_model(mc, "point")
    pred = relative_variances(model, energy)[:, 0]
    r2, se2 = cmc.rel_var(mc["E2"])
    assert r2 - 3 * se2 <= pred[1] <= 1.7 * r2 + 3 * se2, (pred[1], r2, se2)


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
