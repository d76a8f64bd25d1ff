"""Shared test helpers."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem


def structure(name: str, bands: BandAxis, n: float, eta: float, mass: float = 1.0) -> Subsystem:
    nb = len(bands)
    return Subsystem(
        name, "structure", np.full(nb, n), np.full(nb, eta), quantity="velocity", mass=mass
    )


@pytest.fixture
def one_band() -> BandAxis:
    return BandAxis.from_range(1000, 1000)


def chain_model(bands: BandAxis, n, eta, clf, power) -> Model:  # type: ignore[no-untyped-def]
    """Subsystems s0 - s1 - ... in a chain, power into s0."""
    subs = tuple(structure(f"s{i}", bands, n[i], eta[i]) for i in range(len(n)))
    cons = tuple(
        Connection(f"c{i}", f"s{i}", f"s{i + 1}", np.full(len(bands), clf[i]))
        for i in range(len(clf))
    )
    exc = (Excitation("src", "s0", "power", power=np.full(len(bands), power)),)
    return Model(bands, subs, cons, exc)
