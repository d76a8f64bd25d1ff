"""Which distribution turns a relative variance into level quantiles: the log-normal and
Gamma laws against the random-matrix Monte Carlo of a point-driven subsystem's band energy.

Reference: :mod:`goe_monte_carlo` (GOE natural frequencies, Gaussian mode shapes, exact
band integrals of the Lorentzian modal sum), 1500 draws; quantiles of the pooled samples
with bootstrap standard errors over whole draws (:func:`coupled_monte_carlo.level_quantiles`).
Each law is evaluated at the Monte Carlo's own relative variance, so only the shape of the
distribution is tested. The cases are chosen by equation (1) of
:func:`seatool.physics.variance.relative_variance_band` to give r^2 = 0.3, 1 and 3.
"""

from __future__ import annotations

import coupled_monte_carlo as cmc  # tests/coupled_monte_carlo.py (tests/ is on the path)
import goe_monte_carlo as mc
import numpy as np
import pytest

from seatool.physics import variance as v

P = (0.05, 0.95)


# (m, B, r^2 by (1), allowance for the log-normal law's shape error [dB] at 5 % and 95 %)
# Observed (seed 7, 1500 draws; MC standard errors 0.03-0.07 dB):
#   r^2 = 0.3, m = 0.3: MC -5.04 / +3.09 dB, log-normal -4.25 / +3.10, Gamma -5.29 / +3.10
#   r^2 = 1,   m = 0.3: MC -9.24 / +4.74,    log-normal -7.36 / +4.41, Gamma -12.58 / +4.72
#   r^2 = 1,   m = 0.1: MC -11.55 / +4.75,   log-normal -7.44 / +4.44, Gamma -12.85 / +4.76
#   r^2 = 3,   m = 0.1: MC -14.76 / +6.44,   log-normal -11.42 / +5.40, Gamma -35.75 / +6.45
CASES = [
    (0.3, 6.121, 0.3, (1.2, 0.3)),
    (0.3, 1.507, 1.0, (2.3, 0.6)),
    (0.1, 1.962, 1.0, (4.5, 0.6)),
    (0.1, 0.582, 3.0, (3.8, 1.3)),
]


@pytest.mark.parametrize(("m", "width", "r2", "allow"), CASES)
def test_lognormal_quantiles_of_one_subsystem(
    m: float, width: float, r2: float, allow: tuple[float, float]
) -> None:
    assert float(v.relative_variance_band(m, width)) == pytest.approx(r2, rel=1e-3)
    est = mc.relative_variance(m, width, "point")
    q, se = cmc.level_quantiles(est.samples, P, groups=est.samples.size // 1500)
    assert np.all(se < 0.15)  # the Monte Carlo resolves the quantiles to 0.15 dB
    ln = v.level_quantiles(est.value, P)
    # log-normal: within 3 bootstrap standard errors plus its stated shape error; it is
    # too narrow on the low side for one subsystem (too high a 5 % level by 0.8-4.1 dB),
    # its 95 % level within 0.35 dB up to r^2 = 1 and 1 dB low at r^2 = 3
    assert np.all(np.abs(ln - q) <= 3 * se + np.asarray(allow)), (ln, q, se)
    gamma = v.level_quantiles(est.value, P, distribution="gamma")
    # Gamma: its 95 % level within 0.1 dB (plus 3 standard errors) in every case ...
    assert abs(gamma[1] - q[1]) <= 0.1 + 3 * se[1]
    # ... but its 5 % level is always below the simulated one, and far below at r^2 = 3,
    # where the log-normal is the closer law
    assert gamma[0] < q[0] + 3 * se[0]
    if r2 >= 3.0:
        assert abs(gamma[0] - q[0]) > 5.0 * abs(ln[0] - q[0]) + 3 * se[0]
