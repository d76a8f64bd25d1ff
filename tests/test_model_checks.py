"""Model construction: every per-band array is checked (all records at once), records whose
arrays are already read-only are kept, and an inconsistent model names its first problem in
model order, as when each record was checked on its own."""

from __future__ import annotations

import numpy as np
import pytest

from seatool import modelfile
from seatool.bands import BandAxis
from seatool.errors import InputError
from seatool.model import Connection, Model, ModelError, Subsystem

BANDS = BandAxis.from_range(100, 1000)
NB = len(BANDS)


def _sub(name: str, md: object = 1.0, eta: object = 0.01) -> Subsystem:
    return Subsystem(name, "structure", md, eta, quantity="velocity", mass=1.0)  # type: ignore[arg-type]


def test_arrays_are_read_only_copies_of_what_was_given() -> None:
    md = np.full(NB, 2.0)
    m = Model(BANDS, (_sub("a", md), _sub("b")), (Connection("c", "a", "b", np.full(NB, 1e-3)),))
    md[:] = 5.0  # the caller's array changes afterwards; the model's does not
    a = m.subsystem("a")
    assert np.all(a.modal_density == 2.0)
    assert not a.modal_density.flags.writeable and not a.damping.flags.writeable
    assert not m.connections[0].coupling_loss_factor.flags.writeable
    with pytest.raises(ValueError, match="read-only"):
        a.modal_density[0] = 1.0


def test_records_with_frozen_arrays_are_kept_not_copied() -> None:
    first = Model(BANDS, (_sub("a"), _sub("b")), (Connection("c", "a", "b", 1e-3),))
    again = Model(BANDS, first.subsystems, first.connections)
    assert all(x is y for x, y in zip(again.subsystems, first.subsystems, strict=True))
    assert again.connections[0] is first.connections[0]


@pytest.mark.parametrize(
    ("subs", "message"),
    [
        # the second subsystem's values are bad, the third's shape: the second is named
        ((_sub("a"), _sub("b", md=-1.0), _sub("c", md=np.ones(3))),
         "subsystems.b.modal_density must be positive and finite"),
        ((_sub("a"), _sub("b", md=np.ones(3)), _sub("c", eta=np.nan)),
         f"subsystems.b.modal_density: expected {NB} band values, got shape (3,)"),
        ((_sub("a", eta=-0.1), _sub("b", md=np.inf)), "subsystems.a.damping must be >= 0"),
    ],
)
def test_the_first_bad_subsystem_is_named(subs: tuple[Subsystem, ...], message: str) -> None:
    with pytest.raises(ModelError, match=message.replace("(", r"\(").replace(")", r"\)")):
        Model(BANDS, subs)


@pytest.mark.parametrize(
    ("cons", "message"),
    [
        ((Connection("c1", "a", "b", 1e-3), Connection("c2", "a", "b", 0.0),
          Connection("c3", "a", "zz", 1e-3)), "connections.c2.coupling_loss_factor must be"),
        ((Connection("c1", "a", "zz", 1e-3), Connection("c2", "a", "b", 0.0)),
         "connections.c1: unknown subsystem 'zz'"),
        ((Connection("c1", "a", "b", 1e-3), Connection("c1", "b", "a", 1e-3)),
         "duplicate connection name 'c1'"),
        ((Connection("c1", "a", "a", 1e-3),), "a subsystem cannot connect to itself"),
    ],
)
def test_the_first_bad_connection_is_named(cons: tuple[Connection, ...], message: str) -> None:
    with pytest.raises(ModelError, match=message):
        Model(BANDS, (_sub("a"), _sub("b")), cons)


def test_a_bad_value_in_a_large_file_names_its_file_and_key() -> None:
    # the per-key readers still report the key path of the one bad value among many
    lines = ["[bands]", "lowest = 100", "highest = 1000"]
    for i in range(300):
        lines += [f"[subsystems.s{i}]", 'kind = "structure"', "mass = 2", "modal_density = 1",
                  "damping = 0.01"]  # fmt: skip
    for i in range(299):
        clf = "2.5" if i == 217 else "1e-3"
        lines += [f"[connections.c{i}]", f'between = ["s{i}", "s{i + 1}"]',
                  f"coupling_loss_factor = {clf}"]  # fmt: skip
    with pytest.raises(InputError) as err:
        modelfile.loads("\n".join(lines), file="big.toml")
    (problem,) = err.value.problems
    assert problem.file == "big.toml"
    assert problem.path == "connections.c217.coupling_loss_factor"
    assert "outside the physical bounds" in problem.message
