"""Joint values of the entries that options of two or more surfaces change together, for
:func:`seatool.analysis.lightest.lightest_treatment`: a line junction between two treated
panels (its coupling depends on both), a cavity lined by the trims of several panels whose
absorption is combined by Eyring's formula (which does not add). For every combination of
those surfaces' options the reader builds the entry from the model file (the connection
and the subsystems it names; the other subsystems stand in as sinks).
"""

from __future__ import annotations

import itertools
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np
import numpy.typing as npt

from ..errors import InputError
from ..model import Model
from ..modelfile import build
from .variants import apply_changes

if TYPE_CHECKING:
    from .lightest import Surface

__all__ = ["JOINT_LIMIT", "shared_damping", "shared_tables", "subsystem_refs"]

Array = npt.NDArray[np.float64]

#: Most combinations of options built for a joint table of a shared entry.
JOINT_LIMIT = 256


def shared_tables(
    data: Mapping[str, Any],
    surfaces: Sequence[Surface],
    touched: Sequence[set[int]],
    base: Model,
    file: str,
    base_dir: str | Path,
) -> list[tuple[tuple[int, ...], npt.NDArray[np.int64], Array]]:
    """Coupling loss factors of the connections that options of two or more surfaces
    change (a line junction between two treated panels), for every combination of those
    surfaces' options: ``(surfaces, rows, table (O_1, ..., O_t, rows, B))``.

    Such a coupling depends on both ends together, so the product of the one-at-a-time
    ratios is not its value; the table holds the value built by the reader from the
    connection and the subsystems it names.
    """
    groups = _groups(touched)
    names = [c.name for c in base.connections]
    out = []
    for group, rows in groups.items():
        tables = sorted({names[r].split("[")[0] for r in rows})
        sizes = [len(surfaces[g].options) for g in group]
        table = np.zeros((*sizes, len(rows), len(base.bands)))
        for combo in itertools.product(*(range(n) for n in sizes)):
            changes: dict[str, Any] = {}
            for g, o in zip(group, combo, strict=True):
                changes.update(surfaces[g].options[o].changes)
            d = apply_changes(data, changes, file=file)
            named: set[str] = set()
            for t in tables:
                named.update(subsystem_refs(d["connections"][t]))
            part = {
                k: v for k, v in d.items() if k not in ("connections", "excitations", "targets")
            }
            # the subsystems the connections name; the others only need to exist (a trim
            # names the cavity it faces), so a sink stands in for them
            part["subsystems"] = {
                n: (v if n in named else {"kind": "exterior"}) for n, v in d["subsystems"].items()
            }
            part["connections"] = {t: d["connections"][t] for t in tables}
            try:
                m = build(part, file=file, base_dir=base_dir)
            except InputError:  # a subsystem needs another one: build them all
                part["subsystems"] = d["subsystems"]
                m = build(part, file=file, base_dir=base_dir)
            got = {c.name: c.coupling_loss_factor for c in m.connections}
            table[combo] = np.stack([got[names[r]] for r in rows])
        out.append((group, np.asarray(rows, dtype=np.int64), table))
    return out


def _groups(touched: Sequence[set[int]]) -> dict[tuple[int, ...], list[int]]:
    """Rows touched by two or more surfaces, grouped by the surfaces touching them."""
    owners: dict[int, list[int]] = {}
    for si, rows in enumerate(touched):
        for r in rows:
            owners.setdefault(int(r), []).append(si)
    groups: dict[tuple[int, ...], list[int]] = {}
    for r, ss in sorted(owners.items()):
        if len(ss) > 1:
            groups.setdefault(tuple(ss), []).append(r)
    return groups


def shared_damping(
    data: Mapping[str, Any],
    surfaces: Sequence[Surface],
    touched: Sequence[set[int]],
    base: Model,
    file: str,
    base_dir: str | Path,
    approx: list[str],
) -> list[tuple[tuple[int, ...], npt.NDArray[np.int64], Array]]:
    """Damping of the subsystems whose damping options of two or more surfaces change (a
    cavity lined by trims of several panels: Eyring's absorption does not add), for every
    combination of those surfaces' options (as :func:`shared_tables`). Above
    :data:`JOINT_LIMIT` combinations the changes are added instead and the subsystem is
    named in ``approx`` (the answer is still verified by a full rebuild)."""
    out = []
    for group, rows in _groups(touched).items():
        names = [base.subsystems[r].name for r in rows]
        comps = {base.subsystems[r].component or base.subsystems[r].name for r in rows}
        if all(_additive(data, c) for c in comps):
            continue  # absorption areas add: the sum of the changes is exact
        if int(np.prod([len(surfaces[g].options) for g in group])) > JOINT_LIMIT:
            approx.extend(sorted(comps))  # too many joint builds: combined additively
            continue
        sizes = [len(surfaces[g].options) for g in group]
        table = np.zeros((*sizes, len(rows), len(base.bands)))
        for combo in itertools.product(*(range(n) for n in sizes)):
            changes: dict[str, Any] = {}
            for g, o in zip(group, combo, strict=True):
                changes.update(surfaces[g].options[o].changes)
            d = apply_changes(data, changes, file=file)
            subs = d["subsystems"]

            part = {
                k: v for k, v in d.items() if k not in ("connections", "excitations", "targets")
            }
            part["subsystems"] = {
                n: (v if _keeps(n, v, comps) else {"kind": "exterior"}) for n, v in subs.items()
            }
            try:
                m = build(part, file=file, base_dir=base_dir)
            except InputError:  # a subsystem needs another one: build them all
                part["subsystems"] = subs
                m = build(part, file=file, base_dir=base_dir)
            got = {x.name: x.damping for x in m.subsystems}
            table[combo] = np.stack([got[n] for n in names])
        out.append((group, np.asarray(rows, dtype=np.int64), table))
    return out


def _additive(data: Mapping[str, Any], name: str) -> bool:
    """True when lining changes add in the damping of cavity ``name``: any damping but a
    ``surfaces`` form combined by Eyring (``method`` 'eyring' or 'auto')."""
    t = (data.get("subsystems", {}) or {}).get(name)
    d = t.get("damping") if isinstance(t, dict) else None
    if isinstance(d, dict) and "surfaces" in d:
        return d.get("method", "auto") == "sabine"
    return True


def _keeps(name: str, table: Any, comps: set[str]) -> bool:
    """A subsystem the damping of ``comps`` depends on: itself, or a panel whose trim faces
    one of them."""
    if name in comps:
        return True
    t = table.get("treatment") if isinstance(table, dict) else None
    return isinstance(t, dict) and bool({t.get("facing"), t.get("face")} & comps)


def subsystem_refs(table: Mapping[str, Any]) -> list[str]:
    """Every string a connection table holds (``between``, ``through``, ...): a connection
    depends on each subsystem it names, not only on its two ends (a non-resonant path
    depends on the panel it passes through)."""
    out: list[str] = []
    for v in table.values():
        if isinstance(v, str):
            out.append(v)
        elif isinstance(v, list):
            out.extend(x for x in v if isinstance(x, str))
    return out
