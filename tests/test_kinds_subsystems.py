"""Subsystem kinds from materials and dimensions, and the force / diffuse-field excitations.

Checks against the outside world: exact mode enumeration (simply supported plate and
beam, rigid box), Long's f_c h table, Cremer's infinite-plate and infinite-beam point
mobilities written out here, and the SEA power balance of one isolated subsystem.
"""

from __future__ import annotations

import math
import sys
import types
from pathlib import Path

import numpy as np
import pytest

import seatool
from seatool.cli import main
from seatool.errors import InputError

ROOT = Path(__file__).resolve().parents[1]

HEAD = """
title = "t"
[bands]
lowest = {lo}
highest = {hi}
"""

# Steel as in the built-in table (E = 210 GPa, rho = 7850, nu = 0.30, eta = 2e-4).
E, RHO, NU = 2.10e11, 7850.0, 0.30


def model(body: str, lo: int = 100, hi: int = 4000) -> seatool.Model:
    return seatool.loads(HEAD.format(lo=lo, hi=hi) + body)


PLATE = """
[subsystems.floor]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 1.6
ly = 1.1
"""


def _d(h: float) -> float:
    return E * h**3 / (12 * (1 - NU**2))


# -- plates ---------------------------------------------------------------------------


def test_plate_properties_follow_the_contract():
    m = model(PLATE)
    s = m.subsystem("floor")
    p = s.properties
    for key in (
        "wave_type", "area", "lx", "ly", "perimeter", "thickness", "mass_per_area", "material",
        "wavenumber", "phase_speed", "group_speed", "critical_frequency", "bending_stiffness",
    ):  # fmt: skip
        assert key in p, key
    assert p["wave_type"] == "bending"
    assert p["area"] == pytest.approx(p["lx"] * p["ly"])
    assert p["perimeter"] == pytest.approx(2 * (1.6 + 1.1))
    assert p["mass_per_area"] == pytest.approx(RHO * 0.002)
    assert s.mass == pytest.approx(RHO * 0.002 * 1.6 * 1.1)
    assert p["bending_stiffness"] == pytest.approx(_d(0.002))
    # group speed of bending waves is twice the phase speed (Cremer et al. 2005, sec. 3.7)
    np.testing.assert_allclose(p["group_speed"], 2 * p["phase_speed"])
    np.testing.assert_allclose(p["phase_speed"], m.bands.omega / p["wavenumber"])
    assert {"density", "youngs_modulus", "poisson_ratio", "loss_factor"} <= set(p["material"])


def test_plate_critical_frequency_matches_long_table():
    # Long (2006), Architectural Acoustics, Table 9.1: f_c h = 12.4 Hz m for steel in air
    # (the table note allows 10 % variation).
    fc = model(PLATE).subsystem("floor").properties["critical_frequency"]
    assert fc * 0.002 == pytest.approx(12.4, rel=0.10)


def test_plate_modal_density_against_exact_simply_supported_count():
    # Exact natural frequencies of a simply supported Kirchhoff plate,
    # f_mn = (pi/2) sqrt(D/m'') ((m/a)^2 + (n/b)^2) (Cremer et al. 2005, sec. 7);
    # the band mode count over 1-4 kHz must match n(f) * bandwidth summed (within 5 %).
    m = model(PLATE, lo=1000, hi=4000)
    s = m.subsystem("floor")
    a, b, h = 1.6, 1.1, 0.002
    k = 0.5 * math.pi * math.sqrt(_d(h) / (RHO * h))
    i = np.arange(1, 200)
    fmn = k * ((i[:, None] / a) ** 2 + (i[None, :] / b) ** 2)
    exact = np.count_nonzero((fmn >= m.bands.lower[0]) & (fmn < m.bands.upper[-1]))
    predicted = float(np.sum(s.modal_density * m.bands.width))
    assert predicted == pytest.approx(exact, rel=0.05)


