"""Kinds declare their parameters: :class:`Param`, :class:`Kind` and the generic check.

Every subsystem, connection, excitation, damping-form, treatment and layer kind of the
model file is a :class:`Kind`: its parameters as data (name, type, unit, one-line doc,
required or default, sign rule, physical bounds, choices) next to one ``derive`` function
that turns already validated values into subsystems, coupling loss factors, input powers
or loss factors. :func:`seatool.kinds.validate.check` validates a table against a declaration (unknown keys with
the closest valid name, missing keys, types, units, bounds, choices, spectra and names of
materials, fluids and subsystems), so messages are the same for every kind; the key tables
of ``docs/model-format.md`` are generated from the same declarations
(:mod:`seatool.kinds.docs`).

Physical bounds (``bounds``) are hard limits outside which a value is refused (exit code
2). They are wide, meant to catch a wrong unit or a typing slip rather than to judge a
design; their basis is stated in ``basis`` (``common practice`` unless a source is named).
``typical`` is the narrower range of ordinary designs: a value outside it is accepted with
a plausibility warning (:func:`seatool.kinds.validate.check_value`; ``--strict`` turns
warnings into errors).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from functools import cached_property
from typing import Any

__all__ = ["FAMILIES", "Kind", "Param", "RAW_TYPES", "TYPE_NAMES", "type_doc"]

#: Families of kinds, in the order of the documentation.
FAMILIES = (
    "subsystem",
    "connection",
    "excitation",
    "damping",
    "treatment",
    "layer",
    "low_frequency",
)

#: Value types a :class:`Param` may have and how the documentation names them.
TYPE_NAMES = {
    "number": "number",
    "numbers": "numbers",
    "number_or_auto": "number or `\"auto\"`",
    "integer": "whole number",
    "spectrum": "spectrum",
    "flag": "true or false",
    "string": "string",
    "choice": "one of",
    "material": "material (name or table)",
    "fluid": "fluid name",
    "subsystem": "subsystem name",
    "table": "table",
    "array": "array",
    "damping": "spectrum or damping form",
    "layers": "layer name, table or array",
}

#: Types read by the kind's own ``derive`` function (nested tables and arrays whose
#: meaning depends on other values); :func:`check` passes them through unchanged.
RAW_TYPES = frozenset({"table", "array", "damping", "layers"})


@dataclass(frozen=True)
class Param:
    """One key of a kind's table.

    Attributes
    ----------
    name : str
        The key as written in the model file.
    type : str
        One of :data:`TYPE_NAMES`.
    unit : str
        SI unit shown in messages and documentation ('' for none).
    doc : str
        One-line meaning.
    required : bool
        The key must be given.
    default : object
        Value used when the key is absent (None: absent).
    default_doc : str
        How the documentation describes a computed default (e.g. ``material's``).
    minimum, strict : float or None, bool
        Sign rule: the value must be ``> minimum`` (strict) or ``>= minimum``.
    maximum : float or None
        Value must be ``<= maximum`` (or ``< maximum`` if ``strict_max``).
    bounds : (float, float) or None
        Hard physical bounds (inclusive); outside them the input is refused.
    typical : (float, float) or None
        Ordinary range of designs; outside it a plausibility warning is given.
    basis : str
        Where the bounds come from (``common practice`` unless a source is named).
    why : str
        Why a value outside ``typical`` matters (shown in the plausibility warning).
    choices : tuple of str
        Allowed values of a ``choice``.
    length : int or None
        Number of entries of a ``numbers`` array (each checked like a ``number``).
    """

    name: str
    type: str = "number"
    unit: str = ""
    doc: str = ""
    required: bool = False
    default: Any = None
    default_doc: str = ""
    minimum: float | None = 0.0
    strict: bool = True
    maximum: float | None = None
    strict_max: bool = False
    bounds: tuple[float, float] | None = None
    typical: tuple[float, float] | None = None
    basis: str = "common practice"
    why: str = ""
    choices: tuple[str, ...] = ()
    length: int | None = None

    def __post_init__(self) -> None:
        if self.type not in TYPE_NAMES:
            raise ValueError(f"Param {self.name!r}: unknown type {self.type!r}")
        if self.type == "choice" and not self.choices:
            raise ValueError(f"Param {self.name!r}: a choice needs choices")


@dataclass(frozen=True)
class Kind:
    """A kind of the model file: its declaration and the function that derives from it.

    Attributes
    ----------
    family : str
        One of :data:`FAMILIES`.
    name : str
        The value of ``kind`` (for excitations: the key that states the source; for
        damping forms: the key inside ``damping = { ... }``).
    doc : str
        One paragraph for the documentation.
    params : tuple of Param
        The keys of its table (besides those every table of the family takes).
    derive : callable
        Builds the result from validated values; its signature depends on the family
        (see :mod:`seatool.kinds.registry`).
    implicit : tuple of str
        Keys of the family's tables read by the section reader (``kind``, ``between`` ...).
    extent : str
        Connections only: over what the coupling acts, ``"point"``, ``"line"`` or
        ``"area"`` ('' when not stated: treated as point-like). The spread of the
        response differs (rain-on-the-roof input for line and area couplings,
        :mod:`seatool.analysis.confidence`).
    """

    family: str
    name: str
    doc: str
    params: tuple[Param, ...]
    derive: Callable[..., Any]
    implicit: tuple[str, ...] = ("kind", "description")
    extent: str = ""

    def __post_init__(self) -> None:
        if self.family not in FAMILIES:
            raise ValueError(f"Kind {self.name!r}: unknown family {self.family!r}")
        if self.extent not in ("", "point", "line", "area") or (
            self.extent and self.family != "connection"
        ):
            raise ValueError(f"Kind {self.name!r}: extent {self.extent!r} not allowed")
        names = [p.name for p in self.params]
        if len(set(names)) != len(names):
            raise ValueError(f"Kind {self.name!r}: a parameter is declared twice")

    @cached_property
    def allowed(self) -> tuple[str, ...]:
        """Every key its table may have."""
        return (*self.implicit, *(p.name for p in self.params))

    @cached_property
    def required(self) -> tuple[str, ...]:
        return tuple(p.name for p in self.params if p.required)

    def param(self, name: str) -> Param:
        for p in self.params:
            if p.name == name:
                return p
        raise KeyError(name)


def type_doc(p: Param) -> str:
    """How the documentation shows a parameter's type."""
    base = TYPE_NAMES[p.type]
    if p.type == "choice":
        return "one of " + ", ".join(f'`"{c}"`' for c in p.choices)
    if p.type == "numbers":
        base = f"{p.length} numbers" if p.length else "numbers"
    return base + (f" [{p.unit}]" if p.unit else "")

