"""The ``edges`` option of ``kind = "radiation"`` connections, end to end through a model file.

The physics of the option (clamped edges double the edge-mode radiation below coincidence;
Maidanik 1962, Leppington et al. 1982, from memory; checked numerically in
tests/physics/test_radiation_edges.py) is tested there; here: the reader passes the option
on, the provenance names it, and every bad value gives one line, exit code 2.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

import seatool
from seatool.cli import main
from seatool.model import Model

HEAD = """
[bands]
spacing = "third-octave"
lowest = 100
highest = 8000

[subsystems.room]
kind = "cavity"
dimensions = [3.0, 2.5, 2.0]
damping = 0.05

[subsystems.wall]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 1.5
ly = 1.0
damping = 0.01

[subsystems.arc]
kind = "cylindrical_shell"
material = "aluminium"
thickness = 0.002
radius = 1.5
lx = 1.2
ly = 0.9
damping = 0.01
"""


def connection(m: Model, name: str):  # type: ignore[no-untyped-def]
    (c,) = [c for c in m.connections if c.name == name]
    return c


def test_clamped_doubles_the_clf_below_coincidence_only():
    text = HEAD + """
[connections.ss]
kind = "radiation"
between = ["wall", "room"]

[connections.cc]
kind = "radiation"
between = ["wall", "room"]
edges = "clamped"

[connections.ss_explicit]
kind = "radiation"
between = ["wall", "room"]
edges = "simply_supported"

[connections.mai]
kind = "radiation"
between = ["wall", "room"]
method = "maidanik"
corner_factor = 0.0
edges = "clamped"
"""
    m = seatool.loads(text)
    ss, cc = connection(m, "ss"), connection(m, "cc")
    # eta = rho c sigma/(omega m'') is linear in sigma, so the factor 2 of sigma below
    # coincidence must reach the CLF; f_c = c^2/(2 pi) sqrt(m''/D) (steel 2 mm: ~6 kHz)
    air = m.subsystem("room").props
    c0 = float(air.sound_speed)
    h, e, rho, nu = 0.002, 210e9, 7850.0, 0.3
    fc = c0**2 / (2 * math.pi) * math.sqrt(rho * h / (e * h**3 / (12 * (1 - nu**2))))
    b = m.bands
    low = b.upper < 0.5 * fc
    high = b.lower > 1.2 * fc
    assert low.sum() >= 10
    np.testing.assert_allclose(
        cc.coupling_loss_factor[low], 2.0 * ss.coupling_loss_factor[low], rtol=1e-9
    )
    np.testing.assert_allclose(
        cc.coupling_loss_factor[high], ss.coupling_loss_factor[high], rtol=1e-9
    )
    np.testing.assert_array_equal(
        connection(m, "ss_explicit").coupling_loss_factor, ss.coupling_loss_factor
    )
    # Maidanik with the edge-mode term only equals Leppington below coincidence (both
    # doubled): docs/theory/coupling.md sec. 2
    np.testing.assert_allclose(
        connection(m, "mai").coupling_loss_factor[low], cc.coupling_loss_factor[low], rtol=1e-9
    )
    assert "clamped edges" in cc.provenance["coupling_loss_factor"]
    assert "simply supported edges" in ss.provenance["coupling_loss_factor"]
    res = seatool.run(m)
    assert res.solution.residual.max() <= 1e-9


def test_clamped_curved_panel_with_a_flat_formula_is_allowed():
    # with an explicitly chosen flat formula the flat-panel edge option applies
    m = seatool.loads(HEAD + """
[connections.x]
kind = "radiation"
between = ["arc", "room"]
method = "maidanik"
edges = "clamped"
""")
    prov = connection(m, "x").provenance["coupling_loss_factor"]
    assert "clamped edges" in prov and "curvature not included" in prov


BAD = [
    ("misspelt", 'between = ["wall", "room"]\nedges = "clampd"',
     ["connections.x.edges", "did you mean 'clamped'"]),
    ("not-a-string", 'between = ["wall", "room"]\nedges = 2',
     ["connections.x.edges", "must be one of"]),
    ("en12354", 'between = ["wall", "room"]\nmethod = "en12354"\nedges = "clamped"',
     ["connections.x.edges", "en12354"]),
    ("curved", 'between = ["arc", "room"]\nedges = "clamped"',
     ["connections.x.edges", "curved panel"]),
    ("key-misspelt", 'between = ["wall", "room"]\nedge = "clamped"',
     ["connections.x.edge", "did you mean 'edges'"]),
]


@pytest.mark.parametrize(("case", "body", "fragments"), BAD, ids=[b[0] for b in BAD])
def test_bad_edges_one_line_exit_2(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], case: str, body: str, fragments: list[str]
) -> None:
    path = tmp_path / "m.toml"
    path.write_text(HEAD + '\n[connections.x]\nkind = "radiation"\n' + body + "\n")
    code = main(["check", str(path)])
    err = capsys.readouterr().err
    lines = [ln for ln in err.splitlines() if ln.strip()]
    assert code == 2
    assert len(lines) == 1, lines
    assert "Traceback" not in err
    for frag in fragments:
        assert frag in lines[0], lines[0]