def test_point_force_on_isolated_plate_power_balance():
    # SEA power balance of one subsystem: P = omega eta E, E = M <v^2>, with the point
    # force power P = F^2 Re(Y), Re(Y) = 1 / (8 sqrt(D m'')) for the infinite plate
    # (Cremer, Heckl & Petersson 2005, ch. 4). Hence <v^2> = F^2 Re(Y) / (omega eta M).
    body = PLATE + "damping = 0.01\n[excitations.shaker]\nsubsystem = \"floor\"\nforce = 2.0\n"
    m = model(body)
    res = seatool.run(m)
    h, area = 0.002, 1.6 * 1.1
    mpa = RHO * h
    re_y = 1.0 / (8.0 * math.sqrt(_d(h) * mpa))
    v2 = 2.0**2 * re_y / (m.bands.omega * 0.01 * mpa * area)
    lv = 10 * np.log10(v2 / 1e-9**2)
    got = res.table().query("subsystem == 'floor'")["level_dB"].to_numpy()
    np.testing.assert_allclose(got, lv, atol=1e-9)
    src = res.sources()
    assert src["input_W"].iloc[0] == pytest.approx(4.0 * re_y * len(m.bands))


def test_damping_defaults_to_material_loss_factor_with_provenance():
    s = model(PLATE).subsystem("floor")
    np.testing.assert_allclose(s.damping, 2e-4)  # built-in steel (materials.csv)
    assert "material loss factor" in s.provenance["damping"]
    s2 = model(PLATE + "damping = 0.02\n").subsystem("floor")
    np.testing.assert_allclose(s2.damping, 0.02)
    assert s2.provenance["damping"] == "given"


def test_in_plane_fields_are_separate_subsystems_of_one_component():
    m = model(PLATE + 'wave_fields = ["bending", "longitudinal", "shear"]\n')
    names = [s.name for s in m.subsystems]
    assert names == ["floor", "floor.longitudinal", "floor.shear"]
    lo, sh = m.subsystem("floor.longitudinal"), m.subsystem("floor.shear")
    assert lo.component == sh.component == "floor"
    # c_L' = sqrt(E/(rho(1-nu^2))), c_S = sqrt(G/rho) (Cremer et al. 2005, sec. 3.3-3.4)
    c_l = math.sqrt(E / (RHO * (1 - NU**2)))
    c_s = math.sqrt(E / (2 * (1 + NU)) / RHO)
    np.testing.assert_allclose(lo.properties["phase_speed"], c_l)
    np.testing.assert_allclose(sh.properties["phase_speed"], c_s)
    # 2-D non-dispersive Weyl count n = 2 pi f S / c^2 (Lyon & DeJong 1995, from memory)
    np.testing.assert_allclose(lo.modal_density, 2 * np.pi * m.bands.centre * 1.76 / c_l**2)


def test_user_material_overrides_builtin_and_inline_base():
    user = '[materials.steel]\ndensity = 7800\nyoungs_modulus = 2.0e11\npoisson_ratio = 0.3\n'
    s = model(user + PLATE + "damping = 0.01\n").subsystem("floor")
    assert s.properties["material"]["density"] == 7800
    assert s.properties["material"]["loss_factor"] is None
    with pytest.raises(InputError, match="no loss_factor"):
        model(user + PLATE)  # no damping and no loss factor to default to
    body = PLATE.replace('"steel"', '{ base = "steel", loss_factor = 0.003 }')
    s = model(body).subsystem("floor")
    assert s.properties["material"]["density"] == RHO
    np.testing.assert_allclose(s.damping, 0.003)


def test_ribbed_plate_stiffer_along_ribs_and_bay_frequency():
    body = """
[subsystems.deck]
kind = "ribbed_plate"
material = "steel"
thickness = 0.004
lx = 3.0
ly = 2.0
rib_width = 0.01
rib_height = 0.08
rib_spacing = 0.5
"""
    p = model(body).subsystem("deck").properties
    assert p["bending_stiffness_x"] > 10 * p["bending_stiffness_y"]
    assert p["bending_stiffness_y"] == pytest.approx(_d(0.004))
    lo, hi = p["critical_frequency_range"]
    assert lo < p["critical_frequency"] < hi
    # first mode of a simply supported strip of width d (Kirchhoff): (pi/2) sqrt(D/m'')/d^2
    d = 0.49
    assert p["bay_frequency"] == pytest.approx(
        0.5 * math.pi * math.sqrt(_d(0.004) / (RHO * 0.004)) / d**2
    )
    assert p["mass_per_area"] == pytest.approx(RHO * (0.004 + 0.01 * 0.08 / 0.5))


