"""The lightest treatment against brute-force enumeration (every combination rebuilt through
the model reader and solved on its own, independent of the search's decomposition)."""

from __future__ import annotations

import itertools
import tomllib
from pathlib import Path

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

import seatool
from seatool.analysis._keypath import with_value
from seatool.analysis.lightest import Option, Surface, lightest_treatment
from seatool.analysis.lightest_continuous import Bounded, lightest_continuous
from seatool.analysis.treatment_mass import total_added_mass
from seatool.analysis.variants import apply_changes
from seatool.errors import InputError
from seatool.metrics import METRICS
from seatool.modelfile import build


def _text(forces: list[float]) -> str:
    # A small invented cab: steel plates driven by point forces, radiating into the air.
    parts = [
        '[bands]\nspacing = "third-octave"\nlowest = 250\nhighest = 1000\n',
        '[subsystems.cab]\nkind = "cavity"\ndimensions = [2.0, 1.8, 1.5]\n'
        "damping = 0.02\n",
    ]
    for i, f in enumerate(forces):
        parts.append(
            f'[subsystems.p{i}]\nkind = "plate"\nmaterial = "steel"\nthickness = 0.0015\n'
            f"lx = {1.0 + 0.2 * i}\nly = 0.9\n"
            f'[connections.r{i}]\nkind = "radiation"\nbetween = ["p{i}", "cab"]\n'
            f'[excitations.f{i}]\nsubsystem = "p{i}"\nforce = {f}\n'
        )
    return "\n".join(parts)


def _option(i: int, mm: float) -> Option:
    if mm == 0:
        return Option("none", {})
    layer = {"base": "damping_sheet_free", "thickness": mm / 1000}
    return Option(f"sheet_{mm:g}mm", {f"subsystems.p{i}.treatment": {"damping_layer": layer}})


def _with_target(text: str, limit_dba: float | None, band: float | None = None) -> dict:
    data = tomllib.loads(text)
    t: dict = {"receiver": "cab"}
    if limit_dba is not None:
        t["limit_dBA"] = limit_dba
    if band is not None:
        t["limit_per_band"] = band
    data["targets"] = {"cab_limit": t}
    return data


def _brute(data: dict, surfaces: list[Surface]) -> list[tuple[float, float, tuple[str, ...]]]:
    """(mass, smallest margin, option names) of every combination, by full rebuild + solve;
    margins by hand from the metric registry and the band limit."""
    out = []
    (tgt,) = data["targets"].values()
    for combo in itertools.product(*(s.options for s in surfaces)):
        changes: dict = {}
        for o in combo:
            changes.update(o.changes)
        model = build(apply_changes(data, changes))
        res = seatool.run(model)
        lv = res.level_array()[0][model.index()["cab"]]
        margins = []
        if "limit_dBA" in tgt:
            margins.append(tgt["limit_dBA"] - float(METRICS["dBA"](lv, model.bands).value))
        if "limit_per_band" in tgt:
            margins.append(float(np.min(tgt["limit_per_band"] - lv)))
        out.append((total_added_mass(model), min(margins), tuple(o.name for o in combo)))
    return out


def _expected(brute):
    ok = sorted((m, -s, names) for m, s, names in brute if s >= 0)
    return ok


def _base_dba(text: str) -> float:
    res = seatool.run(seatool.loads(text))
    return float(METRICS["dBA"](res.level_array()[0][0], res.model.bands).value)


@settings(
    max_examples=6, deadline=None, suppress_health_check=[HealthCheck.too_slow], derandomize=True
)
@given(
    forces=st.lists(st.floats(0.05, 1.0), min_size=1, max_size=3),
    thick=st.lists(
        st.sampled_from([0.5, 1.0, 1.5, 2.0, 3.0, 4.0]), min_size=2, max_size=3, unique=True
    ),
    drop=st.floats(0.5, 8.0),
)
def test_search_equals_enumeration_on_random_catalogues(forces, thick, drop):
    text = _text(forces)
    data = _with_target(text, _base_dba(text) - drop)
    surfaces = [
        Surface(f"p{i}", [_option(i, 0)] + [_option(i, t) for t in thick])
        for i in range(len(forces))
    ]
    brute = _brute(data, surfaces)
    ok = _expected(brute)
    for method in ("exhaustive", "bound"):
        got = lightest_treatment(data, surfaces, method=method)
        assert got.found == bool(ok)
        if ok:
            mass, neg, names = ok[0]
            assert got.mass_kg == pytest.approx(mass, rel=1e-9)
            assert tuple(got.choice.values()) == names
            assert got.verification_db < 1e-6
        else:
            assert got.best_margin == pytest.approx(max(s for _, s, _ in brute), abs=1e-6)


def test_four_by_four_and_the_answer_is_not_the_obvious_one():
    # Four plates, four options each (256 combinations). The strongly driven plate p0
    # dominates; the lightest answer treats the plates unequally, lighter than the
    # "heaviest everywhere" choice, and equals the enumeration.
    text = _text([1.0, 0.5, 0.2, 0.1])
    data = _with_target(text, _base_dba(text) - 6.0, band=_base_dba(text) - 6.0)
    surfaces = [Surface(f"p{i}", [_option(i, t) for t in (0, 1, 2, 4)]) for i in range(4)]
    brute = _brute(data, surfaces)
    ok = _expected(brute)
    got = lightest_treatment(data, surfaces, alternatives=2)
    assert got.found and got.method == "exhaustive" and got.evaluated == 256
    assert got.mass_kg == pytest.approx(ok[0][0], rel=1e-9)
    assert tuple(got.choice.values()) == ok[0][2]
    heaviest = max(m for m, _, names in brute if all(n == "sheet_4mm" for n in names))
    assert got.mass_kg < heaviest
    assert len(set(got.choice.values())) > 1  # not one option everywhere
    assert list(got.alternatives["mass_kg"]) == pytest.approx([o[0] for o in ok[1:3]])
    assert "binding: cab_limit" in got.summary()


