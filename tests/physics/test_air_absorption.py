"""Tests for seatool.physics.air_absorption against standards, closed-form limits and numerics."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.physics import air_absorption
from seatool.physics import damping as dmp

# ISO 9613-2:1996 Table 2 (octave-band attenuation coefficients in dB/km computed from
# ISO 9613-1 at the exact mid-band frequencies), values FROM MEMORY. The table is rounded to
# 0.1 dB/km (three significant digits above 100); tolerance 0.06 dB/km or 0.5 %, whichever is
# larger (half a unit of the last digit plus a little for a value recalled at a rounding edge).
_ISO9613_TABLE = [
    # (T [C], RH [%], values at 63 ... 8000 Hz)
    (10.0, 70.0, [0.1, 0.4, 1.0, 1.9, 3.7, 9.7, 32.8, 117.0]),
    (20.0, 70.0, [0.1, 0.3, 1.1, 2.8, 5.0, 9.0, 22.9, 76.6]),
    (30.0, 70.0, [0.1, 0.3, 1.0, 3.1, 7.4, 12.7, 23.1, 59.3]),
    (15.0, 20.0, [0.3, 0.6, 1.2, 2.7, 8.2, 28.2, 88.8, 202.0]),
    (15.0, 50.0, [0.1, 0.5, 1.2, 2.2, 4.2, 10.8, 36.2, 129.0]),
    (15.0, 80.0, [0.1, 0.3, 1.1, 2.4, 4.1, 8.3, 23.7, 82.8]),
]


@pytest.mark.parametrize(("temp", "rh", "table"), _ISO9613_TABLE)
def test_air_absorption_iso9613_table(temp, rh, table):
    f_exact = 1000.0 * 10.0 ** (np.arange(-12, 10, 3) / 10.0)  # IEC 61260-1 base-10 octaves
    got = (
        air_absorption.air_attenuation_iso9613(f_exact, temperature=temp, relative_humidity=rh)
        * 1e3
    )
    table = np.asarray(table)
    tol = np.maximum(0.06, 0.005 * table)
    assert np.all(np.abs(got - table) <= tol), (got, table)


def test_air_attenuation_constant_convention():
    # intensity convention: a level falls by alpha dB per metre <=> I ~ exp(-m x)
    f = np.array([1000.0, 4000.0])
    alpha = air_absorption.air_attenuation_iso9613(f)
    m = air_absorption.air_attenuation_constant(f)
    np.testing.assert_allclose(10 * np.log10(np.exp(m * 1.0)), alpha, rtol=1e-12)


def test_air_loss_factor_equals_4mV_absorption():
    # Sabine's 4 m V term in a cavity (ISO 354 clause 8) -> same loss factor as m c/omega
    f = np.array([2000.0, 8000.0])
    v = 3.0
    m = air_absorption.air_attenuation_constant(f, temperature=20.0, relative_humidity=50.0)
    eta_air = air_absorption.air_absorption_loss_factor(f, temperature=20.0, relative_humidity=50.0)
    np.testing.assert_allclose(eta_air, dmp.cavity_loss_factor(f, v, 4 * m * v), rtol=1e-12)


@pytest.mark.regression
def test_air_regression_values():
    # regression: computed by hand outside the code from the ISO 9613-1:1993 formulas
    # (not published)
    np.testing.assert_allclose(air_absorption.air_attenuation_constant(4000.0), 6.83e-3, rtol=2e-3)
    np.testing.assert_allclose(
        air_absorption.air_absorption_loss_factor(4000.0), 9.32e-5, rtol=2e-3
    )
