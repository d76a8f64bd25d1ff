"""One treatment declaration with all its effects (``facing``): the cavity's absorption from
the trim, the insertion loss into it, the same result as the older double declaration, the
linings' mass, and the errors."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
from scipy.integrate import solve_ivp

import seatool
from seatool.analysis.treatment_mass import added_mass_table, total_added_mass
from seatool.catalogue import load_treatments, to_tmm_layer
from seatool.errors import InputError
from seatool.physics import tmm, tmm_transmission

ROOT = Path(__file__).resolve().parent.parent
TREATED = (ROOT / "models" / "treated_floor.toml").read_text()
LX, LY = 1.6, 1.1
DIMS = (1.8, 1.6, 1.2)
C0, RHO0 = 343.0, 1.204  # seatool's default air (physics/air.py: 20 C, 101.325 kPa)


def _double(text: str) -> str:
    """The same model with the older double declaration: face on the floor and the trim
    listed again in the cabin's surfaces."""
    out = text.replace('facing = "cabin"', 'face = "cabin"').replace(
        '    { area = 2.9, lining = "absorber_blanket_25mm", description = "headliner" },\n',
        '    { area = 2.9, lining = "absorber_blanket_25mm", description = "headliner" },\n'
        '    { area = 1.76, lining = "spring_mass_5kg", description = "floor trim" },\n',
    )
    assert out.count("spring_mass_5kg") == 2
    return out


def _lined(trim: str, damping: str, *, key: str = "facing") -> str:
    lx, ly, lz = DIMS
    return f"""
[bands]
spacing = "third-octave"
lowest = 100
highest = 4000
[subsystems.floor]
kind = "plate"
material = "steel"
thickness = 0.0015
lx = {LX}
ly = {LY}
damping = 0.01
treatment = {{ trim = "{trim}", {key} = "room" }}
[subsystems.room]
kind = "cavity"
dimensions = [{lx}, {ly}, {lz}]
damping = {damping}
[connections.floor_room]
kind = "radiation"
between = ["floor", "room"]
[excitations.shaker]
subsystem = "floor"
force = 1.0
"""


def _blanket_alpha(f: np.ndarray) -> np.ndarray:
    # The lining's diffuse-field absorption coefficient: the catalogue's glass-fibre
    # blanket (JCA, rigid frame) on a rigid backing, Paris integral of the transfer-matrix
    # plane-wave absorption (Allard & Atalla 2009; Paris 1928).
    layer = to_tmm_layer(load_treatments()["glass_fibre_light"])
    return tmm.diffuse_absorption(f, [layer], backing="rigid", rho0=RHO0, c0=C0)


def _t30_from_decay(f: float, eta: float) -> float:
    """T (T30) from a simulated energy decay dE/dt = -omega eta E, evaluated as ISO 3382-2
    does: a least-squares line through the decay from -5 dB to -35 dB, extrapolated to 60 dB."""
    omega = 2 * np.pi * f
    t_end = 10.0 / (omega * eta)
    sol = solve_ivp(lambda _t, e: -omega * eta * e, (0.0, t_end), [1.0], rtol=1e-10, atol=1e-14,
                    dense_output=True)  # fmt: skip
    t = np.linspace(0.0, t_end, 4001)
    level = 10 * np.log10(sol.sol(t)[0])
    sel = (level <= -5.0) & (level >= -35.0)
    slope = np.polyfit(t[sel], level[sel], 1)[0]
    return -60.0 / slope


def test_lined_cavity_reverberation_time_is_sabines():
    # A room with 12 m^2 of hard surface (alpha 0.02) and the floor's blanket declared once
    # (facing). Its reverberation time from a decay equals Sabine's (Sabine 1922):
    # T = 24 ln(10) V / (c A), A = 12 x 0.02 + S_floor x alpha_blanket.
    model = seatool.loads(
        _lined(
            "absorber_blanket_25mm",
            '{ surfaces = [ { area = 12.0, absorption = 0.02 } ], method = "sabine" }',
        )
    )
    room = model.subsystems[model.index()["room"]]
    f = np.asarray(model.bands.centre)
    vol = float(np.prod(DIMS))
    area = 12.0 * 0.02 + LX * LY * _blanket_alpha(f)
    t_sabine = 24 * np.log(10) * vol / (C0 * area)
    for j in (0, 6, 12, len(f) - 1):
        assert _t30_from_decay(float(f[j]), float(room.damping[j])) == pytest.approx(
            t_sabine[j], rel=2e-3
        )
    # Without the facing trim's absorption the room would ring far longer (the check can fail)
    assert np.all(LX * LY * _blanket_alpha(f)[6:] > 0.5 * 12.0 * 0.02)


def test_facing_adds_the_absorption_area_to_a_given_loss_factor():
    # A room with a stated loss factor: the facing blanket adds its Sabine absorption area,
    # eta = eta0 + c S alpha / (8 pi f V) (Sabine's absorption areas add; Kuttruff,
    # Room Acoustics, from memory).
    model = seatool.loads(_lined("absorber_blanket_25mm", "0.004"))
    room = model.subsystems[model.index()["room"]]
    f = np.asarray(model.bands.centre)
    vol = float(np.prod(DIMS))
    t_expected = 1.0 / (
        1.0 / (np.log(1e6) / (2 * np.pi * f * 0.004))
        + C0 * LX * LY * _blanket_alpha(f) / (24 * np.log(10) * vol)
    )
    got = [_t30_from_decay(float(f[j]), float(room.damping[j])) for j in range(len(f))]
    np.testing.assert_allclose(got, t_expected, rtol=2e-3)
    assert "trim of 'floor'" in room.provenance["damping_treatments"]


