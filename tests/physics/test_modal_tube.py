"""The one-dimensional check of the coupled modal equations.

A rigid piston of area S on a spring-mass-damper closes one end of a tube of length L whose
other end is rigid. The modal solution couples the tube's rigid-walled cosine modes
(cos(n pi x / L), natural frequencies n c / (2 L), Lambda_n = S L e_n) to the single
structural "mode" of the oscillator through C_n = S psi_n(0) = S. The exact answer adds the
air column's input impedance to the oscillator's (Kinsler, Frey, Coppens & Sanders 2000,
Fundamentals of Acoustics, 4th ed., sec. 10.2, closed rigid-terminated pipe, from memory):

    u = F / (j omega m + r + s / (j omega) + Z_a),   Z_a = -j rho c S cot(k L),
    p(L) = -j rho c u / sin(k L).

The modal series for Z_a is the partial-fraction expansion of cot (Abramowitz & Stegun 1964,
eq. 4.3.91, from memory), whose tail after N modes is about 2 z / (pi^2 N) with z = k L: the
error must fall like 1/N. The test states the errors it finds (see the table in
docs/theory/modal.md).
"""

from __future__ import annotations

import numpy as np
import pytest

from seatool.physics import modal_coupled as mc

RHO, C, L, S = 1.2, 343.0, 1.0, 0.01
MASS, F0, ETA = 0.05, 120.0, 0.05  # piston mass [kg], in-vacuo natural frequency, loss factor


def _exact(f: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    w = 2 * np.pi * f
    k = w / C
    w0 = 2 * np.pi * F0
    z_m = 1j * w * MASS + ETA * w0 * MASS + MASS * w0**2 / (1j * w)
    z_a = -1j * RHO * C * S / np.tan(k * L)
    u = 1.0 / (z_m + z_a)
    return u, -1j * RHO * C * u / np.sin(k * L)


def _modal(f: np.ndarray, n_modes: int) -> tuple[np.ndarray, np.ndarray]:
    w = 2 * np.pi * f
    n = np.arange(n_modes)
    fn = n * C / (2 * L)
    norm = S * L * np.where(n == 0, 1.0, 0.5)
    z = mc.modal_impedance(w, [F0], MASS, ETA)
    y = mc.cavity_modal_admittance_term(w, fn, norm, 0.0, density=RHO, sound_speed=C)
    coupling = np.full((n_modes, 1), S)
    v, p = mc.solve_coupled(z, y, coupling, force=np.array([1.0]))
    p_end = np.sum(p[:, :, 0] * np.cos(n * np.pi), axis=1)
    return v[:, 0, 0], p_end


def _errors(n_modes: int) -> tuple[float, float]:
    f = np.linspace(10.0, 600.0, 237)  # spans the 1st to 3rd tube resonance (171.5 Hz each)
    u0, p0 = _exact(f)
    u, p = _modal(f, n_modes)
    return float(np.max(np.abs(u - u0) / np.abs(u0))), float(np.max(np.abs(p - p0) / np.abs(p0)))


def test_modal_tube_converges_to_exact_impedance() -> None:
    errs = {n: _errors(n) for n in (20, 40, 80, 160, 320)}
    # observed (10-600 Hz, 237 lines): max relative error of the piston velocity 4.4 % with
    # 20 modes, 2.2 % (40), 1.1 % (80), 0.54 % (160), 0.27 % (320): error = 0.86 / N; the
    # pressure at the rigid end the same. Each doubling must halve it (ratio 1.7-2.3).
    for n in (20, 40, 80, 160):
        ratio_u = errs[n][0] / errs[2 * n][0]
        ratio_p = errs[n][1] / errs[2 * n][1]
        assert 1.7 < ratio_u < 2.3, (n, errs)
        assert 1.7 < ratio_p < 2.3, (n, errs)
    assert errs[320][0] < 3e-3
    assert errs[320][1] < 3e-3


def test_both_eliminations_give_the_tube_answer() -> None:
    f = np.array([35.0, 171.0, 250.0])
    u0, _ = _exact(f)
    w = 2 * np.pi * f
    n = np.arange(400)
    y = mc.cavity_modal_admittance_term(w, n * C / (2 * L), S * L * np.where(n == 0, 1.0, 0.5),
                                        0.0, density=RHO, sound_speed=C)  # fmt: skip
    z = mc.modal_impedance(w, [F0], MASS, ETA)
    for keep in ("structure", "cavity"):
        v, _ = mc.solve_coupled(z, y, np.full((400, 1), S), np.array([1.0]), keep=keep)  # type: ignore[arg-type]
        np.testing.assert_allclose(v[:, 0, 0], u0, rtol=3e-3)
    assert abs(v[0, 0, 0]) == pytest.approx(abs(u0[0]), rel=3e-3)
