"""Every subsystem kind joined by physics-derived couplings only (no coupling loss factor
given by hand): an integration check of the readers, not a physics validation (the physics
checks live beside each formula)."""

from __future__ import annotations

import numpy as np

import seatool
from seatool.cli import main

MODEL = """
title = "every subsystem kind, every coupling derived (invented test scenario)"
[bands]
lowest = 200
highest = 4000
[subsystems.room]
kind = "cavity"
dimensions = [4.0, 3.0, 2.5]
damping = { reverberation_time = 0.6 }
[subsystems.vent]
kind = "duct"
length = 2.0
width = 0.1
height = 0.1
damping = 0.01
[subsystems.wall]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 2.0
ly = 1.5
[subsystems.deck]
kind = "sandwich_panel"
face_material = "aluminium"
face_thickness = 0.001
core_thickness = 0.02
core_density = 60.0
core_shear_modulus = 2e7
lx = 1.5
ly = 1.0
[subsystems.rib]
kind = "beam"
material = "steel"
length = 1.5
section = { shape = "rectangular", width = 0.03, height = 0.05 }
[subsystems.box]
kind = "resonator"
mass = 0.05
stiffness = 2e6
loss_factor = 0.05
[subsystems.roof]
kind = "cylindrical_shell"
material = "aluminium"
thickness = 0.0015
radius = 2.0
lx = 1.5
ly = 1.2
damping = 0.01
[subsystems.floor]
kind = "ribbed_plate"
material = "steel"
thickness = 0.003
lx = 2.0
ly = 1.5
rib_width = 0.004
rib_height = 0.04
rib_spacing = 0.3
damping = 0.01
[subsystems.outside]
kind = "exterior"
[connections.w_room]
kind = "radiation"
between = ["wall", "room"]
[connections.w_out]
kind = "radiation"
between = ["wall", "outside"]
[connections.d_room]
kind = "radiation"
between = ["deck", "room"]
[connections.vent_room]
kind = "leak"
between = ["vent", "room"]
area = 0.01
model = "open"
[connections.rib_wall]
kind = "point"
between = ["rib", "wall"]
points = 3
[connections.deck_rib]
kind = "point"
between = ["deck", "rib"]
[connections.box_wall]
kind = "point"
between = ["wall", "box"]
[connections.roof_room]
kind = "radiation"
between = ["roof", "room"]
[connections.roof_out]
kind = "radiation"
between = ["roof", "outside"]
[connections.floor_room]
kind = "radiation"
between = ["floor", "room"]
[connections.wall_roof]
kind = "line"
between = ["wall", "roof"]
length = 1.5
[connections.floor_rib]
kind = "mount"
between = ["floor", "rib"]
points = 4
stiffness = 5e5
loss_factor = 0.1
[connections.mass_law]
kind = "nonresonant"
between = ["room", "outside"]
through = "wall"
[excitations.shaker]
subsystem = "rib"
force = 1.0
"""

KINDS = {"cavity", "duct", "plate", "sandwich_panel", "beam", "resonator",
         "cylindrical_shell", "ribbed_plate", "exterior"}  # fmt: skip
COUPLINGS = {"radiation", "leak", "point", "mount", "line", "nonresonant"}


def test_every_kind_connected_without_given_loss_factors(tmp_path, capsys):
    path = tmp_path / "every_kind.toml"
    path.write_text(MODEL)
    model = seatool.load(path)
    assert {s.kind for s in model.subsystems} == KINDS
    assert {c.kind for c in model.connections} == COUPLINGS
    res = seatool.run(model)
    assert res.solution.residual.max() <= 1e-9
    assert np.all(res.energy >= 0)
    # the nonresonant path into the exterior is stated from the room, without return
    c = next(c for c in model.connections if c.name == "mass_law")
    assert (c.a, c.b) == ("room", "outside")
    # a stiff spring on a thin plate is flagged as beyond weak coupling
    assert any("strongly coupled" in n for n in res.notes)
    assert main(["solve", str(path), "--show", "room"]) == 0
    assert "strongly coupled" in capsys.readouterr().out