def test_orthotropic_equal_stiffness_is_isotropic():
    d = _d(0.002)
    body = f"""
[subsystems.o]
kind = "orthotropic_plate"
material = "steel"
thickness = 0.002
lx = 1.6
ly = 1.1
bending_stiffness_x = {d}
bending_stiffness_y = {d}
"""
    o = model(body).subsystem("o")
    iso = model(PLATE).subsystem("floor")
    np.testing.assert_allclose(o.modal_density, iso.modal_density, rtol=1e-9)
    assert o.properties["critical_frequency"] == pytest.approx(
        iso.properties["critical_frequency"]
    )


def test_sandwich_limits_and_critical_frequency():
    body = """
[subsystems.s]
kind = "sandwich_panel"
face_material = "aluminium"
face_thickness = 0.0005
core_shear_modulus = 4e7
core_thickness = 0.02
core_density = 50
lx = 1.0
ly = 1.0
"""
    m = model(body, lo=50, hi=8000)
    s = m.subsystem("s")
    p = s.properties
    # at the critical frequency the phase speed equals the speed of sound (definition)
    from seatool.physics.sandwich import sandwich_phase_speed

    assert float(sandwich_phase_speed(p["critical_frequency"], p["section"])) == pytest.approx(
        343.2, rel=1e-8
    )
    assert p["thickness"] == pytest.approx(0.021)
    assert p["mass_per_area"] == pytest.approx(2 * 2700 * 0.0005 + 50 * 0.02)
    assert np.all(np.diff(s.modal_density) > 0)


def test_shell_far_above_ring_frequency_tends_to_flat_plate():
    body = """
[subsystems.roof]
kind = "cylindrical_shell"
material = "aluminium"
thickness = 0.002
radius = 0.3
lx = 2.0
"""
    m = model(body, lo=1000, hi=16000)
    s = m.subsystem("roof")
    p = s.properties
    assert p["ly"] == pytest.approx(2 * math.pi * 0.3)
    assert p["ring_frequency"] == pytest.approx(
        math.sqrt(7.0e10 / (2700 * (1 - 0.33**2))) / (2 * math.pi * 0.3)
    )
    # far above the ring frequency n -> n_plate (1 + 3/(16 x^2)) (Heckl-type dispersion,
    # docs/theory/subsystems.md sec. 4); x = f / f_m > 5 here: within 1 %
    d = 7.0e10 * 0.002**3 / (12 * (1 - 0.33**2))
    n_plate = 0.5 * p["area"] * math.sqrt(2700 * 0.002 / d)
    assert s.modal_density[-1] == pytest.approx(n_plate, rel=0.01)


def test_shell_band_average_against_quad():
    # the band average of the continuous shell count (log-singular at f_m) against
    # scipy.integrate.quad with the singular point declared (independent numerics)
    from scipy import integrate

    from seatool.physics.shells import shell_bending_modal_density

    body = """
[subsystems.roof]
kind = "cylindrical_shell"
material = "aluminium"
thickness = 0.003
radius = 3.0
lx = 2.4
ly = 2.9
damping = 0.01
"""
    m = model(body, lo=160, hi=400)
    s = m.subsystem("roof")
    e, rho, nu = 7.0e10, 2700.0, 0.33
    f_m = math.sqrt(e / rho) / (2 * math.pi * 3.0)
    b = m.bands
    assert b.lower[2] < f_m < b.upper[2]  # the singular point lies in the 250 Hz band
    for j in range(len(b)):
        ref = integrate.quad(
            lambda f: float(shell_bending_modal_density(f, 2.4 * 2.9, 3.0, 0.003, e, rho, nu)),
            b.lower[j], b.upper[j], points=[f_m] if b.lower[j] < f_m < b.upper[j] else None,
            limit=200, epsrel=1e-11,
        )[0] / b.width[j]  # fmt: skip
        assert s.modal_density[j] == pytest.approx(ref, rel=1e-6)


