"""Rebuilding a model with a few values changed: the remembered records and the fast
Monte Carlo route give what a full read and a plain solve give.

Reference for every check here: the model reader run from scratch on the changed file
(:func:`seatool.modelfile.build` without remembered records) and :func:`seatool.solve.solve`
of that model, sample by sample -- the plain route. The records route must give the same
model (every array bit for bit: the same derive functions run on the same inputs, or
their earlier result is taken over) and energies equal to 1e-9 relative (the batched dense
solves of the samples against the sparse solve of each).
"""

from __future__ import annotations

import tomllib
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import numpy as np
import pytest

from seatool.analysis._keypath import with_value, with_values
from seatool.analysis._system import level_offset
from seatool.analysis.uncertainty import Uncertain, spread
from seatool.errors import InputError
from seatool.kinds.records import Records
from seatool.model import Model
from seatool.modelfile import build
from seatool.solve import solve

MODELS = Path(__file__).resolve().parent.parent / "models"


def _leaves(node: Any, prefix: str) -> Iterator[str]:
    """Key paths of every number, array of numbers and inline spectrum under ``node``."""
    if isinstance(node, dict):
        if isinstance(node.get("values"), list):
            yield prefix
            return
        for k, v in node.items():
            yield from _leaves(v, f"{prefix}.{k}")
    elif isinstance(node, int | float) and not isinstance(node, bool):
        yield prefix
    elif (
        isinstance(node, list)
        and node
        and all(isinstance(x, int | float) and not isinstance(x, bool) for x in node)
    ):
        yield prefix


def _signature(m: Model) -> list[tuple[str, Any]]:
    """Everything of a model that a solve or a report reads, as comparable items."""
    out: list[tuple[str, Any]] = [
        ("names", m.names),
        ("notes", m.notes),
        ("reports", m.reports),
        ("warnings", m.warnings),
    ]
    for i, s in enumerate(m.subsystems):
        out += [
            (f"{s.name}.damping", np.asarray(s.damping)),
            (f"{s.name}.modal_density", np.asarray(s.modal_density)),
            (f"{s.name}.mass", None if s.mass is None else np.asarray(s.mass)),
            (f"{s.name}.volume", None if s.volume is None else np.asarray(s.volume)),
            (f"{s.name}.offset", level_offset(m, i)),
        ]
    for c in m.connections:
        out += [(f"{c.name}.ends", (c.a, c.b, c.kind)), (f"{c.name}.clf", c.coupling_loss_factor)]
    for e in m.excitations:
        out += [
            (f"{e.name}.drive", (e.subsystem, e.drive)),
            (f"{e.name}.power", None if e.power is None else np.asarray(e.power)),
            (f"{e.name}.energy", None if e.energy is None else np.asarray(e.energy)),
        ]
    return out


def _assert_same(a: Model, b: Model) -> None:
    sa, sb = _signature(a), _signature(b)
    assert [k for k, _ in sa] == [k for k, _ in sb]
    for (key, x), (_, y) in zip(sa, sb, strict=True):
        if isinstance(x, np.ndarray) or isinstance(y, np.ndarray):
            np.testing.assert_array_equal(x, y, err_msg=key)
        else:
            assert x == y, key


def _outcome(data: dict[str, Any], path: Path, records: Records | None) -> Model | str:
    try:
        return build(data, file=str(path), base_dir=path.parent, records=records)
    except InputError as exc:
        return str(exc)


@pytest.mark.parametrize("name", sorted(p.name for p in MODELS.glob("*.toml")))
def test_records_rebuild_equals_a_full_read_for_every_changed_value(name):
    # every number of the subsystems, connections and excitations changed by 3 % in turn
    # (the wheelhouse: every 7th, for time), one Records instance throughout as in a
    # Monte Carlo run; each rebuild against a read from scratch of the same data
    path = MODELS / name
    data = tomllib.loads(path.read_text())
    records = Records()
    nominal = build(data, file=str(path), base_dir=path.parent, records=records)
    paths = [
        p for sec in ("subsystems", "connections", "excitations") for p in _leaves(data.get(sec, {}), sec)
    ]
    if len(paths) > 100:
        paths = paths[::7]
    assert paths
    for p in paths:
        changed = with_values(data, [(p, lambda v: v * 1.03)])
        want = _outcome(with_value(data, p, lambda v: v * 1.03), path, None)
        got = _outcome(changed, path, records)
        if isinstance(want, str):
            assert got == want, p
        else:
            assert isinstance(got, Model), (p, got)
            _assert_same(got, want)
    # and back to the nominal data: everything taken over, nothing derived again
    before = records.derived
    _assert_same(build(data, file=str(path), base_dir=path.parent, records=records), nominal)
    again = records.derived
    _assert_same(build(data, file=str(path), base_dir=path.parent, records=records), nominal)
    assert records.derived == again
    assert again >= before


