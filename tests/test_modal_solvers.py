"""The low-frequency solution through the coupled modes against the exact per-line solve.

Both solvers of :func:`seatool.modal.solve_modal` solve the same coupled equations; the
coupled-mode path (:mod:`seatool.physics.modal_eigen`) only approximates the modal damping
(Hasselman 1976, AIAA J. 14(11), 1627-1628, from memory). The exact solve is checked
against the full system and the tube's closed form in tests/physics.
"""

from __future__ import annotations

import numpy as np
import pytest

from seatool.bands import BandAxis
from seatool.modal import DiffuseField, ModalBox, ModalPanel, PointForce, PointSource, solve_modal
from seatool.physics import plates as st


def _box(eta_panel: float, eta_air: float) -> ModalBox:
    bands = BandAxis.from_range(50, 200)
    d = float(st.bending_stiffness(210e9, 1e-3, 0.3))  # 1 mm steel
    panel = ModalPanel("panel", "z0", (0.5, 0.4), (0.2, 0.175), d, 7.85, eta_panel)
    return ModalBox("air", (0.9, 0.75, 0.7), 1.21, 343.0, eta_air, (panel,), bands)


@pytest.mark.parametrize("eta", [(0.01, 0.01), (0.01, 0.05)])
def test_coupled_modes_agree_with_the_direct_solve(eta: tuple[float, float]) -> None:
    # A point force, a diffuse field on the panel and a point source in the cavity, solved
    # together (uncorrelated): band levels of the panel and the cavity, 50-200 Hz.
    # Observed: within 0.0005 dB in every band for both damping sets; tolerance 0.01 dB.
    box = _box(*eta)
    exs = [
        PointForce("force", "panel", (0.17, 0.11), 1.0),
        DiffuseField("field", "panel", 1.0),
        PointSource("source", (0.3, 0.2, 0.25), 1e-4),
    ]
    fast = solve_modal(box, exs, 200.0, check_factor=None, solver="coupled_modes")
    exact = solve_modal(box, exs, 200.0, check_factor=None, solver="direct")
    assert "coupled modes" in fast.notes[0] and "directly" in exact.notes[0]
    for name in ("panel", "air"):
        diff = fast.level(name) - exact.level(name)
        assert np.max(np.abs(diff)) < 0.01, (name, diff)


def test_unknown_solver_is_refused() -> None:
    with pytest.raises(ValueError, match="solver must be one of"):
        solve_modal(_box(0.01, 0.01), [PointSource("s", (0.3, 0.2, 0.25), 1e-4)], 100.0,
                    solver="fast")  # fmt: skip
