"""Damping forms and plate treatments read from model files, checked end to end.

Expected values are derived here from the published formulas (sources beside each test),
never from the reader under test.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from scipy import integrate

import seatool
from seatool.cli import main
from seatool.kinds.plate_treatment import PlateTreatment

RHO, C = 1.204, 343.2  # the model file's default air (docs/model-format.md)
P0 = 20e-6  # reference sound pressure [Pa] (ISO 1683)


def _solve(tmp_path: Path, text: str, name: str = "m.toml") -> tuple[seatool.Model, seatool.Result]:
    path = tmp_path / name
    path.write_text(text)
    model = seatool.load(path)
    return model, seatool.run(model)


def _level(result: seatool.Result, sub: str) -> np.ndarray:
    t = result.table()
    return t[t["subsystem"] == sub]["level_dB"].to_numpy()


def _energy(result: seatool.Result, sub: str) -> np.ndarray:
    t = result.table()
    return t[t["subsystem"] == sub]["energy_J"].to_numpy()


def _room(
    damping: str, *, bands: str = "lowest = 125\nhighest = 4000", volume: float = 60.0
) -> str:
    return f"""
[bands]
{bands}
[subsystems.room]
kind = "cavity"
volume = {volume}
modal_density = 1.0
damping = {damping}
[excitations.source]
subsystem = "room"
power = 1e-3
"""


def _reverberant_spl(w: float, a: np.ndarray) -> np.ndarray:
    """Lp = Lw + 10 lg(4/A) + 10 lg(rho c/400): classical reverberant field (Kuttruff,
    Room Acoustics, from memory); Lw re 1 pW."""
    lw = 10 * np.log10(w / 1e-12)
    return lw + 10 * np.log10(4.0 / a) + 10 * np.log10(RHO * C / 400.0)


# ------------------------------------------------------------------------------------------
# reverberation time, absorption area, surfaces


def test_reverberation_time_round_trip_through_power_balance(tmp_path):
    # eta = 2.2/(f T60) (common practice; Cremer, Heckl & Petersson 2005 ch. 3): the solved
    # steady state gives eta = W/(omega E), from which T60 = 2.2/(f eta) must come back.
    t60 = [0.9, 0.8, 0.8, 0.7, 0.6, 0.6]
    text = _room(
        "{ reverberation_time = { band_hz = [250, 315, 400, 500, 630, 800], "
        f"values = {t60} }} }}",
        bands="lowest = 250\nhighest = 800",
    )
    model, res = _solve(tmp_path, text)
    f = model.bands.centre
    eta = 1e-3 / (2 * np.pi * f * _energy(res, "room"))
    np.testing.assert_allclose(2.2 / (f * eta), t60, rtol=1e-9)


def test_reverberation_time_on_a_structure(tmp_path):
    text = """
