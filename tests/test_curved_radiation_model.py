"""End to end: a shell radiating into a cavity gets the curved-panel radiation efficiency.

The expected coupling loss factors are built here from the model file's own numbers
(materials as built in: aluminium E = 70 GPa, rho = 2700 kg/m^3, nu = 0.33, from memory of
handbook tables) with textbook definitions: f_c = c^2/(2 pi) sqrt(m''/D),
c_L' = sqrt(E/(rho (1 - nu^2))), eta = rho c sigma/(omega m'') (Lyon & DeJong 1995), and
sigma from seatool.physics.radiation_curved.radiation_efficiency_curved_panel (Szechenyi 1971;
its own checks are in tests/physics/test_radiation_curved.py).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

import seatool
from seatool.model import Model
from seatool.physics import radiation as rad
from seatool.physics import radiation_curved

ROOT = Path(__file__).resolve().parents[1]
E_AL, RHO_AL, NU_AL = 70e9, 2700.0, 0.33


def expected_eta(
    m: Model, shell: str, cavity: str, h: float, radius: float, lx: float, ly: float,
    *, closed: bool = False, curved: bool = True,
) -> np.ndarray:  # fmt: skip
    b = m.bands
    air = m.subsystem(cavity).props
    rho, c = float(air.density), float(air.sound_speed)
    mpa = RHO_AL * h
    d = E_AL * h**3 / (12 * (1 - NU_AL**2))
    fc = c**2 / (2 * math.pi) * math.sqrt(mpa / d)
    cl = math.sqrt(E_AL / (RHO_AL * (1 - NU_AL**2)))
    if curved:
        sigma = radiation_curved.radiation_efficiency_curved_panel(
            b.centre, lx, ly, fc, radius, longitudinal_speed=cl, poisson_ratio=NU_AL,
            closed=closed, f_lower=b.lower, f_upper=b.upper, c0=c,
        )  # fmt: skip
    else:
        sigma = rad.radiation_efficiency_band(
            b.centre, lx, ly, fc, f_lower=b.lower, f_upper=b.upper, c0=c
        )
    assert m.subsystem(shell).props.mass_per_area == mpa
    return np.asarray(rho * c * sigma / (b.omega * mpa))


def connection(m: Model, name: str):  # type: ignore[no-untyped-def]
    (c,) = [c for c in m.connections if c.name == name]
    return c


def test_rail_cab_roof_radiates_with_the_curved_sigma():
    # models/rail_cab.toml: roof = 3 mm aluminium, radius 3 m, 2.4 m x 2.9 m, into cab_air
    m = seatool.load(ROOT / "models" / "rail_cab.toml")
    c = connection(m, "roof_cab")
    want = expected_eta(m, "roof", "cab_air", 0.003, 3.0, 2.4, 2.9)
    np.testing.assert_allclose(c.coupling_loss_factor, want, rtol=1e-9)
    assert "Szechenyi" in c.provenance["coupling_loss_factor"]
    # below the ring frequency (c_L'/(2 pi a) = 286 Hz) the curved value is well above the
    # flat one (Szechenyi 1971); far above it they agree
    flat = expected_eta(m, "roof", "cab_air", 0.003, 3.0, 2.4, 2.9, curved=False)
    f_r = math.sqrt(E_AL / (RHO_AL * (1 - NU_AL**2))) / (2 * math.pi * 3.0)
    below = m.bands.upper < f_r
    assert below.sum() >= 3
    assert np.all(c.coupling_loss_factor[below] > 2.0 * flat[below])
    far = (m.bands.lower > 6 * f_r) & (m.bands.upper < 3000.0)
    np.testing.assert_allclose(c.coupling_loss_factor[far], flat[far], rtol=0.03)
    # flat plates of the same model keep the flat formula
    assert "Szechenyi" not in connection(m, "floor_cab").provenance["coupling_loss_factor"]
    res = seatool.run(m)
    assert res.solution.residual.max() <= 1e-9


HEAD = """
[bands]
spacing = "third-octave"
lowest = 100
highest = 2000

[subsystems.box]
kind = "cavity"
dimensions = [2.0, 2.0, 2.0]
damping = 0.05
"""


def test_closed_cylinder_and_method_option():
    text = HEAD + """
[subsystems.tube]
kind = "cylindrical_shell"
material = "aluminium"
thickness = 0.002
radius = 0.5
lx = 1.2
damping = 0.01

[subsystems.arc]
kind = "cylindrical_shell"
material = "aluminium"
thickness = 0.002
radius = 1.5
lx = 1.2
ly = 0.9
damping = 0.01

[connections.tube_box]
kind = "radiation"
between = ["tube", "box"]

[connections.arc_box]
kind = "radiation"
between = ["arc", "box"]
method = "maidanik"
"""
    m = seatool.loads(text)
    tube = connection(m, "tube_box")
    want = expected_eta(m, "tube", "box", 0.002, 0.5, 1.2, 2 * math.pi * 0.5, closed=True)
    np.testing.assert_allclose(tube.coupling_loss_factor, want, rtol=1e-9)
    # an explicitly chosen flat formula is honoured, and the provenance says so
    arc = connection(m, "arc_box")
    assert "curvature not included" in arc.provenance["coupling_loss_factor"]
    b = m.bands
    air = m.subsystem("box").props
    rho, c = float(air.density), float(air.sound_speed)
    h = 0.002
    fc = c**2 / (2 * math.pi) * math.sqrt(RHO_AL * h / (E_AL * h**3 / (12 * (1 - NU_AL**2))))
    sigma = rad.radiation_efficiency_band(
        b.centre, 1.2, 0.9, fc, method="maidanik", f_lower=b.lower, f_upper=b.upper, c0=c
    )
    np.testing.assert_allclose(
        arc.coupling_loss_factor, rho * c * sigma / (b.omega * RHO_AL * h), rtol=1e-9
    )
