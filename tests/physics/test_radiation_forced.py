"""Tests for seatool.physics.radiation_forced (sources beside each check)."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.physics import radiation_forced

C0 = 343.0


@pytest.mark.regression
def test_forced_radiation_en12354_regression():
    # regression values (computed by hand outside the code from the EN ISO 12354-1
    # Annex B formula as recalled; not published): 1.5 m x 1.0 m panel.
    f = np.array([100.0, 501.19, 1995.26, 3981.07])
    expect = np.array([0.4843, 1.2826, 1.9731, 2.0])
    np.testing.assert_allclose(
        radiation_forced.forced_radiation_efficiency_en12354(f, 1.5, 1.0, c0=C0), expect, atol=1e-4
    )
    # symmetric in the side lengths
    np.testing.assert_allclose(
        radiation_forced.forced_radiation_efficiency_en12354(f, 1.0, 1.5, c0=C0),
        radiation_forced.forced_radiation_efficiency_en12354(f, 1.5, 1.0, c0=C0),
    )