[bands]
lowest = 1000
highest = 1000
[subsystems.frame]
kind = "structure"
mass = 5.0
modal_density = 0.1
damping = { reverberation_time = 0.05 }
"""
    (tmp_path / "s.toml").write_text(text)
    m = seatool.load(tmp_path / "s.toml")
    f = m.bands.centre
    np.testing.assert_allclose(m.subsystem("frame").damping, 2.2 / (f * 0.05), rtol=1e-12)


def test_absorption_area_gives_the_reverberant_field_level(tmp_path):
    # Classical diffuse field: Lp = Lw + 10 lg(4/A) + 10 lg(rho c/400) (Kuttruff, from memory)
    _, res = _solve(tmp_path, _room("{ absorption_area = 12.0 }"))
    np.testing.assert_allclose(
        _level(res, "room"), _reverberant_spl(1e-3, np.array(12.0)), atol=1e-9
    )


def test_sabine_reverberation_time_0161(tmp_path):
    # Sabine T60 = 0.161 V/A (c = 343 m/s; Sabine 1922, ISO 354 clause 8): with A from the
    # file, the loss factor must give that T60 through eta = 2.2/(f T60) (to the 0.2 %
    # difference between 2.2 and ln(1e6)/(2 pi) and between 0.161 and 55.26/343.2).
    model, _ = _solve(tmp_path, _room("{ absorption_area = 12.0 }", volume=60.0))
    f = model.bands.centre
    t60 = 2.2 / (f * model.subsystem("room").damping)
    np.testing.assert_allclose(t60, 0.161 * 60.0 / 12.0, rtol=3e-3)


def test_air_absorption_matches_iso_9613_2_table(tmp_path):
    # ISO 9613-2:1996 Table 2, 20 C, 70 % RH, octave bands 500 Hz - 8 kHz [dB/km]
    # (values from memory): the air adds 4 m V to A, m = alpha/4.343 (ISO 354).
    alpha_db_km = np.array([2.8, 5.0, 9.0, 22.9, 76.6])
    tol = np.maximum(0.06, 0.005 * alpha_db_km)  # table rounding (docs/theory/treatment.md 3)
    v, a = 200.0, 20.0
    text = _room(
        "{ absorption_area = 20.0, air_absorption = { temperature = 20, relative_humidity = 70 } }",
        bands='spacing = "octave"\nlowest = 500\nhighest = 8000',
        volume=v,
    )
    _, res = _solve(tmp_path, text)
    lp = _level(res, "room")

    def spl(alpha: np.ndarray) -> np.ndarray:
        m = alpha / 1000.0 / (10 * math.log10(math.e))
        return _reverberant_spl(1e-3, a + 4 * m * v)

    hi, lo = spl(alpha_db_km - tol), spl(alpha_db_km + tol)
    assert np.all(lp <= hi + 1e-9) and np.all(lp >= lo - 1e-9), (lo, lp, hi)
    assert lp[-1] < _reverberant_spl(1e-3, np.array(a)) - 2.0  # 4 m V = 14 m^2 at 8 kHz


def _surfaces_model(tmp_path: Path, alphas: list[float], method: str | None = None) -> np.ndarray:
    surfaces = ", ".join(
        f"{{ area = {s}, absorption = {al} }}"
        for s, al in zip([40.0, 30.0, 20.0], alphas, strict=True)
    )
    meth = f', method = "{method}"' if method else ""
    _, res = _solve(tmp_path, _room(f"{{ surfaces = [{surfaces}]{meth} }}"))
    return _level(res, "room")


@pytest.mark.parametrize(
    ("alphas", "method", "rule"),
    [
        ([0.2, 0.2, 0.2], None, "sabine"),  # mean exactly 0.2: Sabine (switch is "> 0.2")
        ([0.05, 0.3, 0.3], None, "sabine"),  # mean 0.189
        ([0.3, 0.3, 0.3], None, "eyring"),  # mean 0.3 > 0.2: Eyring
        ([0.1, 0.5, 0.9], None, "eyring"),
        ([0.3, 0.3, 0.3], "sabine", "sabine"),
        ([0.05, 0.05, 0.05], "eyring", "eyring"),
    ],
)
def test_surfaces_sabine_eyring_switch(tmp_path, alphas, method, rule):
    # Sabine A = sum S alpha; Eyring A = -S ln(1 - mean alpha) (Eyring 1930, JASA 1, 217);
    # auto: Eyring above a mean of 0.2 (common practice, docs/theory/treatment.md 2).
    s = np.array([40.0, 30.0, 20.0])
    al = np.array(alphas)
    mean = float(s @ al / s.sum())
    a = float(s @ al) if rule == "sabine" else -s.sum() * math.log(1 - mean)
    np.testing.assert_allclose(
        _surfaces_model(tmp_path, alphas, method), _reverberant_spl(1e-3, np.array(a)), atol=1e-9
    )


def _db_paris_absorption(f: float, sigma: float, d: float) -> float:
    """Independent diffuse absorption of a rigid-backed Delany–Bazley layer, extended
    reaction (Delany & Bazley 1970; Allard & Atalla 2009 eq. for Z_s(theta)), Paris
    integral by scipy quad (Paris 1928)."""
    x = RHO * f / sigma
    zc = RHO * C * (1 + 0.0571 * x**-0.754 - 1j * 0.087 * x**-0.732)
    kc = 2 * np.pi * f / C * (1 + 0.0978 * x**-0.700 - 1j * 0.189 * x**-0.595)
    k0 = 2 * np.pi * f / C

    def alpha(theta: float) -> float:
        kx = np.sqrt(kc**2 - (k0 * np.sin(theta)) ** 2)
        kx = -kx if kx.imag > 0 else kx
        zs = -1j * zc * (kc / kx) / np.tan(kx * d)
        r = (zs * np.cos(theta) - RHO * C) / (zs * np.cos(theta) + RHO * C)
        return float(1 - abs(r) ** 2)

    val, _ = integrate.quad(lambda th: alpha(th) * np.sin(2 * th), 0, np.pi / 2, limit=200)
    return val


def test_lining_absorption_against_independent_paris_integral(tmp_path):
    # A 50 mm Delany-Bazley layer (sigma = 10 kPa s/m^2, X = 0.06 .. 0.48 in 500 Hz - 4 kHz,
    # inside the 0.01 .. 1 fitting range) on 20 m^2 of a 60 m^3 room with rigid-ish walls.
    lining = (
        '{ kind = "porous", model = "delany_bazley", thickness = 0.05, density = 30, '
        "flow_resistivity = 10000 }"
    )
    text = _room(
        f"{{ surfaces = [ {{ area = 20, lining = {lining} }}, {{ area = 70, absorption = 0.03 }} ],"
        ' method = "sabine" }',
        bands="lowest = 500\nhighest = 4000",
    )
    model, res = _solve(tmp_path, text)
    f = model.bands.centre
    al = np.array([_db_paris_absorption(fi, 10000.0, 0.05) for fi in f])
    np.testing.assert_allclose(
        _level(res, "room"), _reverberant_spl(1e-3, 20 * al + 70 * 0.03), atol=0.02
    )


def test_lining_by_name_uses_rigid_backed_tmm_absorption(tmp_path):
    # Consistency: a built-in lining passed through Eyring (auto switch) equals the TMM
    # diffuse absorption of the build-up (exposed face first) put into Eyring's formula.
    from seatool.catalogue import buildup_layers
    from seatool.physics import tmm

    text = _room(
        '{ surfaces = [ { area = 50, lining = "spring_mass_5kg" }, { area = 40, absorption = 0.05 } ] }'
    )
    model, res = _solve(tmp_path, text)
    f = model.bands.centre
    layers = list(reversed(buildup_layers("spring_mass_5kg")))
    al = np.clip(tmm.diffuse_absorption(f, layers, rho0=RHO, c0=C), 0, 1)
    mean = (50 * al + 40 * 0.05) / 90
    a = np.where(mean > 0.2, -90 * np.log1p(-mean), 50 * al + 40 * 0.05)
    np.testing.assert_allclose(_level(res, "room"), _reverberant_spl(1e-3, a), atol=1e-9)
    assert np.any(mean > 0.2) and np.any(mean <= 0.2)  # both branches exercised


# ------------------------------------------------------------------------------------------
# plate treatments

_PLATE = """
[bands]
lowest = 200
highest = 2000
[materials.mild_steel]
density = 7850
youngs_modulus = 2.1e11
poisson_ratio = 0.3
loss_factor = {eta1}
[subsystems.floor]
kind = "plate"
material = "mild_steel"
thickness = {h1}
lx = 1.2
ly = 0.9
{treatment}
[excitations.shaker]
subsystem = "floor"
force = 1.0
"""

_FREE = (
    'treatment = {{ damping_layer = {{ kind = "viscoelastic", thickness = {h2}, density = 1500, '
    "poisson = 0.3, modulus = {{ frequency_hz = [10, 10000], storage = [{e2}, {e2}], "
    "loss_factor = [{eta2}, {eta2}] }} }} }}"
)


def _oberst_loss_factor(
    e1: float, eta1: float, h1: float, e2: float, eta2: float, h2: float
) -> float:
    """Composite loss factor of a plate with a free layer: D*/D1* = 1 + e h^3 +
    3 (1 + h)^2 e h / (1 + e h) with complex moduli (Oberst 1952; Ross, Kerwin & Ungar 1959;
    Ungar 1992 ch. 12), equal Poisson ratios."""
    e = e2 * (1 + 1j * eta2) / (e1 * (1 + 1j * eta1))
    h = h2 / h1
    d = (1 + 1j * eta1) * (1 + e * h**3 + 3 * (1 + h) ** 2 * e * h / (1 + e * h))
    return d.imag / d.real


def test_free_layer_lowers_point_force_velocity(tmp_path):
    # SEA, one plate: <v^2> = P/(omega eta M), P = F^2 Re Y, Y = 1/(8 sqrt(D m''))
    # (infinite-plate drive-point mobility; Cremer, Heckl & Petersson 2005). With a bonded
    # layer: eta -> composite, m'' -> m'' + rho2 H2 (D of the bare plate in the mobility, as
    # the plate reader documents), so Delta L = 10 lg(eta_0/eta) + 15 lg(m_0/m).
    h1, eta1, h2, e2, eta2 = 0.001, 1e-3, 0.002, 1e9, 0.3
    bare = _PLATE.format(eta1=eta1, h1=h1, treatment="")
    treated = _PLATE.format(eta1=eta1, h1=h1, treatment=_FREE.format(h2=h2, e2=e2, eta2=eta2))
    _, r0 = _solve(tmp_path, bare, "bare.toml")
    m1, r1 = _solve(tmp_path, treated, "treated.toml")
    eta = _oberst_loss_factor(2.1e11, eta1, h1, e2, eta2, h2)
    m_bare, m_treat = 7850 * h1, 7850 * h1 + 1500 * h2
    sub = m1.subsystem("floor")
    np.testing.assert_allclose(sub.damping, eta, rtol=1e-9)
    assert sub.props.mass_per_area == pytest.approx(m_treat)
    tr = sub.props.treatment
    assert isinstance(tr, PlateTreatment)
    assert tr.added_mass_per_area == pytest.approx(1500 * h2)
    drop = 10 * np.log10(eta1 / eta) + 15 * np.log10(m_bare / m_treat)
    np.testing.assert_allclose(_level(r1, "floor") - _level(r0, "floor"), drop, atol=1e-9)
    assert np.all(drop < -15.0)


def test_free_layer_near_first_order_published_ratio(tmp_path):
    # First-order RKU/Oberst ratio eta/eta2 = e h (3 + 6h + 4h^2 + 2 e h^3 + e^2 h^4) /
    # ((1 + e h)(1 + 4 e h + 6 e h^2 + 4 e h^3 + e^2 h^4)) (Ungar 1992, ch. 12 of Beranek & Ver) for a
    # lightly damped layer and an undamped base.
    h1, h2, e2, eta2 = 0.001, 0.002, 1e9, 0.01
    text = _PLATE.format(eta1=0.0, h1=h1, treatment=_FREE.format(h2=h2, e2=e2, eta2=eta2))
    (tmp_path / "p.toml").write_text(text)
    sub = seatool.load(tmp_path / "p.toml").subsystem("floor")
    e, h = e2 / 2.1e11, h2 / h1
    ratio = (e * h * (3 + 6 * h + 4 * h**2 + 2 * e * h**3 + e**2 * h**4)) / (
        (1 + e * h) * (1 + 4 * e * h + 6 * e * h**2 + 4 * e * h**3 + e**2 * h**4)
    )
    np.testing.assert_allclose(sub.damping, eta2 * ratio, rtol=1e-3)


def test_constrained_layer_below_ungar_maximum(tmp_path):
    # RKU three-layer plate, undamped faces: eta <= eta_max = beta Y/(2 + Y +
    # 2 sqrt((1 + Y)(1 + beta^2))), Y = 12 d^2/(E1 H1^3 + E3 H3^3) E1 H1 E3 H3/(E1 H1 + E3 H3)
    # (Ross, Kerwin & Ungar 1959; Ungar 1992 ch. 12). Added mass = core + cover.
    h1, h2, h3, g2, beta = 0.001, 1e-4, 5e-4, 1e6, 1.0
    treatment = (
        'treatment = { damping_layer = { kind = "viscoelastic", thickness = 1e-4, density = 1000, '
        f"modulus = {{ frequency_hz = [10, 10000], storage = [{g2}, {g2}], loss_factor = [1.0, 1.0] }} }}, "
        f'constrained = true, cover = {{ material = "mild_steel", thickness = {h3} }} }}'
    )
    text = _PLATE.format(eta1=0.0, h1=h1, treatment=treatment)
    (tmp_path / "c.toml").write_text(text)
    sub = seatool.load(tmp_path / "c.toml").subsystem("floor")
    e = 2.1e11 / (1 - 0.3**2)
    d = h2 + (h1 + h3) / 2
    y = 12 * d**2 / (e * h1**3 + e * h3**3) * (e * h1 * e * h3) / (e * h1 + e * h3)
    eta_max = beta * y / (2 + y + 2 * math.sqrt((1 + y) * (1 + beta**2)))
    assert np.all(sub.damping > 0.01)
    assert np.all(sub.damping <= eta_max * (1 + 1e-9))
    t = sub.props.treatment
    assert t.added_mass_per_area == pytest.approx(1000 * h2 + 7850 * h3)
    assert t.constrained


def test_trim_insertion_loss_applied_to_radiation(tmp_path):
    # A heavy layer bonded (no decoupler) on a steel plate far below coincidence
    # (f_c ~ 12 kHz for 1 mm): field-incidence mass law gives IL ~ 20 lg((m1 + m2)/m1)
    # (Vigran 2008 eq. 6.102, common practice), within 0.3 dB. The radiation coupling loss
    # factor into the faced cavity is reduced by 10^(-IL/10).
    def text(treatment: str) -> str:
        return (
            _PLATE.format(eta1=1e-3, h1=0.001, treatment=treatment)
            + """
