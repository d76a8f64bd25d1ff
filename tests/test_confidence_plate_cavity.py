"""Built-up variance of a plate radiating into a cavity against a random-matrix Monte Carlo
(:func:`coupled_monte_carlo.plate_cavity`: GOE natural frequencies, random mode shapes,
Gaussian random coupling coefficients, coupled modal response solved per frequency line).
The tests compare the ensemble relative variances with
:func:`seatool.analysis.confidence.relative_variances` for the same model with SEA loss
factors fitted to the ensemble means.
"""

from __future__ import annotations

import coupled_monte_carlo as cmc
import numpy as np

from seatool.analysis.confidence import relative_variances
from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem

rel_var = cmc.rel_var


def predicted(
    mc: dict[str, np.ndarray], kind: str, distributed_alpha: float = 1.0
) -> tuple[np.ndarray, float, float]:
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
    r2 = relative_variances(model, np.array([[e1], [e2]]), distributed_alpha=distributed_alpha)
    return r2[:, 0], eta12 / eta1, misfit


def test_plate_cavity_variance_vs_monte_carlo() -> None:
    mc = cmc.plate_cavity(300, 7)
    pred, ratio, misfit = predicted(mc, "radiation")
    assert abs(misfit) < 0.01  # SEA holds for the ensemble means (power balance of the plate)
    assert 0.3 < ratio < 3.0  # coupling comparable to damping: the case of interest
    r1, se1 = rel_var(mc["E1"])
    r2, se2 = rel_var(mc["E2"])
    assert se1 < 0.2 * r1 and se2 < 0.2 * r2  # the Monte Carlo resolves the variances
    # Monte Carlo 0.240 +- 0.022 (plate) and 0.208 +- 0.020 (cavity) for this seed;
    # predicted 0.202 and 0.207. Tolerance: 3 delta-method standard errors (other seeds
    # and overlaps: docs/theory/variance.md, section 4)
    assert abs(pred[0] - r1) <= 3 * se1
    assert abs(pred[1] - r2) <= 3 * se2
    # the cavity's input is distributed: treated as a point junction it would be far off
    point, _, _ = predicted(mc, "point")
    assert point[1] > r2 + 10 * se2


def test_cavity_variance_is_bounded_by_its_loading_statistics() -> None:
    # The case where the rain-on-the-roof estimate is lowest against the Monte Carlo:
    # modal overlap 2, weak coupling (eta_12 / eta_1 about 0.1), 800 draws. Observed:
    # cavity 0.266 +- 0.020 against 0.184 predicted (31 % low, 4 standard errors).
    # Cause: the cavity's modes are not loaded like rain on the roof; each is driven by a
    # random combination of a few plate modal amplitudes, and the Monte Carlo measures the
    # within-band alpha of the cavity's modal loading directly: 1.65 here (1.33-1.65 in the
    # seven cases of docs/theory/variance.md, section 4). Taking that alpha for the
    # distributed connection (distributed_alpha) gives 0.226 (2 standard errors low); with
    # 1, the shipped estimate, 0.184. In all seven cases the Monte Carlo lies between the
    # two estimates within 3 standard errors: they bound the cavity's variance.
    mc = cmc.plate_cavity(800, 43, overlap=(2.0, 2.0), coupling=0.001)
    lower, ratio, misfit = predicted(mc, "radiation")
    assert abs(misfit) < 0.01 and 0.05 < ratio < 0.3
    a_within = float(mc["alpha_within"])
    assert 1.3 < a_within < 2.0  # not rain-on-the-roof (1), not a point force (3)
    upper, _, _ = predicted(mc, "radiation", distributed_alpha=a_within)
    r2, se2 = rel_var(mc["E2"])
    assert se2 < 0.1 * r2
    assert lower[1] - 3 * se2 <= r2 <= upper[1] + 3 * se2, (lower[1], r2, upper[1], se2)
    assert r2 > lower[1] + 3 * se2  # the lower estimate is resolved as too low here
    # the directly driven plate is unaffected by the cavity's loading at weak coupling
    r1, se1 = rel_var(mc["E1"])
    assert abs(lower[0] - r1) <= 3 * se1


def test_strongly_coupled_plate_is_bounded_by_the_cavity_loading() -> None:
    # Strong coupling (eta_12 / eta_1 about 4.5): the plate's estimate is low because the
    # power the cavity returns is read as rain-on-the-roof loading of independent modes.
    # With the cavity's measured loading alpha (1.33) for that power the estimate is high.
    # Observed, 400 draws: Monte Carlo 0.167 +- 0.012, estimates 0.124 and 0.253 (800
    # draws: 0.183 +- 0.011, 0.126 and 0.182). The plate lies between the two within 3
    # standard errors; the cavity does not follow the upper reading (docs/theory/
    # variance.md, section 4: the modes of a strongly coupled pair mix).
    mc = cmc.plate_cavity(400, 44, coupling=0.005)
    lower, ratio, misfit = predicted(mc, "radiation")
    assert abs(misfit) < 0.01 and ratio > 3.0
    upper, _, _ = predicted(mc, "radiation", distributed_alpha=float(mc["alpha_within"]))
    r1, se1 = rel_var(mc["E1"])
    assert se1 < 0.12 * r1
    assert lower[0] - 3 * se1 <= r1 <= upper[0] + 3 * se1, (lower[0], r1, upper[0], se1)
    assert r1 > lower[0] + 2 * se1  # the default estimate is resolved as low here
