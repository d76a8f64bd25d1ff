"""The per-line modal solve with many right-hand sides of different kinds.

A diffuse field is 72 plane waves whose modal forces change with frequency; a point force
and a point source in the cavity are one column each, zero in the other set. The reduced
solves (:func:`seatool.physics.modal_coupled.solve_coupled`) treat only the columns where
a load is given in the elimination's load terms; here they are checked, column by column,
against the plain (K + N) system per line (:func:`solve_coupled_full`: an independent,
unreduced solve of the same equations, Dowell, Gorman & Smith 1977, J. Sound Vib. 52(4),
519-542).
"""

from __future__ import annotations

import numpy as np
import pytest

from seatool.bands import BandAxis
from seatool.modal import DiffuseField, ModalBox, ModalPanel, PointForce, PointSource, solve_modal
from seatool.physics import modal_box as mb
from seatool.physics import modal_coupled as mc
from seatool.physics import plates as st


def _loads(nl: int, plate: mb.PlateModes, cav: mb.CavityModes, k: np.ndarray
           ) -> tuple[np.ndarray, np.ndarray]:  # fmt: skip
    dirs, _ = mb.diffuse_field_directions(6, 12)
    f = np.zeros((nl, len(plate), 74), dtype=complex)
    q = np.zeros((nl, len(cav), 74), dtype=complex)
    f[:, :, 0] = mb.plate_mode_shape(plate, 0.21, 0.13)  # a point force
    f[:, :, 1:73] = mb.plane_wave_modal_forces(plate, k, dirs)  # 72 plane waves
    q[:, :, 73] = 1e-3 * mb.cavity_mode_shape(cav, (0.3, 0.2, 0.25))  # a point source
    return f, q


def _system() -> tuple[np.ndarray, ...]:
    cav = mb.cavity_modes(0.9, 0.75, 0.7, 343.0, 450.0)
    plate = mb.plate_modes(0.5, 0.4, float(st.bending_stiffness(210e9, 1e-3, 0.3)), 7.85, 450.0)
    c = mb.coupling_matrix(plate, cav, "z0", (0.2, 0.175))
    w = 2 * np.pi * np.linspace(40.0, 220.0, 23)
    z = mc.modal_impedance(w, plate.frequency, plate.modal_mass, 0.01)
    y = mc.cavity_modal_admittance_term(w, cav.frequency, cav.norm, 0.03, density=1.21,
                                        sound_speed=343.0)  # fmt: skip
    f, q = _loads(w.size, plate, cav, w / 343.0)
    return z, y, c, f, q, cav.norm / 0.4725


@pytest.mark.parametrize("keep", ["structure", "cavity", "groups"])
def test_many_mixed_loads_agree_with_the_full_system(keep: str) -> None:
    z, y, c, f, q, _ = _system()
    v0, p0 = mc.solve_coupled_full(z, y, c, f, q)
    v, p = mc.solve_coupled(z, y, c, f, q, keep=keep)  # type: ignore[arg-type]
    # every column alone: a column's own scale, not the largest load's, sets the tolerance
    for r in range(f.shape[2]):
        np.testing.assert_allclose(v[:, :, r], v0[:, :, r], rtol=1e-8,
                                   atol=1e-12 * np.abs(v0[:, :, r]).max())  # fmt: skip
        np.testing.assert_allclose(p[:, :, r], p0[:, :, r], rtol=1e-8,
                                   atol=1e-12 * np.abs(p0[:, :, r]).max())  # fmt: skip


def test_weighted_pressure_squares_through_the_coupling_groups() -> None:
    # a panel in one face couples cavity modes that differ only in the index normal to the
    # face through the same row (up to sign): the groups are fewer than either mode set
    z, y, c, f, q, weight = _system()
    groups, _, _ = mc._coupling_groups(c)
    assert groups.shape[0] < min(c.shape)
    v0, p0 = mc.solve_coupled_full(z, y, c, f, q)
    v, p2 = mc.solve_coupled_squares(z, y, c, f, q, pressure_weight=weight)
    np.testing.assert_allclose(v, v0, rtol=1e-8, atol=1e-12 * np.abs(v0).max())
    np.testing.assert_allclose(p2, np.einsum("n,lnr->lr", weight, np.abs(p0) ** 2), rtol=1e-8)


def test_loads_the_same_at_every_line_are_multiplied_once() -> None:
    rng = np.random.default_rng(5)
    b = rng.standard_normal((7, 11))
    x = rng.standard_normal((11, 3)) + 1j * rng.standard_normal((11, 3))
    got = mc._apply(b, np.broadcast_to(x, (5, 11, 3)))
    assert got.shape == (5, 7, 3)
    np.testing.assert_allclose(got, np.broadcast_to(b @ x, (5, 7, 3)), rtol=1e-13, atol=1e-14)


@pytest.mark.consistency
def test_band_levels_do_not_depend_on_how_lines_are_blocked(monkeypatch: pytest.MonkeyPatch
                                                            ) -> None:  # fmt: skip
    # The lines are solved in blocks; blocks of a few lines must give the same band values
    # as one block (only the grouping of independent per-line solves changes).
    bands = BandAxis.from_range(50, 160)
    d = float(st.bending_stiffness(210e9, 1e-3, 0.3))
    panel = ModalPanel("panel", "z0", (0.5, 0.4), (0.2, 0.175), d, 7.85, 0.01)
    box = ModalBox("air", (0.9, 0.75, 0.7), 1.21, 343.0, 0.03, (panel,), bands)
    exs = [
        PointForce("force", "panel", (0.17, 0.11), 1.0),
        DiffuseField("field", "panel", 1.0),
        PointSource("source", (0.3, 0.2, 0.25), 1e-4),
    ]
    one = solve_modal(box, exs, 160.0, check_factor=None, solver="direct")
    monkeypatch.setattr("seatool.modal._BLOCK_ELEMENTS", 1)
    many = solve_modal(box, exs, 160.0, check_factor=None, solver="direct")
    for name in ("panel", "air"):
        np.testing.assert_allclose(many.mean_square[name], one.mean_square[name], rtol=1e-12)
