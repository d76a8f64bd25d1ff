"""Random model files for the property-based tests and benchmarks/fuzz_models.py.

:func:`valid_model` draws a small valid model as nested data (plates, given structures,
cavities, an exterior sink; radiation, line junctions, given couplings; power, force and
held-level excitations); :func:`to_toml` writes it as TOML text (with ``nan``/``inf``);
:func:`numeric_paths` lists every numeric value's key path, :func:`mutated` replaces one
value with a bad one. Everything is invented test data.
"""

from __future__ import annotations

import json
import math
import random
from collections.abc import Iterator
from typing import Any

#: Values that must be refused (or accepted) cleanly wherever a number is expected.
BAD_VALUES: tuple[Any, ...] = (
    math.nan,
    math.inf,
    -math.inf,
    -1.0,
    0.0,
    -0.0,
    1e300,
    -1e300,
    1e-300,
    1e30,
    1e-30,
    10**30,
    "abc",
    "",
    True,
    [1.0, 2.0],
    {},
    {"x": 1},
)

_MATERIALS = ("steel", "aluminium", "glass")
_THIRD_OCTAVES = (50, 63, 80, 100, 125, 160, 200, 250, 315, 400, 500, 630, 800, 1000,
                  1250, 1600, 2000, 2500, 3150, 4000, 5000, 6300, 8000)  # fmt: skip


def _log(rng: random.Random, lo: float, hi: float) -> float:
    return float(f"{math.exp(rng.uniform(math.log(lo), math.log(hi))):.4g}")


def valid_model(rng: random.Random) -> dict[str, Any]:
    """A small valid model: 1-4 plates, 0-1 given structure, 1-2 cavities, maybe an exterior."""
    i0 = rng.randrange(0, len(_THIRD_OCTAVES) - 2)
    i1 = rng.randrange(i0 + 1, min(i0 + 9, len(_THIRD_OCTAVES)))
    bands = [_THIRD_OCTAVES[i] for i in range(i0, i1 + 1)]
    data: dict[str, Any] = {
        "title": "random model (invented)",
        "bands": {"spacing": "third-octave", "lowest": bands[0], "highest": bands[-1]},
    }
    subs: dict[str, Any] = {}
    cons: dict[str, Any] = {}
    exs: dict[str, Any] = {}
    plates = [f"plate{k}" for k in range(rng.randint(1, 4))]
    cavities = [f"room{k}" for k in range(rng.randint(1, 2))]
    for p in plates:
        subs[p] = {
            "kind": "plate",
            "material": rng.choice(_MATERIALS),
            "thickness": _log(rng, 0.001, 0.012),
            "lx": _log(rng, 0.4, 3.0),
            "ly": _log(rng, 0.4, 3.0),
            "damping": _log(rng, 0.002, 0.05),
        }
    for c in cavities:
        t60 = _log(rng, 0.2, 1.5)
        subs[c] = {
            "kind": "cavity",
            "dimensions": [_log(rng, 1.0, 4.0) for _ in range(3)],
            "damping": {"reverberation_time": t60},
        }
    given = rng.random() < 0.4
    if given:
        subs["frame"] = {
            "kind": "structure",
            "mass": _log(rng, 5.0, 200.0),
            "modal_density": _log(rng, 0.01, 1.0),
            "damping": _log(rng, 0.005, 0.05),
        }
    exterior = rng.random() < 0.5
    if exterior:
        subs["outside"] = {"kind": "exterior"}
    # connected: the first plate radiates into every cavity, each other plate into one
    for c in cavities:
        cons[f"{plates[0]}_{c}"] = {"kind": "radiation", "between": [plates[0], c]}
    for p in plates[1:]:
        cons[f"{p}_air"] = {"kind": "radiation", "between": [p, rng.choice(cavities)]}
    for p in plates:
        if exterior and rng.random() < 0.5:
            cons[f"{p}_out"] = {"kind": "radiation", "between": [p, "outside"]}
    for a, b in zip(plates, plates[1:], strict=False):
        if rng.random() < 0.7:
            edge = min(max(subs[a]["lx"], subs[a]["ly"]), max(subs[b]["lx"], subs[b]["ly"]))
            cons[f"{a}_{b}"] = {"kind": "line", "between": [a, b], "length": _log(rng, 0.2, edge)}
    if given:
        cons["frame_link"] = {
            "between": ["frame", rng.choice(plates)],
            "coupling_loss_factor": _log(rng, 1e-4, 1e-2),
        }
    exs["src"] = {"subsystem": rng.choice(plates), "power": _log(rng, 1e-4, 1.0)}
    if rng.random() < 0.5:
        exs["shaker"] = {"subsystem": rng.choice(plates), "force": _log(rng, 0.1, 10.0)}
    if len(cavities) > 1 and rng.random() < 0.3:
        exs["held"] = {"subsystem": cavities[-1], "sound_pressure_level": rng.uniform(60, 100)}
    data["subsystems"] = subs
    data["connections"] = cons
    data["excitations"] = exs
    return data


def _value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):
        return json.dumps(v)
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{json.dumps(k)} = {_value(x)}" for k, x in v.items()) + " }"
    raise TypeError(type(v))


def to_toml(data: dict[str, Any], order: list[str] | None = None) -> str:
    """TOML text of ``data``; ``order`` lists the subsystem names in the order written."""
    lines: list[str] = []
    for k, v in data.items():
        if not isinstance(v, dict):
            lines.append(f"{k} = {_value(v)}")
    for section, v in data.items():
        if not isinstance(v, dict):
            continue
        if section == "bands":
            lines.append("[bands]")
            lines.extend(f"{k} = {_value(x)}" for k, x in v.items())
            continue
        names = order if (section == "subsystems" and order is not None) else list(v)
        for name in names:
            lines.append(f"[{section}.{json.dumps(name)}]")
            lines.extend(f"{json.dumps(k)} = {_value(x)}" for k, x in v[name].items())
    return "\n".join(lines) + "\n"


def numeric_paths(data: Any, prefix: tuple[Any, ...] = ()) -> Iterator[tuple[Any, ...]]:
    """Key paths (tuples of keys and indices) of every number in ``data``."""
    if isinstance(data, dict):
        for k, v in data.items():
            yield from numeric_paths(v, (*prefix, k))
    elif isinstance(data, list):
        for i, v in enumerate(data):
            yield from numeric_paths(v, (*prefix, i))
    elif isinstance(data, int | float) and not isinstance(data, bool):
        yield prefix


def mutated(data: dict[str, Any], path: tuple[Any, ...], value: Any) -> dict[str, Any]:
    """A deep copy of ``data`` with the value at ``path`` replaced."""
    out = json.loads(json.dumps(data, allow_nan=True))
    node = out
    for k in path[:-1]:
        node = node[k]
    node[path[-1]] = value
    return out


def dotted(path: tuple[Any, ...]) -> str:
    """``subsystems.plate0.dimensions[1]`` for a key path tuple."""
    out = ""
    for k in path:
        out += f"[{k}]" if isinstance(k, int) else (f".{k}" if out else str(k))
    return out