# -- beams ----------------------------------------------------------------------------

BEAM = """
[subsystems.rail]
kind = "beam"
material = "steel"
length = 3.0
section = { shape = "rectangular", width = 0.04, height = 0.1 }
wave_fields = ["bending_y", "bending_z", "longitudinal", "torsion"]
damping = 0.01
"""


def test_beam_fields_and_exact_bending_count():
    m = model(BEAM, lo=50, hi=8000)
    assert [s.name for s in m.subsystems] == [
        "rail", "rail.bending_z", "rail.longitudinal", "rail.torsion",
    ]  # fmt: skip
    s = m.subsystem("rail")
    p = s.properties
    assert p["mass_per_length"] == pytest.approx(RHO * 0.004)
    assert p["section"]["I_y"] == pytest.approx(0.04 * 0.1**3 / 12)
    # simply supported Euler-Bernoulli beam: f_n = (pi/2) (n/L)^2 sqrt(EI/m')
    # (Cremer et al. 2005, sec. 3.5); count within +-1 mode of the sum of n(f) df
    k = 0.5 * math.pi * math.sqrt(E * p["section"]["I_y"] / p["mass_per_length"]) / 3.0**2
    fn = k * np.arange(1, 500) ** 2
    exact = np.count_nonzero((fn >= m.bands.lower[0]) & (fn < m.bands.upper[-1]))
    assert float(np.sum(s.modal_density * m.bands.width)) == pytest.approx(exact, abs=1.0)
    # rod: n = 2 L / c_L with c_L = sqrt(E/rho)
    np.testing.assert_allclose(
        m.subsystem("rail.longitudinal").modal_density, 2 * 3.0 / math.sqrt(E / RHO)
    )


def test_force_on_beam_uses_infinite_beam_mobility():
    # Re Y = 1 / (4 m' c_B) inside an infinite beam, 4x that at a free end
    # (Cremer et al. 2005, ch. 4); c_B = (omega^2 E I / m')^(1/4)
    body = BEAM + '[excitations.f]\nsubsystem = "rail"\nforce = 1.0\n'
    m = model(body)
    mpl, i = RHO * 0.004, 0.04 * 0.1**3 / 12
    c_b = (m.bands.omega**2 * E * i / mpl) ** 0.25
    e = m.excitations[0]
    assert e.power is not None
    np.testing.assert_allclose(e.power, 1.0 / (4 * mpl * c_b))
    m2 = model(body + 'position = "end"\n')
    assert m2.excitations[0].power is not None
    np.testing.assert_allclose(m2.excitations[0].power, 1.0 / (mpl * c_b))


# -- acoustic subsystems ------------------------------------------------------------------


def test_cavity_from_dimensions_reproduces_exact_room_mode_count():
    # rigid box 2.0 x 1.5 x 1.0 m: enumerate f_lmn = (c/2) sqrt((l/Lx)^2 + (m/Ly)^2 +
    # (n/Lz)^2) (Morse & Bolt 1944) and compare per band with n(f) * bandwidth, 500 Hz -
    # 2 kHz, within 12 % per band and 4 % over the range.
    body = """
[subsystems.cab]
kind = "acoustic_cavity"
dimensions = [2.0, 1.5, 1.0]
damping = 0.05
"""
    m = model(body, lo=500, hi=2000)
    s = m.subsystem("cab")
    c = 343.2
    idx = np.arange(0, 40)
    l, mm, n = np.meshgrid(idx, idx, idx, indexing="ij")
    f = 0.5 * c * np.sqrt((l / 2.0) ** 2 + (mm / 1.5) ** 2 + (n / 1.0) ** 2).ravel()
    f = f[f > 0]
    edges = zip(m.bands.lower, m.bands.upper, strict=True)
    exact = np.array([np.count_nonzero((f >= lo) & (f < hi)) for lo, hi in edges])
    predicted = s.modal_density * m.bands.width
    np.testing.assert_allclose(predicted, exact, rtol=0.12)
    assert predicted.sum() == pytest.approx(exact.sum(), rel=0.04)
    p = s.properties
    assert p["volume"] == pytest.approx(3.0)
    assert p["surface_area"] == pytest.approx(2 * (3.0 + 1.5 + 2.0))
    assert p["edge_length"] == pytest.approx(4 * 4.5)
    assert p["density"] == pytest.approx(1.204) and p["sound_speed"] == pytest.approx(c)