def test_insertion_loss_is_the_transfer_matrix_value():
    # The floor's coupling into the room is reduced by the trim's insertion loss, which is
    # the transfer-matrix value for the plate plus the 5 kg/m^2 spring-mass build-up
    # (Allard & Atalla 2009, field incidence), computed here from the physics module.
    bare = seatool.loads(_lined("absorber_blanket_25mm", "0.01").replace(
        'treatment = { trim = "absorber_blanket_25mm", facing = "room" }', ""))  # fmt: skip
    # Without fixings (fixings_per_area = 0) the trim is the uniform layer the transfer
    # matrix describes; the default fixings bridge it (tests/physics/test_bridges.py).
    treated = seatool.loads(_lined("spring_mass_5kg", "0.01").replace(
        'facing = "room" }', 'facing = "room", fixings_per_area = 0 }'))  # fmt: skip
    f = np.asarray(treated.bands.centre)
    mat = treated.subsystems[treated.index()["floor"]].props.material
    plate = tmm.PlateLayer(0.0015, mat.youngs_modulus, mat.density, mat.poisson_ratio, 0.01)
    cat = load_treatments()
    foam = to_tmm_layer(cat["pu_foam_open_cell"])
    heavy = to_tmm_layer(cat["heavy_layer_5kg"])
    il = tmm_transmission.insertion_loss(f, [plate], [foam, heavy], rho0=RHO0, c0=C0)
    ratio = treated.connections[0].coupling_loss_factor / bare.connections[0].coupling_loss_factor
    np.testing.assert_allclose(10 * np.log10(ratio), -il.insertion_loss, atol=0.05)
    assert np.max(il.insertion_loss) > 10.0  # a real reduction: the check can fail


def test_declaring_once_equals_the_double_declaration():
    once = seatool.loads(TREATED)
    twice = seatool.loads(_double(TREATED))
    for a, b in zip(once.subsystems, twice.subsystems, strict=True):
        np.testing.assert_allclose(a.damping, b.damping, rtol=1e-12, atol=0)
        np.testing.assert_allclose(a.modal_density, b.modal_density, rtol=1e-12, atol=0)
    for a, b in zip(once.connections, twice.connections, strict=True):
        np.testing.assert_allclose(a.coupling_loss_factor, b.coupling_loss_factor, rtol=1e-12)
    l1 = seatool.run(once).level_array()[0]
    l2 = seatool.run(twice).level_array()[0]
    np.testing.assert_allclose(l1, l2, rtol=0, atol=1e-12)
    # the mass is counted once either way: floor sheet + trim, and the headliner lining
    assert total_added_mass(once) == pytest.approx(total_added_mass(twice), rel=1e-12)
    table = added_mass_table(once)
    assert list(table["subsystem"]) == ["floor", "cabin"]
    # glass_fibre_light 25 mm at 16 kg/m^3 on 2.9 m^2 (catalogue values, invented typical)
    assert table.iloc[1]["added_kg"] == pytest.approx(0.025 * 16 * 2.9, rel=1e-9)


@pytest.mark.parametrize(
    ("text", "path", "words"),
    [
        (
            TREATED.replace(
                '    { area = 2.9, lining = "absorber_blanket_25mm"',
                '    { area = 1.76, lining = "spring_mass_5kg" },\n'
                '    { area = 2.9, lining = "absorber_blanket_25mm"',
            ),
            "subsystems.cabin.damping.surfaces[1]",
            "declared twice",
        ),  # fmt: skip
        (
            TREATED.replace('facing = "cabin"', 'facing = "cabin", face = "cabin"'),
            "subsystems.floor.treatment.facing",
            "not both",
        ),  # fmt: skip
        (
            TREATED.replace('trim = "spring_mass_5kg", ', ""),
            "subsystems.floor.treatment.facing",
            "only with a trim",
        ),  # fmt: skip
        (
            TREATED.replace('facing = "cabin"', 'facing = "floor"'),
            "subsystems.floor.treatment.facing",
            "'floor' is not a cavity",
        ),  # fmt: skip
    ],
)
def test_errors_name_the_key(text, path, words):
    with pytest.raises(InputError) as err:
        seatool.loads(text)
    msgs = [f"{p.path}: {p.message}" for p in err.value.problems]
    assert len(msgs) == 1, msgs
    assert msgs[0].startswith(path) and words in msgs[0]


def test_declared_twice_on_the_command_line(tmp_path):
    bad = tmp_path / "m.toml"
    bad.write_text(
        TREATED.replace(
            '    { area = 2.9, lining = "absorber_blanket_25mm"',
            '    { area = 1.76, lining = "spring_mass_5kg" },\n'
            '    { area = 2.9, lining = "absorber_blanket_25mm"',
        )
    )
    run = subprocess.run(
        [sys.executable, "-m", "seatool", "check", str(bad)],
        capture_output=True, text=True, cwd=ROOT, check=False,
    )  # fmt: skip
    assert run.returncode == 2
    assert "declared twice" in run.stderr and "Traceback" not in run.stderr
