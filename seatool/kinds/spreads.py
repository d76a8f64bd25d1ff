"""The ``[uncertainty.NAME]`` section: parameter spreads, validated at load.

Each table names a value of the file by its key path and gives it a distribution:
``lognormal`` with ``factor`` >= 1, ``uniform`` with ``tolerance`` in [0, 1) or ``low`` and
``high``, ``normal`` with ``sd`` >= 0 (``docs/model-format.md``, section "uncertainty").
The result is :attr:`seatool.model.Model.uncertainty`, used by the Monte Carlo analysis.
"""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path
from typing import Any

from ..errors import InputError, closest
from ..model import Uncertain
from .reader import Reader

__all__ = ["read_uncertainty", "read_uncertainty_section", "resolve"]

_KEYS = ("parameter", "distribution", "factor", "tolerance", "low", "high", "sd", "description")
_DISTRIBUTIONS = {
    "lognormal": ("factor",),
    "uniform": ("tolerance", "low", "high"),
    "normal": ("sd",),
}


def read_uncertainty(
    data: Mapping[str, Any], *, file: str = "<data>", base_dir: str | Path = "."
) -> list[Uncertain]:
    """Validate the ``[uncertainty.NAME]`` tables of parsed model data.

    Raises :class:`~seatool.errors.InputError` with one line per problem (key path,
    what is wrong, closest valid name).
    """
    rd = Reader(file=file, base_dir=Path(base_dir))
    out = read_uncertainty_section(rd, data)
    if rd.problems:
        raise InputError(rd.problems)
    return out


def read_uncertainty_section(rd: Reader, data: Mapping[str, Any]) -> list[Uncertain]:
    """The ``[uncertainty.NAME]`` tables of parsed model data; problems go to ``rd``."""
    out: list[Uncertain] = []
    section = data.get("uncertainty")
    if section is None:
        return out
    t = rd.table(section, "uncertainty")
    if t is None:
        return out
    seen: dict[str, str] = {}
    for name, spec in t.items():
        path = f"uncertainty.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        before = len(rd.problems)
        if not rd.keys(s, path, _KEYS, ("parameter", "distribution")):
            continue
        if len(rd.problems) > before:
            continue  # a misspelt key: its line already names the right one
        if "description" in s:
            rd.string(s["description"], f"{path}.description")
        par = rd.string(s["parameter"], f"{path}.parameter")
        dist = s["distribution"]
        if not isinstance(dist, str) or dist not in _DISTRIBUTIONS:
            rd.error(
                f"{path}.distribution",
                f"unknown distribution {dist!r}"
                + (closest(dist, list(_DISTRIBUTIONS)) if isinstance(dist, str) else "")
                + f"; known: {', '.join(_DISTRIBUTIONS)}",
            )
            continue
        if par is None:
            continue
        value: Any = None
        if par.split(".")[0] in ("uncertainty", "bands", "title", "description"):
            rd.error(f"{path}.parameter", f"{par!r} cannot be varied (choose a physical value)")
            continue
        value, msg = resolve(data, par)
        if msg is not None:
            rd.error(f"{path}.parameter", f"{par!r}: {msg}")
            continue
        if par in seen:
            rd.error(f"{path}.parameter", f"{par!r} already has the spread {seen[par]!r}")
            continue
        seen[par] = name
        own = _DISTRIBUTIONS[dist]
        for k in s:
            if k in ("factor", "tolerance", "low", "high", "sd") and k not in own:
                rd.error(
                    f"{path}.{k}", f"not used by distribution {dist!r} (it takes {', '.join(own)})"
                )
        kw: dict[str, float | None] = {}
        ok = True
        if dist == "lognormal":
            if "factor" not in s:
                rd.error(
                    f"{path}.factor", "missing required key (1-sigma multiplicative factor >= 1)"
                )
                continue
            kw["factor"] = rd.number(s["factor"], f"{path}.factor", minimum=1.0, strict=False)
            ok = kw["factor"] is not None
        elif dist == "normal":
            if "sd" not in s:
                rd.error(f"{path}.sd", "missing required key (standard deviation >= 0)")
                continue
            kw["sd"] = rd.number(s["sd"], f"{path}.sd", minimum=0.0, strict=False)
            ok = kw["sd"] is not None
        else:
            has_t = "tolerance" in s
            has_lh = "low" in s or "high" in s
            if has_t == has_lh:
                rd.error(path, "uniform needs either tolerance or both low and high")
                continue
            if has_t:
                tol = rd.number(s["tolerance"], f"{path}.tolerance", minimum=0.0, strict=False)
                if tol is not None and tol >= 1.0:
                    rd.error(f"{path}.tolerance", f"must be < 1 (a relative +-), got {tol}")
                    tol = None
                kw["tolerance"] = tol
                ok = tol is not None
            else:
                if "low" not in s or "high" not in s:
                    missing = "low" if "low" not in s else "high"
                    rd.error(
                        f"{path}.{missing}", "missing required key (uniform takes low and high)"
                    )
                    continue
                lo = rd.number(s["low"], f"{path}.low", minimum=None)
                hi = rd.number(s["high"], f"{path}.high", minimum=None)
                if lo is None or hi is None:
                    continue
                if not lo < hi:
                    rd.error(f"{path}.high", f"must be > low ({lo:g}), got {hi:g}")
                    continue
                if not isinstance(value, int | float):
                    rd.error(
                        f"{path}.low",
                        f"low/high need a single-number parameter; {par!r} has several values "
                        "(use tolerance)",
                    )
                    continue
                kw["low"], kw["high"] = lo, hi
        if not ok:
            continue
        out.append(Uncertain(name=name, parameter=par, distribution=dist, **kw))
    return out


def resolve(data: Mapping[str, Any], path: str) -> tuple[Any, str | None]:
    """The value at ``path``, or (None, message) naming the closest key where it fails."""
    parts = path.split(".")
    node: Any = data
    for k, part in enumerate(parts):
        if not isinstance(node, Mapping):
            where = ".".join(parts[:k])
            return None, f"{where} is not a table, so it has no key {part!r}"
        if part not in node:
            where = ".".join(parts[:k]) or "the top level"
            return None, f"no key {part!r} in {where}" + closest(part, [str(x) for x in node])
        node = node[part]
    if isinstance(node, bool):
        return None, "is a boolean, not a number or spectrum"
    if isinstance(node, int | float):
        return node, None
    if (
        isinstance(node, list)
        and node
        and all(isinstance(v, int | float) and not isinstance(v, bool) for v in node)
    ):
        return node, None
    if isinstance(node, Mapping):
        if "csv" in node:
            return (
                None,
                "is a CSV spectrum; give the values inline ({ band_hz, values }) to vary it",
            )
        vals = node.get("values")
        if (
            isinstance(vals, list)
            and vals
            and all(isinstance(v, int | float) and not isinstance(v, bool) for v in vals)
        ):
            return node, None
    return None, "is not a number, an array of numbers or a { band_hz, values } spectrum"