def test_nothing_meets_the_target():
    text = _text([1.0, 0.4])
    data = _with_target(text, _base_dba(text) - 60.0)
    surfaces = [Surface(f"p{i}", [_option(i, t) for t in (0, 2, 4)]) for i in range(2)]
    brute = _brute(data, surfaces)
    got = lightest_treatment(data, surfaces)
    assert not got.found
    best = max(brute, key=lambda r: r[1])
    assert got.best_margin == pytest.approx(best[1], abs=1e-6)
    assert tuple(got.choice.values()) == best[2]
    assert got.summary().startswith("no combination of the candidates meets every target")


def test_bad_input():
    text = _text([1.0])
    with pytest.raises(InputError, match="no \\[targets.NAME\\]"):
        lightest_treatment(tomllib.loads(text), [Surface("p0", [_option(0, 0)])])
    data = _with_target(text, 60.0)
    bad = Option("typo", {"subsystems.p9.treatment": {}})
    with pytest.raises(
        InputError, match="surfaces.p0.typo: subsystems.p9.treatment: no table 'p9'"
    ):
        lightest_treatment(data, [Surface("p0", [bad])])
    with pytest.raises(InputError, match="give a cost or cost_per_kg"):
        lightest_treatment(data, [Surface("p0", [_option(0, 1)])], objective="cost")


def test_cost_objective_can_prefer_a_heavier_option():
    # With explicit costs the thick sheet is cheaper than the thin one: the cheapest
    # combination meeting the target is then heavier than the lightest.
    text = _text([1.0])
    data = _with_target(text, _base_dba(text) - 3.0)
    opts = [
        Option("none", {}, cost=0.0),
        Option("thin", _option(0, 2).changes, cost=50.0),
        Option("thick", _option(0, 4).changes, cost=10.0),
    ]
    by_mass = lightest_treatment(data, [Surface("p0", opts)])
    by_cost = lightest_treatment(data, [Surface("p0", opts)], objective="cost")
    assert by_mass.choice == {"p0": "thin"}
    assert by_cost.choice == {"p0": "thick"} and by_cost.objective == 10.0


def test_continuous_thickness_equals_the_root_of_the_rebuilt_level():
    # One plate with a free damping sheet of thickness t in [0.1, 4] mm; the least mass
    # meeting a dB(A) limit is the thickness where the level equals the limit (the level
    # falls with t). Reference: scipy.optimize.brentq on full rebuilds (no gradients).
    text = _text([1.0])
    limit = _base_dba(text) - 4.0
    data = _with_target(text, limit)
    data["subsystems"]["p0"]["treatment"] = {
        "damping_layer": {"base": "damping_sheet_free", "thickness": 0.004}
    }
    path = "subsystems.p0.treatment.damping_layer.thickness"

    def dba(t: float) -> float:
        m = build(with_value(data, path, lambda _o: np.asarray(t)))
        lv = seatool.run(m).level_array()[0][m.index()["cab"]]
        return float(METRICS["dBA"](lv, m.bands).value)

    t_ref = brentq(lambda t: dba(t) - limit, 1e-4, 0.004, xtol=1e-10)
    got = lightest_continuous(data, [Bounded(path, 1e-4, 0.004)])
    assert got.met
    assert got.values[path] == pytest.approx(t_ref, rel=1e-3)
    # sheet density 1700 kg/m^3 (catalogue) x t x plate area 1.0 m x 0.9 m
    assert got.mass_kg == pytest.approx(1700 * t_ref * 0.9, rel=1e-3)
    with pytest.raises(InputError, match="0 < low < high"):
        lightest_continuous(data, [Bounded(path, 0.0, 0.004)])


def test_a_path_through_a_treated_panel_follows_the_option():
    # models/two_rooms.toml (invented demo) has a non-resonant (mass-law) path between the
    # rooms *through* the pane: it names the pane without joining it. An option on the pane
    # changes that path too; the search's one-at-a-time arrays must carry the change, so its
    # answer equals the enumeration by full rebuild (independent: the model reader and
    # solver) and its levels equal a rebuild of the answer.
    root = Path(__file__).resolve().parent.parent / "models"
    data = tomllib.loads((root / "two_rooms.toml").read_text("utf-8"))
    data.pop("uncertainty", None)
    options = [Option("as_is", {}, cost=0.0)] + [
        Option(f"h{mm}", {"subsystems.pane.thickness": mm / 1000}, cost=float(mm))
        for mm in (8, 10, 12)
    ]
    dba = {}
    for o in options:
        model = build(apply_changes(data, o.changes), base_dir=root)
        lv = seatool.run(model).level_array()[0][model.index()["receiving_room"]]
        dba[o.name] = float(METRICS["dBA"](lv, model.bands).value)
    assert dba["h12"] < dba["h10"] < dba["h8"] < dba["as_is"]
    data["targets"] = {"quiet": {"receiver": "receiving_room", "limit_dBA": dba["h10"] + 0.01}}
    for method in ("exhaustive", "bound"):
        got = lightest_treatment(data, [Surface("pane", options)], method=method,
                                 objective="cost", base_dir=root)  # fmt: skip
        assert got.found and got.choice == {"pane": "h10"}
        assert got.verification_db < 1e-9