[subsystems.cabin]
kind = "cavity"
dimensions = [2.0, 1.5, 1.2]
damping = { absorption_area = 2.0 }
[connections.rad]
kind = "radiation"
between = ["floor", "cabin"]
"""
        )

    m0, _ = _solve(tmp_path, text(""), "bare.toml")
    m1, _ = _solve(
        tmp_path,
        text('treatment = { trim = [{ base = "heavy_layer_5kg" }], face = "cabin" }'),
        "trim.toml",
    )
    t = m1.subsystem("floor").props.treatment
    assert t.trim_mass_per_area == pytest.approx(0.003 * 1667)
    assert t.added_mass_per_area == 0.0  # a trim acts through its insertion loss only
    il_mass_law = 20 * np.log10((7.85 + 5.001) / 7.85)
    np.testing.assert_allclose(t.insertion_loss_db, il_mass_law, atol=0.3)
    ratio = m1.connections[0].coupling_loss_factor / m0.connections[0].coupling_loss_factor
    np.testing.assert_allclose(ratio, 10 ** (-t.insertion_loss_db / 10), rtol=1e-9)


def test_check_reports_masses_per_area(tmp_path, capsys):
    text = _PLATE.format(
        eta1=1e-3,
        h1=0.001,
        treatment='treatment = { damping_layer = "damping_sheet_free", trim = "spring_mass_2kg", '
        'face = "cabin" }',
    ) + (
        '[subsystems.cabin]\nkind = "cavity"\nvolume = 3.0\nmodal_density = 1.0\n'
        'damping = { surfaces = [ { area = 4, lining = "absorber_blanket_25mm" } ] }\n'
    )
    path = tmp_path / "m.toml"
    path.write_text(text)
    assert main(["check", str(path)]) == 0
    out = capsys.readouterr().out
    # damping_sheet_free: 2 mm x 1700 kg/m^3 = 3.4 kg/m^2; spring_mass_2kg: 25 mm x 30 +
    # 1.2 mm x 1667 = 2.75 kg/m^2; blanket 25 mm x 16 = 0.4 kg/m^2 (seatool/data/treatments.csv)
    assert "bare 7.85 + bonded 3.4 = 11.2 kg/m^2" in out
    assert "trim 2.75 kg/m^2" in out
    assert "glass_fibre_light 25 mm (0.4 kg/m^2)" in out


# ------------------------------------------------------------------------------------------
# bad input: one line, key path, exit 2

_GOOD_ROOM = _room("{ surfaces = [ { area = 20, absorption = 0.1 } ] }")
_GOOD_PLATE = _PLATE.format(
    eta1=1e-3, h1=0.001, treatment='treatment = { damping_layer = "damping_sheet_free" }'
)

BAD = [
    (
        "unknown-layer",
        _GOOD_PLATE,
        '"damping_sheet_free"',
        '"damping_sheet_fre"',
        ["subsystems.floor.treatment.damping_layer", "did you mean 'damping_sheet_free'"],
    ),
    (
        "negative-thickness",
        _GOOD_PLATE,
        '"damping_sheet_free"',
        '{ base = "damping_sheet_free", thickness = -0.002 }',
        ["subsystems.floor.treatment.damping_layer.thickness", "must be > 0"],
    ),
    (
        "shear-table-as-free-layer",
        _GOOD_PLATE,
        '"damping_sheet_free"',
        '"vem_core_constrained"',
        ["subsystems.floor.treatment.damping_layer", "Young's modulus"],
    ),
    (
        "misspelt-treatment-key",
        _GOOD_PLATE,
        "damping_layer =",
        "damping_layr =",
        ["subsystems.floor.treatment.damping_layr", "did you mean 'damping_layer'"],
    ),
    (
        "trim-without-face",
        _GOOD_PLATE,
        '"damping_sheet_free" }',
        '"damping_sheet_free", trim = "spring_mass_2kg" }',
        ["subsystems.floor.treatment.face", "missing"],
    ),
    (
        "unknown-face",
        _GOOD_PLATE,
        '"damping_sheet_free" }',
        '"damping_sheet_free", trim = "spring_mass_2kg", face = "flooor" }',
        ["subsystems.floor.treatment.face", "unknown subsystem 'flooor'", "did you mean 'floor'"],
    ),
    (
        "unknown-trim-in-array",
        _GOOD_PLATE,
        '"damping_sheet_free" }',
        '"damping_sheet_free", trim = ["pu_foam_open_cell", "heavy_layer_5k"], face = "floor" }',
        ["subsystems.floor.treatment.trim[1]", "did you mean 'heavy_layer_5kg'"],
    ),
    (
        "both-absorption-and-lining",
        _GOOD_ROOM,
        "absorption = 0.1",
        'absorption = 0.1, lining = "absorber_blanket_25mm"',
        ["subsystems.room.damping.surfaces[0]", "exactly one of absorption"],
    ),
    (
        "absorption-above-one",
        _GOOD_ROOM,
        "absorption = 0.1",
        "absorption = 1.2",
        ["subsystems.room.damping.surfaces[0].absorption", "[0, 1]"],
    ),
    (
        "eyring-mean-one",
        _GOOD_ROOM,
        "absorption = 0.1",
        "absorption = 1.0",
        ["subsystems.room.damping.surfaces", "Eyring"],
    ),
    (
        "unknown-method",
        _GOOD_ROOM,
        "] }",
        '], method = "eyrin" }',
        ["subsystems.room.damping.method", "did you mean 'eyring'"],
    ),
    (
        "humidity-above-100",
        _GOOD_ROOM,
        "] }",
        "], air_absorption = { relative_humidity = 120 } }",
        ["subsystems.room.damping.air_absorption.relative_humidity", "<= 100"],
    ),
    (
        "air-absorption-with-t60",
        _GOOD_ROOM,
        "{ surfaces = [ { area = 20, absorption = 0.1 } ] }",
        "{ reverberation_time = 0.5, air_absorption = { temperature = 20 } }",
        ["subsystems.room.damping.air_absorption", "already includes air absorption"],
    ),
    (
        "absorption-area-on-structure",
        _GOOD_PLATE,
        "[excitations.shaker]",
        '[subsystems.box]\nkind = "structure"\nmass = 1\nmodal_density = 1\n'
        "damping = { absorption_area = 2 }\n[excitations.shaker]",
        ["subsystems.box.damping.absorption_area", "needs a cavity"],
    ),
    (
        "constrained-without-cover",
        _GOOD_PLATE,
        '"damping_sheet_free" }',
        '"vem_core_constrained", constrained = true }',
        ["subsystems.floor.treatment.cover", "needs a cover"],
    ),
    (
        "unknown-cover-material",
        _GOOD_PLATE,
        '"damping_sheet_free" }',
        '"vem_core_constrained", cover = { material = "steal", thickness = 5e-4 } }',
        ["subsystems.floor.treatment.cover.material", "did you mean 'steel'"],
    ),
    (
        "face-without-trim",
        _GOOD_PLATE,
        '"damping_sheet_free" }',
        '"damping_sheet_free", face = "cabin" }',
        ["subsystems.floor.treatment.face", "only with a trim"],
    ),
    (
        "unknown-layer-kind",
        _GOOD_PLATE,
        '"damping_sheet_free" }',
        '"damping_sheet_free", trim = { kind = "foam", thickness = 0.01 }, face = "floor" }',
        ["subsystems.floor.treatment.trim.kind", "unknown layer kind 'foam'"],
    ),
    (
        "modulus-table-not-increasing",
        _GOOD_PLATE,
        '"damping_sheet_free"',
        '{ kind = "viscoelastic", thickness = 0.002, density = 1500, modulus = '
        "{ frequency_hz = [100, 10], storage = [1e9, 1e9], loss_factor = [0.3, 0.3] } }",
        ["subsystems.floor.treatment.damping_layer.modulus", "strictly increasing"],
    ),
    (
        "surfaces-exceed-cavity-area",
        _GOOD_ROOM.replace(
            'kind = "cavity"\nvolume = 60.0\nmodal_density = 1.0',
            'kind = "cavity"\ndimensions = [2.0, 2.0, 2.0]',
        ),
        "area = 20,",
        "area = 30,",
        ["subsystems.room.damping.surfaces", "more than the cavity's surface area 24"],
    ),
    (
        "porous-without-jca-lengths",
        _GOOD_ROOM,
        "absorption = 0.1",
        'lining = { kind = "porous", thickness = 0.05, density = 30, flow_resistivity = 9000 }',
        ["subsystems.room.damping.surfaces[0].lining", "viscous_length"],
    ),
]


@pytest.mark.parametrize(("case", "base", "old", "new", "fragments"), BAD, ids=[b[0] for b in BAD])
def test_bad_treatment_input(tmp_path, capsys, case, base, old, new, fragments):
    assert old in base, case
    path = tmp_path / "bad.toml"
    path.write_text(base.replace(old, new, 1))
    code = main(["check", str(path)])
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 2
    assert len(err) == 1, err
    for frag in fragments:
        assert frag in err[0], err[0]


# ------------------------------------------------------------------------------------------
# seatool panel with a treatment


def test_panel_shows_treatment_columns(tmp_path, capsys):
    # Heavy layer bonded on 1 mm steel, 100 Hz - 2 kHz (far below f_c ~ 12 kHz): the
    # insertion loss follows the field-incidence mass law, 20 lg((m1 + m2)/m1) within 0.3 dB
    # (Vigran 2008 eq. 6.102; common practice). A heavy layer is impervious: rigid-backed it
    # cannot move on a rigid wall and absorbs nothing.
    import pandas as pd

    out_csv = tmp_path / "panel.csv"
    args = ["panel", "--material", "steel", "--thickness", "0.001", "--lx", "1", "--ly", "0.8"]
    args += ["--lowest", "100", "--highest", "2000", "--csv", str(out_csv)]
    assert main([*args, "--trim", "heavy_layer_5kg", "--damping-layer", "damping_sheet_free"]) == 0
    capsys.readouterr()
    t = pd.read_csv(out_csv, comment="#")
    np.testing.assert_allclose(
        t["trim_insertion_loss_dB"], 20 * np.log10((7.85 + 3.4 + 5.001) / (7.85 + 3.4)), atol=0.3
    )
    np.testing.assert_array_equal(t["trim_absorption"], 0.0)  # impervious mass on a rigid wall
    # A 25 mm fibrous blanket absorbs mainly above the quarter-wavelength frequency
    # c/(4 d) ~ 3.4 kHz (common practice): small at 100 Hz, rising, above 0.5 at 2 kHz.
    assert main([*args, "--trim", "absorber_blanket_25mm"]) == 0
    capsys.readouterr()
    a = pd.read_csv(out_csv, comment="#")["trim_absorption"].to_numpy()
    assert a[0] < 0.1 and a[-1] > 0.5 and np.all(np.diff(a) > 0), a
    assert np.all(t["composite_loss_factor"] > 0.02)  # bitumen-like sheet: 0.05-0.3 typical
    np.testing.assert_allclose(t["bonded_mass_kg_m2"], 3.4)  # 2 mm x 1700 kg/m^3


def test_panel_bad_treatment_option(tmp_path, capsys):
    args = ["panel", "--material", "steel", "--thickness", "0.001", "--lx", "1", "--ly", "0.8"]
    assert main([*args, "--damping-layer", "vem_core_constrained", "--cover", "stel:0.0005"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--cover" in err[0] and "did you mean 'steel'" in err[0], err