def test_records_derive_only_what_a_changed_plate_reaches():
    # the rail cab's floor feeds its radiation, its two line junctions and its two
    # excitations (bogie force, rolling noise with its non-resonant part), and the pass of
    # facing trims reads every subsystem: 1 + 1 + 3 + 3 tables
    path = MODELS / "rail_cab.toml"
    data = tomllib.loads(path.read_text())
    records = Records()
    build(data, file=str(path), base_dir=path.parent, records=records)
    before = records.derived
    build(
        with_values(data, [("subsystems.floor.thickness", lambda v: v * 1.02)]),
        file=str(path),
        base_dir=path.parent,
        records=records,
    )
    assert records.derived - before == 1 + 1 + 3 + 3


def test_with_values_leaves_the_data_unchanged():
    data = {"subsystems": {"a": {"thickness": 1.0, "lx": 2.0}, "b": {"thickness": 3.0}}}
    out = with_values(data, [("subsystems.a.thickness", lambda v: v * 2)])
    assert data["subsystems"]["a"]["thickness"] == 1.0
    assert out["subsystems"]["a"] == {"thickness": 2.0, "lx": 2.0}
    assert out["subsystems"]["b"] is data["subsystems"]["b"]  # shared, not copied


#: Physical-parameter spreads of the rail cab (the cases of benchmarks/bench_load.py).
RAIL_CAB = {
    "floor": [Uncertain("h", "subsystems.floor.thickness", "uniform", tolerance=0.05)],
    "roof": [Uncertain("h", "subsystems.roof.thickness", "uniform", tolerance=0.05)],
    "air": [
        Uncertain("air", "subsystems.cab_air.damping.reverberation_time", "lognormal", factor=1.5)
    ],
    "all": [
        Uncertain(f"{s}_h", f"subsystems.{s}.thickness", "uniform", tolerance=0.05)
        for s in ("floor", "left_wall", "right_wall", "roof", "windscreen")
    ]
    + [Uncertain("air", "subsystems.cab_air.damping.reverberation_time", "lognormal", factor=1.5)],
}


def _plain(data: dict[str, Any], path: Path, unc: list[Uncertain], draws: list[Any], k: int):
    """Mean squares (N, B) of sample ``k`` by a full read and the plain solve."""
    d = data
    for u, dr in zip(unc, draws, strict=True):
        d = with_value(d, u.parameter, lambda v, u=u, z=float(dr[k]): u.apply(v, np.asarray(z)))
    m = build(d, file=str(path), base_dir=path.parent)
    off = np.array([level_offset(m, i) for i in range(len(m.subsystems))])
    q = solve(m).energy * 10.0 ** (off[:, None] / 10.0)
    q[[s.sink for s in m.subsystems]] = 0.0
    return q


@pytest.mark.parametrize("case", sorted(RAIL_CAB))
def test_rail_cab_spread_equals_plain_rebuild_and_solve(case):
    path = MODELS / "rail_cab.toml"
    data = tomllib.loads(path.read_text())
    unc = RAIL_CAB[case]
    ns = 5
    sp = spread(data, file=str(path), base_dir=path.parent, samples=ns, seed=7, uncertain=unc)
    assert sp.method == "rebuild per sample"
    rng = np.random.default_rng(7)
    draws = [u.draw(rng, ns) for u in unc]
    for k in range(ns):
        np.testing.assert_allclose(sp.mean_square[k], _plain(data, path, unc, draws, k), rtol=1e-9)


def test_samples_with_their_own_held_energies_are_solved_one_by_one():
    # a prescribed level holds the source room at an energy proportional to its volume,
    # so every sample has its own held energy: the stacked solve does not apply and the
    # sample is solved by itself; the answer is still the plain route's
    text = """
[bands]
lowest = 250
highest = 1000
[subsystems.source]
kind = "cavity"
dimensions = [4.0, 3.0, 2.5]
damping = 0.01
[subsystems.wall]
kind = "plate"
material = "steel"
thickness = 0.002
lx = 3.0
ly = 2.5
damping = 0.01
[subsystems.receiver]
kind = "cavity"
dimensions = [3.0, 3.0, 2.5]
damping = 0.02
[connections.s_w]
kind = "radiation"
between = ["wall", "source"]
[connections.w_r]
kind = "radiation"
between = ["wall", "receiver"]
[excitations.measured]
subsystem = "source"
sound_pressure_level = 90
"""
    data = tomllib.loads(text)
    unc = [
        Uncertain("v", "subsystems.source.dimensions", "uniform", tolerance=0.1),
        Uncertain("h", "subsystems.wall.thickness", "uniform", tolerance=0.1),
    ]
    ns = 4
    path = MODELS / "inline.toml"
    sp = spread(data, file=str(path), base_dir=MODELS, samples=ns, seed=2, uncertain=unc)
    rng = np.random.default_rng(2)
    draws = [u.draw(rng, ns) for u in unc]
    for k in range(ns):
        np.testing.assert_allclose(sp.mean_square[k], _plain(data, path, unc, draws, k), rtol=1e-9)