def test_cavity_given_modal_density_and_builtin_fluid():
    body = """
[subsystems.tank]
kind = "acoustic_cavity"
volume = 2.0
modal_density = 0.4
fluid = "water"
damping = 0.01
"""
    s = model(body).subsystem("tank")
    np.testing.assert_allclose(s.modal_density, 0.4)
    assert s.sound_speed == pytest.approx(1482.0) and s.provenance["modal_density"] == "given"


def test_duct_cut_on_and_modal_density():
    body = """
[subsystems.d]
kind = "duct"
length = 4.0
width = 0.3
height = 0.2
damping = 0.05
"""
    s = model(body).subsystem("d")
    # first cross mode of a rigid rectangular duct: c / (2 max(w, h)) (Kinsler et al. 2000)
    assert s.properties["cut_on_frequency"] == pytest.approx(343.2 / 0.6)
    np.testing.assert_allclose(s.modal_density, 2 * 4.0 / 343.2)
    assert s.volume == pytest.approx(4.0 * 0.06)


def test_resonator_holds_about_one_mode():
    body = """
[subsystems.r]
kind = "resonator"
mass = 2.0
stiffness = 7.9e5
loss_factor = 0.05
"""
    m = model(body, lo=20, hi=20000)
    s = m.subsystem("r")
    f0 = math.sqrt(7.9e5 / 2.0) / (2 * math.pi)
    assert s.properties["natural_frequency"] == pytest.approx(f0)
    total = float(np.sum(s.modal_density * m.bands.width))
    # one Lorentzian mode of half-power bandwidth eta f0; the tails outside the band range
    # hold about (eta f0 / 2) / pi * (1/(f0 - f_low) + 1/(f_high - f0)) of it
    tails = 0.025 * f0 / math.pi * (1 / (f0 - m.bands.lower[0]) + 1 / (m.bands.upper[-1] - f0))
    assert total == pytest.approx(1 - tails, abs=2e-3)


# -- diffuse field --------------------------------------------------------------------------


def test_diffuse_field_power_by_sea_reciprocity():
    # P = omega eta_cp E_c with E_c = <p^2> V / (rho c^2), eta_cp = eta_pc n_p / n_c,
    # eta_pc = rho c sigma / (omega m''), n_c = 4 pi f^2 V / c^3 (Lyon & DeJong 1995):
    # written out here with an arbitrary V, which must cancel.
    from seatool.physics.radiation import radiation_efficiency_band

    body = PLATE + '[excitations.room]\nsubsystem = "floor"\ndiffuse_sound_pressure_level = 94\n'
    m = model(body)
    s = m.subsystem("floor")
    p = s.properties
    b = m.bands
    sigma = radiation_efficiency_band(
        b.centre, 1.6, 1.1, p["critical_frequency"], f_lower=b.lower, f_upper=b.upper, c0=343.2
    )
    rho, c, vol = 1.204, 343.2, 37.0
    p2 = (2e-5) ** 2 * 10 ** (94 / 10)
    e_c = p2 * vol / (rho * c**2)
    eta_pc = rho * c * sigma / (b.omega * p["mass_per_area"])
    n_c = 4 * np.pi * b.centre**2 * vol / c**3
    expected = b.omega * eta_pc * s.modal_density / n_c * e_c
    assert m.excitations[0].power is not None
    np.testing.assert_allclose(m.excitations[0].power, expected, rtol=1e-12)


# -- treatment hook ---------------------------------------------------------------------------


