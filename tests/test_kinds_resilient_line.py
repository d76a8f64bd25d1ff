"""Connection kind ``resilient_line`` (seatool/kinds/resilient_lines.py): plates joined
along a seam through an elastic strip. The physics checks of the strip (closed form,
EN ISO 12354-1 Annex E trend, conservation) live in tests/physics/test_interlayer.py;
here the kind is checked against the rigid ``line`` kind, SEA reciprocity and its inputs.
The model below is an invented test scenario."""

from __future__ import annotations

import numpy as np
import pytest

from seatool.analysis.confidence import DISTRIBUTED_CONNECTIONS
from seatool.cli import main
from seatool.kinds.registry import CONNECTION_KINDS
from seatool.modelfile import loads

BASE = """
title = "window pane on a rubber strip in a steel frame (invented test scenario)"
[bands]
lowest = 100
highest = 4000
[subsystems.frame]
kind = "plate"
material = "steel"
thickness = 0.003
lx = 1.2
ly = 0.4
damping = 0.01
wave_fields = ["bending", "longitudinal", "shear"]
[subsystems.pane]
kind = "plate"
material = "glass"
thickness = 0.006
lx = 1.2
ly = 0.9
damping = 0.01
[subsystems.room]
kind = "cavity"
dimensions = [3.0, 2.5, 2.4]
damping = 0.01
[connections.pane_room]
kind = "radiation"
between = ["pane", "room"]
[excitations.shaker]
subsystem = "frame"
power = 1e-3
"""


def model(seam: str):
    return loads(BASE + seam)


def clfs(m) -> dict[tuple[str, str], np.ndarray]:
    return {(c.a, c.b): c.coupling_loss_factor for c in m.connections if c.name.startswith("seam")}


RIGID = '[connections.seam]\nkind = "line"\nbetween = ["frame", "pane"]\nlength = 1.2\n'


def strip(stiffness: float, *, between=("frame", "pane"), extra: str = "") -> str:
    names = ", ".join(f'"{n}"' for n in between)
    return (
        f'[connections.seam]\nkind = "resilient_line"\nbetween = [{names}]\nlength = 1.2\n'
        f'stiffness = {stiffness:g}\non_layer = ["pane"]\n{extra}'
    )


def test_stiff_strip_gives_the_rigid_line_junction():
    # The rigid line junction is the stiff limit of the strip (k' -> infinity): a strip of
    # k' = 1e12 N/m^2 (the largest accepted), 20 mm wide, under a 6 mm pane gives the CLFs
    # of the `line` kind for every pair of wave fields (bending and the frame's in-plane
    # fields) to 0.5 %; a strip 100 times softer differs by more (the check can fail).
    rigid = clfs(model(RIGID))
    stiff = clfs(model(strip(1e12, extra="width = 0.02\n")))
    assert rigid.keys() == stiff.keys() and len(rigid) == 6  # 4 fields, minus the frame's own
    for key, eta in rigid.items():
        np.testing.assert_allclose(stiff[key], eta, rtol=5e-3)
    softer = clfs(model(strip(1e10, extra="width = 0.02\n")))
    bend = ("frame", "pane")
    assert np.max(np.abs(softer[bend] / rigid[bend] - 1)) > 5e-3


def test_softer_strip_couples_less():
    # An elastic interlayer reduces transmission, more so the softer it is and the higher
    # the frequency (EN ISO 12354-1:2017 Annex E: K_ij rises by 10 lg(f/f_1) across a
    # flexible interlayer, from memory; Cremer, Heckl & Petersson 2005, elastic interlayers).
    bend = ("frame", "pane")
    rigid = clfs(model(RIGID))[bend]
    etas = [clfs(model(strip(k, extra="width = 0.02\n")))[bend] for k in (1e9, 1e7, 1e5)]
    assert np.all(etas[0] <= rigid * 1.0001)
    assert np.all(etas[1] < etas[0]) and np.all(etas[2] < etas[1])
    gain = 10 * np.log10(rigid / etas[1])
    assert gain[-1] > gain[0] + 3.0


