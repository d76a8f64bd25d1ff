"""Property-based checks over random models (hypothesis; bounded, the file runs in seconds).

Random valid models (tests/modelgen.py: plates, a given structure, cavities, an exterior
sink; radiation, line junctions, given couplings; power, force and held levels) must solve
with the energy balance closed, every energy finite and positive, SEA reciprocity and no
dependence on the order the subsystems are written in. A bad value (nan, inf, negative,
huge, a string, a table ...) in any numeric key must give exit code 2 with the key path,
never an internal error (exit 1). The long run of the same generators is
benchmarks/fuzz_models.py (counts in docs/validation.md).
"""

from __future__ import annotations

import contextlib
import io
import random
import tempfile
from pathlib import Path
from typing import Any

import modelgen
import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import seatool
from seatool.cli import main

SETTINGS = settings(
    max_examples=10,
    deadline=None,
    derandomize=True,
    suppress_health_check=[HealthCheck.too_slow],
)


def _solve(data: dict[str, Any], order: list[str] | None = None) -> seatool.Result:
    return seatool.run(seatool.loads(modelgen.to_toml(data, order)))


@SETTINGS
@given(st.randoms(use_true_random=False))
def test_random_models_close_the_energy_balance_with_positive_energies(rng: random.Random):
    # conservation of energy: the power put in equals the power dissipated by the damping
    # of every subsystem and absorbed by the exterior (Lyon & DeJong 1995, Theory and
    # Application of SEA, ch. 1, the SEA power balance); energies of a damped system are
    # positive and finite
    data = modelgen.valid_model(rng)
    result = _solve(data)
    pb = result.power_balance()
    held = {e.subsystem for e in result.model.excitations if e.level is not None}
    for band, g in pb.groupby("band_hz"):
        p_in = float(g["input_W"].sum())
        p_out = float(g["dissipated_W"].sum())
        assert abs(p_in - p_out) <= 1e-9 * max(abs(p_in), 1e-300), band
    for s, e in zip(result.model.subsystems, result.solution.energy, strict=True):
        if not s.sink:
            assert np.all(np.isfinite(e)) and np.all(e > 0), s.name
    assert held <= set(result.model.names)


@SETTINGS
@given(st.randoms(use_true_random=False))
def test_random_models_are_reciprocal(rng: random.Random):
    # SEA reciprocity (Lyon & DeJong 1995, sec. 3.2: n_i eta_ij = n_j eta_ji makes the
    # modal-energy response symmetric): the modal energy E_j / n_j of subsystem j with
    # 1 W into i equals E_i / n_i with 1 W into j
    data = modelgen.valid_model(rng)
    names = [n for n, s in data["subsystems"].items() if s["kind"] != "exterior"]
    i, j = rng.sample(names, 2)

    def modal_energy(src: str, at: str) -> np.ndarray:
        d = dict(data)
        d["excitations"] = {"unit": {"subsystem": src, "power": 1.0}}
        r = _solve(d)
        k = r.model.names.index(at)
        return np.asarray(r.solution.energy[k] / r.model.subsystems[k].modal_density)

    a, b = modal_energy(i, j), modal_energy(j, i)
    np.testing.assert_allclose(a, b, rtol=1e-9)


@SETTINGS
@given(st.randoms(use_true_random=False))
def test_energies_do_not_depend_on_the_order_of_the_subsystems(rng: random.Random):
    # common practice: the order subsystems are written in is not physics
    data = modelgen.valid_model(rng)
    order = list(data["subsystems"])
    shuffled = order[:]
    rng.shuffle(shuffled)
    a, b = _solve(data), _solve(data, shuffled)
    for name in order:
        ea = a.solution.energy[a.model.names.index(name)]
        eb = b.solution.energy[b.model.names.index(name)]
        np.testing.assert_allclose(eb, ea, rtol=1e-9, atol=0.0)


def _run(args: list[str]) -> tuple[int, str]:
    err = io.StringIO()
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(err):
        code = main(args)
    return code, err.getvalue()


@settings(
    max_examples=25,
    deadline=None,
    derandomize=True,
    suppress_health_check=[HealthCheck.too_slow],
)
@given(st.randoms(use_true_random=False), st.sampled_from(modelgen.BAD_VALUES))
def test_a_bad_value_in_any_numeric_key_is_a_clean_error(rng: random.Random, bad: Any):
    data = modelgen.valid_model(rng)
    path = rng.choice(list(modelgen.numeric_paths(data)))
    text = modelgen.to_toml(modelgen.mutated(data, path, bad))
    with tempfile.TemporaryDirectory() as tmp:
        f = Path(tmp) / "model.toml"
        f.write_text(text, encoding="utf-8")
        code, err = _run(["solve", str(f), "--csv", str(Path(tmp) / "out.csv")])
        written = (Path(tmp) / "out.csv").exists()
    assert code in (0, 2), (modelgen.dotted(path), bad, err)
    if code == 2:
        lines = [x for x in err.strip().splitlines() if not x.startswith(f"warning: {f}: ")]
        assert lines and all(line.startswith(f"error: {f}") for line in lines), err
        # the key path of the table (or, for the power balance of a band, its name)
        where = (modelgen.dotted(path[:2]), f"'{path[1]}'", f" {path[1]}")
        assert any(w in line for line in lines for w in where), (where, err)
        assert not written  # nothing is written when the input is bad