class _FakeTreatment:
    def __init__(self, nb: int) -> None:
        self.added_mass_per_area = 5.0
        self.loss_factor = np.full(nb, 0.05)
        self.insertion_loss_db = None
        self.face = None
        self.description = "fake layer"


def test_treatment_hook_adds_mass_and_damping(monkeypatch):
    seen = {}

    def read_plate_treatment(rd, value, path, plate):  # type: ignore[no-untyped-def]
        seen.update(value=value, path=path, plate=dict(plate))
        return _FakeTreatment(len(plate["bands"]))

    fake = types.ModuleType("seatool.kinds.treatment")
    fake.read_plate_treatment = read_plate_treatment  # type: ignore[attr-defined]
    monkeypatch.setitem(sys.modules, "seatool.kinds.treatment", fake)
    s = model(PLATE + 'treatment = { layer = "x" }\n').subsystem("floor")
    assert seen["value"] == {"layer": "x"} and seen["path"] == "subsystems.floor.treatment"
    assert seen["plate"]["mass_per_area"] == pytest.approx(RHO * 0.002)  # bare plate
    assert s.properties["mass_per_area"] == pytest.approx(RHO * 0.002 + 5.0)
    assert s.mass == pytest.approx((RHO * 0.002 + 5.0) * 1.76)
    np.testing.assert_allclose(s.damping, 0.05)
    assert isinstance(s.properties["treatment"], _FakeTreatment)
    # added mass lowers the plate's bending stiffness-to-mass ratio: n ~ sqrt(m'')
    bare = model(PLATE).subsystem("floor")
    ratio = math.sqrt((RHO * 0.002 + 5.0) / (RHO * 0.002))
    np.testing.assert_allclose(s.modal_density, bare.modal_density * ratio)
    s2 = model(PLATE + 'damping = 0.01\ntreatment = { layer = "x" }\n').subsystem("floor")
    np.testing.assert_allclose(s2.damping, 0.01)  # explicit damping wins


# -- shipped models -----------------------------------------------------------------------------


@pytest.mark.parametrize("name", ["compressor_enclosure.toml", "rail_cab.toml"])
def test_shipped_models_solve(name):
    res = seatool.run(seatool.load(ROOT / "models" / name))
    assert res.solution.residual.max() <= 1e-9


def test_check_reports_input_power_per_source(tmp_path, capsys):
    path = tmp_path / "m.toml"
    path.write_text(
        HEAD.format(lo=100, hi=1000)
        + PLATE
        + '[excitations.shaker]\nsubsystem = "floor"\nforce = 1.0\n'
    )
    assert main(["check", str(path)]) == 0
    out = capsys.readouterr().out
    assert "shaker: input power into floor from force" in out
    assert "total input power of the sources" in out


# -- bad input: one line, exit 2, key path ------------------------------------------------

BAD = [
    ("unknown-material", '"steel"', '"stel"', ["subsystems.floor.material", "did you mean 'steel'"]),
    ("negative-thickness", "thickness = 0.002", "thickness = -0.002",
     ["subsystems.floor.thickness", "must be > 0"]),
    ("missing-lx", "lx = 1.6\n", "", ["subsystems.floor.lx", "missing required key"]),
    ("bad-field", "ly = 1.1\n", 'ly = 1.1\nwave_fields = ["bending", "torsion"]\n',
     ["subsystems.floor.wave_fields", "unknown wave field 'torsion'"]),
    ("no-bending", "ly = 1.1\n", 'ly = 1.1\nwave_fields = ["shear"]\n',
     ["subsystems.floor.wave_fields", "must include 'bending'"]),
    ("inline-base", '"steel"', '{ base = "steal", density = 7000 }',
     ["subsystems.floor.material.base", "did you mean 'steel'"]),
    ("inline-nu", '"steel"', '{ base = "steel", poisson_ratio = 0.6 }',
     ["subsystems.floor.material.poisson_ratio", "< 0.5"]),
    ("unknown-fluid", "ly = 1.1\n", 'ly = 1.1\nfluid = "helium"\n',
     ["subsystems.floor.fluid", "unknown fluid 'helium'"]),
    ("force-on-cavity", 'subsystem = "floor"', 'subsystem = "air"',
     ["excitations.shaker.force", "'air' is of kind acoustic_cavity"]),
    ("force-position", "force = 1.0", 'force = 1.0\nposition = "end"',
     ["excitations.shaker.position", "beams only"]),
    ("cavity-dims", "dimensions = [2.0, 1.5, 1.0]", "dimensions = [2.0, 1.5]",
     ["subsystems.air.dimensions", "three lengths"]),
    ("cavity-missing", "dimensions = [2.0, 1.5, 1.0]", "volume = 3.0",
     ["subsystems.air.surface_area", "missing required key"]),
    ("cavity-area", "dimensions = [2.0, 1.5, 1.0]",
     "volume = 3.0\nsurface_area = 1.0\nedge_length = 10.0",
     ["subsystems.air.surface_area", "cannot enclose"]),
]  # fmt: skip

