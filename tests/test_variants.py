"""Design variants: changes by key path, side-by-side tables, flags naming the trim resonance."""

from __future__ import annotations

import numpy as np
import pytest

import seatool
from seatool.analysis._keypath import read_data
from seatool.analysis.treatment_mass import added_mass_table, total_added_mass
from seatool.analysis.variants import Variant, apply_changes, compare, load_variants
from seatool.errors import InputError
from seatool.modelfile import build
from seatool.physics.air import AIR_DENSITY, AIR_SOUND_SPEED
from seatool.plot import plot_band_margins, plot_variants

DATA, FILE, FOLDER = read_data("models/treated_floor.toml")
AREA = 1.6 * 1.1
# Catalogue values (seatool/data/treatments.csv, invented typical): damping sheet 2 mm at
# 1700 kg/m^3; PU foam 25 mm at 30 kg/m^3; heavy layer 3 mm at 1667 kg/m^3. Steel 7850 kg/m^3
# (seatool/data/materials.csv).
SHEET = 0.002 * 1700.0
FOAM = 0.025 * 30.0
HEAVY5 = 0.003 * 1667.0
STEEL = 0.0012 * 7850.0


def _damped_only() -> dict:
    d = apply_changes(DATA, {"subsystems.floor.treatment": {"damping_layer": "damping_sheet_free"}})
    return d


def test_apply_changes_sets_adds_and_removes_without_touching_the_original():
    d = apply_changes(
        DATA,
        {"subsystems.floor.thickness": 0.002, "subsystems.floor.treatment.trim": None},
    )
    assert d["subsystems"]["floor"]["thickness"] == 0.002
    assert "trim" not in d["subsystems"]["floor"]["treatment"]
    assert DATA["subsystems"]["floor"]["thickness"] == 0.0012
    assert "trim" in DATA["subsystems"]["floor"]["treatment"]
    with pytest.raises(InputError) as exc:
        apply_changes(DATA, {"subsystems.flor.thickness": 1.0, "subsystems.floor.lz": None})
    msgs = [str(p) for p in exc.value.problems]
    assert any("subsystems.flor.thickness" in m and "did you mean 'floor'" in m for m in msgs)
    assert any("nothing to remove" in m for m in msgs)


def test_variant_equals_the_edited_file():
    c = compare(
        DATA, [Variant("thick", {"subsystems.floor.thickness": 0.002})], file=FILE, base_dir=FOLDER
    )
    edited = dict(DATA)
    edited["subsystems"] = {**DATA["subsystems"], "floor": {**DATA["subsystems"]["floor"]}}
    edited["subsystems"]["floor"]["thickness"] = 0.002
    direct = seatool.run(build(edited, file=FILE, base_dir=FOLDER))
    lv = direct.level_array()[0][direct.model.index()["cabin"]]
    got = c.difference[c.difference["variant"] == "thick"]["level_dB"].to_numpy()
    np.testing.assert_allclose(got, lv, rtol=0, atol=1e-12)
    base = c.difference[c.difference["variant"] == "base"]["difference_dB"]
    assert np.all(base == 0.0)


def test_added_mass_per_treatment_and_in_total():
    # Hand sums of the catalogue layers times the floor area.
    model = build(DATA, file=FILE, base_dir=FOLDER)
    t = added_mass_table(model).iloc[0]
    assert t["bonded_kg"] == pytest.approx(SHEET * AREA, rel=1e-9)
    assert t["trim_kg"] == pytest.approx((FOAM + HEAVY5) * AREA, rel=1e-3)
    assert total_added_mass(model) == pytest.approx((SHEET + FOAM + HEAVY5) * AREA, rel=1e-3)


def test_a_plate_with_in_plane_wave_fields_counts_its_treatment_once():
    # The same hand sum when the floor also carries longitudinal and shear wave fields
    # (three subsystems of one plate sharing one treatment): the plate is treated once.
    data = apply_changes(DATA, {"subsystems.floor.wave_fields": ["bending", "longitudinal", "shear"]})
    model = build(data, file=FILE, base_dir=FOLDER)
    assert len(model.subsystems) == len(build(DATA, file=FILE, base_dir=FOLDER).subsystems) + 2
    assert list(added_mass_table(model)["subsystem"]) == ["floor"]
    assert total_added_mass(model) == pytest.approx((SHEET + FOAM + HEAVY5) * AREA, rel=1e-3)