def test_reciprocity_whichever_plate_is_named_first():
    # The same junction named pane-first (angles given so that the geometry is the same):
    # each CLF the kind states in the other direction equals n_i eta_ij / n_j (SEA
    # reciprocity, Lyon & DeJong 1995; k_i tau_ij = k_j tau_ji, Langley & Heron 1990).
    fwd_model = model(strip(1e7))
    fwd = clfs(fwd_model)
    rev = clfs(model(strip(1e7, between=("pane", "frame"), extra="angles = [90, 0]\n")))
    n = {s.name: s.modal_density for s in fwd_model.subsystems}
    checked = 0
    for (a, b), eta in fwd.items():
        if (b, a) in rev:
            np.testing.assert_allclose(rev[(b, a)], eta * n[a] / n[b], rtol=2e-5)
            checked += 1
        else:
            np.testing.assert_allclose(rev[(a, b)], eta, rtol=2e-5)
    assert checked >= 1


def test_check_and_solve_accept_it(tmp_path, capsys):
    path = tmp_path / "m.toml"
    path.write_text(BASE + strip(5e6))
    assert main(["check", str(path)]) == 0
    out = capsys.readouterr().out
    assert "resilient_line" in out
    assert main(["solve", str(path), "--csv", str(tmp_path / "o.csv")]) == 0
    assert (tmp_path / "o.csv").exists()


SEAM = '[connections.seam]\nkind = "resilient_line"\nbetween = ["frame", "pane"]\nlength = 1.2\n'

BAD = [
    ("no-stiffness", SEAM, ["connections.seam.stiffness", "missing required key"]),
    ("negative", SEAM + "stiffness = -1e6\n", ["connections.seam.stiffness", "must be > 0"]),
    ("too-stiff", SEAM + "stiffness = 1e15\n", ["connections.seam.stiffness", "outside the physical bounds"]),
    ("width", SEAM + "stiffness = 1e6\nwidth = 5.0\n", ["connections.seam.width", "outside the physical bounds"]),
    ("shear-typo", SEAM + "stiffness = 1e6\nshear_stifness = 1e5\n",
     ["connections.seam.shear_stifness", "did you mean 'shear_stiffness'"]),
    ("on-layer-name", SEAM + 'stiffness = 1e6\non_layer = ["pain"]\n',
     ["connections.seam.on_layer", "'pain' is not named in 'between'"]),
    ("on-layer-type", SEAM + 'stiffness = 1e6\non_layer = "pane"\n',
     ["connections.seam.on_layer", "array of subsystem names"]),
    ("on-layer-twice", SEAM + 'stiffness = 1e6\non_layer = ["pane", "pane"]\n',
     ["connections.seam.on_layer", "named twice"]),
    ("angles", SEAM + "stiffness = 1e6\nangles = [0, 90, 180]\n",
     ["connections.seam.angles", "3 angles"]),
    ("cavity", SEAM.replace('"pane"]', '"room"]') + "stiffness = 1e6\n",
     ["connections.seam.between[1]", "not the bending field"]),
]  # fmt: skip


@pytest.mark.parametrize(("case", "seam", "fragments"), BAD, ids=[b[0] for b in BAD])
def test_bad_input_one_line_exit_2(tmp_path, capsys, case, seam, fragments):
    path = tmp_path / "m.toml"
    path.write_text(BASE + seam)
    code = main(["solve", str(path), "--csv", str(tmp_path / "o.csv")])
    err = capsys.readouterr().err
    lines = [ln for ln in err.splitlines() if ln.strip()]
    assert code == 2
    assert len(lines) == 1, lines
    for frag in fragments:
        assert frag in lines[0], lines[0]
    assert not (tmp_path / "o.csv").exists()


def test_declared_a_line_coupling():
    # The spread analysis treats the input of line and area couplings as rain-on-the-roof
    # loading (Langley & Cotoni 2004, in seatool.analysis.confidence); it reads that from
    # each kind's declaration, so the new kind is a line coupling like `line` without a
    # list of kind names to edit.
    assert CONNECTION_KINDS["resilient_line"].extent == CONNECTION_KINDS["line"].extent == "line"
    assert {"resilient_line", "line"} <= DISTRIBUTED_CONNECTIONS