BAD_GOOD = (
    HEAD.format(lo=100, hi=1000)
    + PLATE
    + """
[subsystems.air]
kind = "acoustic_cavity"
dimensions = [2.0, 1.5, 1.0]
damping = 0.05
[connections.c]
between = ["floor", "air"]
coupling_loss_factor = 1e-3
[excitations.shaker]
subsystem = "floor"
force = 1.0
"""
)


def test_bad_input_baseline_solves(tmp_path, capsys):
    path = tmp_path / "m.toml"
    path.write_text(BAD_GOOD)
    assert main(["solve", str(path)]) == 0


@pytest.mark.parametrize(("frm", "to", "frags"), [c[1:] for c in BAD], ids=[c[0] for c in BAD])
def test_bad_input_one_line(tmp_path, capsys, frm, to, frags):
    assert frm in BAD_GOOD
    path = tmp_path / "m.toml"
    path.write_text(BAD_GOOD.replace(frm, to, 1))
    code = main(["solve", str(path)])
    err = [ln for ln in capsys.readouterr().err.splitlines() if ln.strip()]
    assert code == 2
    assert len(err) == 1, err
    for frag in frags:
        assert frag in err[0], (frag, err[0])


OTHER_BAD = [
    ("beam-shape", BEAM.replace('shape = "rectangular"', 'shape = "rectangle"'),
     "subsystems.rail.section.shape", "did you mean 'rectangular'"),
    ("beam-field", BEAM.replace('"torsion"]', '"twist"]'),
     "subsystems.rail.wave_fields", "unknown wave field 'twist'"),
    ("duct-section", '[subsystems.d]\nkind = "duct"\nlength = 2.0\ndamping = 0.1\n',
     "subsystems.d", "width and height, or as diameter"),
    ("resonator-eta", '[subsystems.r]\nkind = "resonator"\nmass = 1.0\nstiffness = 1e5\n',
     "subsystems.r.loss_factor", "missing required key"),
    ("shell-thick", '[subsystems.s]\nkind = "cylindrical_shell"\nmaterial = "steel"\n'
     'thickness = 0.2\nradius = 1.0\nlx = 1.0\n', "subsystems.s.thickness", "thickness << radius"),
    ("sandwich-key", '[subsystems.s]\nkind = "sandwich_panel"\nface_material = "aluminium"\n'
     'face_thickness = 0.001\ncore_shear_modulus = 2e7\ncore_thickness = 0.02\n'
     'core_density = 50\nlx = 1.0\nly = 1.0\ncore_modulus = 3\n',
     "subsystems.s.core_modulus", "unknown key"),
]  # fmt: skip


@pytest.mark.parametrize(
    ("body", "where", "frag"), [c[1:] for c in OTHER_BAD], ids=[c[0] for c in OTHER_BAD]
)
def test_other_kinds_bad_input_one_problem(body, where, frag):
    with pytest.raises(InputError) as exc:
        model(body)
    probs = exc.value.problems
    assert len(probs) == 1, [str(p) for p in probs]
    assert probs[0].path == where and frag in probs[0].message, str(probs[0])
