"""SEA validity report: modes in band, modal overlap with the total loss factor, flags.

Outside checks: the axial-mode frequency c / (2 L) of a rigid box (no mode below it, so
the bands below must be flagged), the definitions N = n(f) Delta_f and M = eta f n(f)
written out here (Lyon & DeJong 1995), and the duct cut-on frequency c / (2 w).
"""

from __future__ import annotations

import numpy as np
import pytest

import seatool
from seatool import validity_report as vr
from seatool.cli import main

SMALL = """
title = "small cavity"
[bands]
lowest = 50
highest = 2000
[subsystems.box]
kind = "cavity"
dimensions = [1.0, 0.8, 0.6]
damping = 0.02
[subsystems.panel]
kind = "structure"
mass = 10.0
modal_density = 0.3
damping = 0.01
[connections.rad]
between = ["panel", "box"]
coupling_loss_factor = 1e-3
[excitations.p]
subsystem = "panel"
power = 1e-3
"""


def test_small_cavity_flagged_below_its_first_mode():
    m = seatool.loads(SMALL)
    t = vr.validity_table(m)
    box = t[t["subsystem"] == "box"].set_index("band_hz")
    # the lowest rigid-box mode is axial, c / (2 Lx) = 343.2 / 2 = 171.6 Hz (Morse & Bolt
    # 1944): the bands up to 125 Hz hold no mode and must be flagged as very few modes
    for f in (50, 63, 80, 100, 125):
        assert box.loc[f, "flag"].startswith("very_few_modes"), box.loc[f, "flag"]
        assert "fewer than one mode" in box.loc[f, "message"]
    assert box.loc[2000, "flag"] == "ok"


def test_overlap_uses_total_loss_factor():
    m = seatool.loads(SMALL)
    t = vr.validity_table(m)
    b = m.bands
    panel = m.subsystem("panel")
    box = m.subsystem("box")
    # total loss factors: eta_1 + eta_12 and eta_2 + eta_21, eta_21 = eta_12 n_1 / n_2
    eta_p = 0.01 + 1e-3
    eta_b = 0.02 + 1e-3 * panel.modal_density / box.modal_density
    for name, eta, n in (("panel", eta_p, panel.modal_density), ("box", eta_b, box.modal_density)):
        rows = t[t["subsystem"] == name]
        np.testing.assert_allclose(rows["modes_in_band"], n * b.width)
        np.testing.assert_allclose(rows["modal_overlap"], eta * b.centre * n)
        np.testing.assert_allclose(rows["total_loss_factor"], eta)


def test_result_validity_and_notes():
    res = seatool.run(seatool.loads(SMALL))
    df = res.validity()
    assert list(df.columns[:2]) == ["subsystem", "band_hz"]
    assert {"modes_in_band", "modal_overlap", "flag", "message"} <= set(df.columns)
    notes = [n for n in res.notes if n.startswith("box ")]
    assert len(notes) == 1
    assert notes[0].startswith("box below ")
    assert "modes per band" in notes[0] and "or wider" in notes[0]  # band-level spread (issue 17)


def test_check_shows_table_and_solve_shows_notes(tmp_path, capsys):
    path = tmp_path / "m.toml"
    path.write_text(SMALL)
    assert main(["check", str(path)]) == 0
    out = capsys.readouterr().out
    assert "SEA validity per band" in out
    line_50 = next(ln for ln in out.splitlines() if ln.strip().startswith("50 Hz"))
    assert "*" in line_50
    assert main(["solve", str(path)]) == 0
    out = capsys.readouterr().out
    assert "note: box below" in out


def test_duct_above_cut_on_flagged():
    text = SMALL.replace(
        'kind = "cavity"\ndimensions = [1.0, 0.8, 0.6]',
        'kind = "duct"\nlength = 10.0\nwidth = 0.4\nheight = 0.2',
    )
    m = seatool.loads(text)
    t = vr.validity_table(m).query("subsystem == 'box'").set_index("band_hz")
    # rigid rectangular duct: first cross mode at c / (2 w) = 429 Hz (Kinsler et al. 2000)
    assert "above_cut_on" in t.loc[500, "flag"]
    assert "above_cut_on" not in t.loc[400, "flag"]
    notes = vr.weak_band_notes(m)
    assert any(n.startswith("box from 500 Hz: above the duct's") for n in notes)


def test_sink_and_resonator_left_out():
    text = SMALL + """
[subsystems.out]
kind = "exterior"
[subsystems.r]
kind = "resonator"
mass = 1.0
stiffness = 4e5
loss_factor = 0.05
"""
    names = {sv.name for sv in vr.assess_model(seatool.loads(text))}
    assert names == {"box", "panel"}


@pytest.mark.parametrize(
    ("first", "last", "expect"), [(0, 3, "below 125 Hz"), (20, 25, "from 5 kHz")]
)
def test_where_wording(first, last, expect):
    m = seatool.loads(SMALL.replace("highest = 2000", "highest = 8000"))
    assert vr._where(m, first, last if last < len(m.bands) else len(m.bands) - 1) == expect