def test_a_trim_that_raises_bands_is_flagged_with_its_resonance():
    # Base: floor with the damping sheet only. Variant: the 5 kg/m^2 spring-mass trim added.
    # The trim's insertion loss (transfer-matrix method) is negative around its mass-spring
    # resonance f0 = (1/2 pi) sqrt(s' (m1 + m2)/(m1 m2)) (Fahy & Gardonio 2007; Vigran 2008),
    # s' = rho0 c0^2 / (1.4 d) for the air in 25 mm of foam (isothermal), m1 the steel floor
    # with the sheet, m2 the heavy layer (+ foam mass is not part of m2).
    s = AIR_DENSITY * AIR_SOUND_SPEED**2 / 1.4 / 0.025
    m1, m2 = STEEL + SHEET, HEAVY5
    f0 = np.sqrt(s * (m1 + m2) / (m1 * m2)) / (2 * np.pi)
    c = compare(
        _damped_only(),
        [Variant("trim", {"subsystems.floor.treatment": DATA["subsystems"]["floor"]["treatment"]})],
        file=FILE,
        base_dir=FOLDER,
    )
    (flag,) = c.flags
    assert flag.startswith("variant trim raises cabin by more than 1 dB in ")
    assert f"mass-spring resonance f0 = {f0:.0f} Hz of the trim on floor" in flag
    # The largest rise (from the TMM insertion loss, an independent route) lies within a
    # third of an octave of the mass-spring formula.
    d = c.difference[c.difference["variant"] == "trim"]
    peak = float(d.iloc[int(np.argmax(d["difference_dB"].to_numpy()))]["band_hz"])
    assert 2 ** (-1 / 3) <= peak / f0 <= 2 ** (1 / 3)
    # The variant is much quieter at high frequencies: no flag there.
    assert d[d["band_hz"] >= 1000]["difference_dB"].max() < -10
    masses = c.levels.set_index("variant")["added_mass_kg"]
    assert masses["trim"] - masses["base"] == pytest.approx((FOAM + HEAVY5) * AREA, rel=1e-3)


def test_variants_file_csv_and_figures(tmp_path):
    (tmp_path / "v.toml").write_text(
        'base = "m.toml"\n'
        "[variants.thin]\n"
        'description = "1 mm floor"\n'
        'set = { "subsystems.floor.thickness" = 0.001 }\n'
        "[variants.bare]\n"
        'remove = ["subsystems.floor.treatment"]\n'
    )
    text = (FOLDER / "treated_floor.toml").read_text()
    text += '\n[targets.ear]\nreceiver = "cabin"\nlimit_dBA = 65\nlimit_per_band = 70\n'
    (tmp_path / "m.toml").write_text(text)
    data, file, folder, variants = load_variants(tmp_path / "v.toml")
    assert [v.name for v in variants] == ["thin", "bare"]
    c = compare(data, variants, file=file, base_dir=folder)
    assert list(c.levels["variant"]) == ["base", "thin", "bare"]
    assert set(c.margins["variant"]) == {"base", "thin", "bare"}
    bare = c.margins[(c.margins["variant"] == "bare") & (c.margins["limit_on"] == "dBA")]
    assert not bool(bare["met"].iloc[0])
    assert any(f.startswith("variant bare raises cabin") for f in c.flags)
    assert plot_variants(c.difference, tmp_path / "v.png").stat().st_size > 0
    assert plot_band_margins(c.margins, tmp_path / "m.png").stat().st_size > 0
    (tmp_path / "bad.toml").write_text('base = "m.toml"\n[variants.x]\nsett = {}\n')
    with pytest.raises(InputError, match="did you mean 'set'"):
        load_variants(tmp_path / "bad.toml")
