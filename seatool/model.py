"""The SEA model as plain, validated, immutable data.

A :class:`Model` is what the solver consumes: subsystems with per-band modal density
and damping loss factor, connections with a per-band coupling loss factor in one
direction (the other direction follows from reciprocity in the solver), and
excitations (input powers or prescribed levels). Every per-band array has shape
``(len(bands),)``. Models are built by :mod:`seatool.modelfile` from a TOML file or
directly in Python; solving never mutates them.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Literal, TypeVar

import numpy as np
import numpy.typing as npt

from .bands import BandAxis
from .errors import Problem
from .properties import Props

__all__ = [
    "Connection",
    "Uncertain",
    "Excitation",
    "LowFrequency",
    "Model",
    "PanelPlacement",
    "ModelError",
    "Subsystem",
    "Target",
]

Quantity = Literal["sound_pressure", "velocity", "energy"]
Array = npt.NDArray[np.float64]
_R = TypeVar("_R")


class ModelError(ValueError):
    """A model that is inconsistent (raised when building a :class:`Model` in Python)."""


def _frozen(a: npt.ArrayLike, nb: int, what: str) -> Array:
    """``a`` as a read-only float array of nb band values (kept if it is one already)."""
    if _is_frozen(a, nb):
        return a  # type: ignore[return-value]
    arr = np.array(a, dtype=float)
    if arr.ndim == 0:
        arr = np.full(nb, float(arr))
    if arr.shape != (nb,):
        raise ModelError(f"{what}: expected {nb} band values, got shape {arr.shape}")
    arr.setflags(write=False)
    return arr


@dataclass(frozen=True)
class Subsystem:
    """One wave field of one physical component.

    Attributes
    ----------
    name : str
        Unique name.
    kind : str
        What it represents ('cavity', 'structure', 'exterior', ...).
    modal_density : ndarray
        n(f) per band [modes/Hz]; ``inf`` for the exterior sink.
    damping : ndarray
        Damping (internal) loss factor per band [-].
    quantity : {'sound_pressure', 'velocity', 'energy'}
        Which level its energy converts to.
    volume : float or None
        Cavity volume [m^3] (sound-pressure subsystems).
    mass : float or None
        Mass [kg] (velocity subsystems).
    density, sound_speed : float or None
        Fluid density [kg/m^3] and speed of sound [m/s] (cavities).
    sink : bool
        True for a free-field exterior that absorbs what it receives: its energy is
        held at zero and it returns nothing.
    provenance : mapping
        Where each derived value came from (e.g. ``{'modal_density': 'given'}``).
    component : str
        The physical component this wave field belongs to (a plate carries bending,
        longitudinal and shear fields as three subsystems of one component); defaults to
        ``name``.
    props : PanelProps, ShellProps, BeamProps, CavityProps, DuctProps, ResonatorProps or None
        What the subsystem physically is (:mod:`seatool.properties`: typed records with
        units in their field metadata), used by coupling and excitation kinds; None for a
        subsystem given by its values only.
    """

    name: str
    kind: str
    modal_density: Array
    damping: Array
    quantity: Quantity = "energy"
    volume: float | None = None
    mass: float | None = None
    density: float | None = None
    sound_speed: float | None = None
    sink: bool = False
    provenance: Mapping[str, str] = field(default_factory=dict)
    component: str = ""
    props: Props | None = None

    def __post_init__(self) -> None:
        if not self.component:
            object.__setattr__(self, "component", self.name)


@dataclass(frozen=True)
class Connection:
    """A coupling between two subsystems, stated in one direction.

    ``coupling_loss_factor`` is eta_ab from ``a`` to ``b`` per band; eta_ba follows
    from reciprocity n_a eta_ab = n_b eta_ba (Lyon & DeJong 1995, eq. 3.x; Vigran
    2008, eq. 7.6) inside the solver, so the system is consistent by construction.
    """

    name: str
    a: str
    b: str
    coupling_loss_factor: Array
    kind: str = "given"
    provenance: Mapping[str, str] = field(default_factory=dict)


@dataclass(frozen=True)
class Excitation:
    """A source acting on one subsystem.

    ``drive`` says how it acts (not to be confused with the model file's ``kind``, the
    declared kind that read the entry):
    ``drive == 'power'``: ``power`` is the band input power [W].
    ``drive == 'prescribed'``: ``energy`` is the band energy [J] the subsystem is held at
    (converted from a measured level), ``level`` and ``quantity`` keep what was given.
    ``through``: the panel a diffuse field's non-resonant (mass-law) part crosses to reach
    ``subsystem`` (empty for every other excitation).
    """

    name: str
    subsystem: str
    drive: Literal["power", "prescribed"]
    power: Array | None = None
    energy: Array | None = None
    level: Array | None = None
    quantity: str | None = None
    description: str = ""
    through: str = ""


@dataclass(frozen=True)
class Uncertain:
    """One uncertain parameter of the model file (``[uncertainty.NAME]``): where it is (its
    key path) and how it is drawn (``docs/model-format.md``, section "uncertainty")."""

    name: str
    parameter: str  # key path
    distribution: str
    factor: float | None = None
    tolerance: float | None = None
    low: float | None = None
    high: float | None = None
    sd: float | None = None

    def draw(self, rng: np.random.Generator, n: int) -> Array:
        """Standard variates of this parameter for n samples."""
        if self.distribution == "uniform":
            return rng.uniform(-1.0, 1.0, n) if self.low is None else rng.uniform(0.0, 1.0, n)
        return rng.standard_normal(n)

    def apply(self, value: Array, d: Array) -> Array:
        """Sampled values from the file value(s) ``value`` and the variates ``d``."""
        if self.distribution == "lognormal":
            assert self.factor is not None
            return value * self.factor**d
        if self.distribution == "normal":
            assert self.sd is not None
            return value + self.sd * d
        if self.low is not None:
            assert self.high is not None
            return np.broadcast_to(
                self.low + (self.high - self.low) * d, np.broadcast(value, d).shape
            )
        assert self.tolerance is not None
        return value * (1.0 + self.tolerance * d)


@dataclass(frozen=True)
class Target:
    """Noise limits for one receiver subsystem (``[targets.NAME]`` of a model file).

    ``limits`` maps a metric name (a key of :data:`seatool.metrics.METRICS`, e.g. ``dBA``)
    to its limit in the metric's unit; ``band_limit`` is a per-band limit [dB] of the
    receiver's band level (same reference as its level), or None. A target is met when no
    level exceeds its limit (margin = limit - level >= 0).
    """

    name: str
    receiver: str
    limits: Mapping[str, float] = field(default_factory=dict)
    band_limit: Array | None = None
    description: str = ""


@dataclass(frozen=True)
class PanelPlacement:
    """Where a panel subsystem sits on a box-shaped cavity: a face (``x0``... ``z1``) and its
    corner (u0, v0) [m]; ``force_point`` (u, v) [m] is where a power input on it acts (None:
    the modal solution's default point)."""

    face: str
    offset: tuple[float, float] = (0.0, 0.0)
    force_point: tuple[float, float] | None = None


@dataclass(frozen=True)
class LowFrequency:
    """A request for the modal solution of a box-shaped cavity below the SEA range
    (``[low_frequency.CAVITY]`` of a model file).

    ``dims`` (Lx, Ly, Lz) [m] (None: the cavity's own dimensions), ``up_to`` the highest
    band centre solved modally [Hz] (None: chosen from the SEA validity limits), ``panels``
    the panel subsystems in its walls by name.
    """

    cavity: str
    dims: tuple[float, float, float] | None
    up_to: float | None
    panels: Mapping[str, PanelPlacement]


@dataclass(frozen=True)
class Model:
    """A complete SEA model, ready to solve."""

    bands: BandAxis
    subsystems: tuple[Subsystem, ...]
    connections: tuple[Connection, ...] = ()
    excitations: tuple[Excitation, ...] = ()
    title: str = ""
    source: str = ""
    notes: tuple[str, ...] = ()
    #: Descriptive lines from the readers (treatment build-ups and their masses, ...),
    #: printed by ``seatool check``.
    reports: tuple[str, ...] = ()
    #: Plausibility warnings (file, key path, message): values inside the physical bounds
    #: but unusual for their role (:mod:`seatool.kinds.plausibility`).
    warnings: tuple[Problem, ...] = ()
    #: The validated ``[uncertainty.NAME]`` spreads (used by the Monte Carlo analysis).
    uncertainty: tuple[Uncertain, ...] = ()
    #: Noise limits per receiver (``[targets.NAME]``), checked by :mod:`seatool.analysis.targets`.
    targets: tuple[Target, ...] = ()
    #: Boxes solved modally below the SEA range (``[low_frequency.CAVITY]``), merged with the
    #: SEA result per band by :mod:`seatool.crossover`.
    low_frequency: tuple[LowFrequency, ...] = ()

    def __post_init__(self) -> None:
        nb = len(self.bands)
        names = [s.name for s in self.subsystems]
        if len(set(names)) != len(names):
            dup = sorted({n for n in names if names.count(n) > 1})
            raise ModelError(f"duplicate subsystem names: {', '.join(dup)}")
        if not names:
            raise ModelError("a model needs at least one subsystem")
        subs = _checked_subsystems(self.subsystems, nb)
        object.__setattr__(self, "subsystems", subs)
        by_name = {s.name: s for s in subs}
        object.__setattr__(self, "_by_name", by_name)
        sinks = {s.name for s in subs if s.sink}
        object.__setattr__(
            self, "connections", _checked_connections(self.connections, nb, by_name, sinks)
        )
        exs = []
        enames: set[str] = set()
        for e in self.excitations:
            if e.name in enames:
                raise ModelError(f"duplicate excitation name {e.name!r}")
            enames.add(e.name)
            if e.subsystem not in by_name:
                raise ModelError(f"excitations.{e.name}: unknown subsystem {e.subsystem!r}")
            if e.drive == "power":
                if e.power is None:
                    raise ModelError(f"excitations.{e.name}: power missing")
                p = _frozen(e.power, nb, f"excitations.{e.name}.power")
                if not np.all(np.isfinite(p) & (p >= 0)):
                    raise ModelError(f"excitations.{e.name}.power must be >= 0 and finite")
                exs.append(e if p is e.power else _with(e, power=p))
            else:
                if e.energy is None:
                    raise ModelError(f"excitations.{e.name}: energy missing")
                en = _frozen(e.energy, nb, f"excitations.{e.name}.energy")
                if not np.all(np.isfinite(en) & (en >= 0)):
                    raise ModelError(f"excitations.{e.name}.energy must be >= 0 and finite")
                exs.append(e if en is e.energy else _with(e, energy=en))
        held = [e.subsystem for e in exs if e.drive == "prescribed"]
        for n in set(held):
            if held.count(n) > 1:
                raise ModelError(f"subsystem {n!r} has more than one prescribed level")
            if any(e.drive == "power" and e.subsystem == n for e in exs):
                raise ModelError(
                    f"subsystem {n!r} has a prescribed level and an input power; "
                    "a held level already fixes its energy"
                )
            if n in sinks:
                raise ModelError(f"the exterior {n!r} cannot have a prescribed level")
        object.__setattr__(self, "excitations", tuple(exs))
        tgs = []
        tnames: set[str] = set()
        for t in self.targets:
            if t.name in tnames:
                raise ModelError(f"duplicate target name {t.name!r}")
            tnames.add(t.name)
            if t.receiver not in by_name:
                raise ModelError(f"targets.{t.name}: unknown subsystem {t.receiver!r}")
            if t.receiver in sinks:
                raise ModelError(f"targets.{t.name}: the exterior sink has no level")
            if not t.limits and t.band_limit is None:
                raise ModelError(f"targets.{t.name}: no limit given")
            bl = None
            if t.band_limit is not None:
                bl = _frozen(t.band_limit, nb, f"targets.{t.name}.band_limit")
            tgs.append(_with(t, limits=dict(t.limits), band_limit=bl))
        object.__setattr__(self, "targets", tuple(tgs))
        boxes: set[str] = set()
        for lf in self.low_frequency:
            where = f"low_frequency.{lf.cavity}"
            if lf.cavity in boxes:
                raise ModelError(f"{where}: the cavity is asked for twice")
            boxes.add(lf.cavity)
            if lf.cavity not in by_name or by_name[lf.cavity].quantity != "sound_pressure":
                raise ModelError(f"{where}: not a cavity of the model")
            if not lf.panels:
                raise ModelError(f"{where}: name at least one panel")
            for name in lf.panels:
                if name not in by_name or by_name[name].quantity != "velocity":
                    raise ModelError(f"{where}.panels.{name}: not a panel of the model")

    # -- lookup -------------------------------------------------------------------------
    @property
    def names(self) -> tuple[str, ...]:
        return tuple(s.name for s in self.subsystems)

    def subsystem(self, name: str) -> Subsystem:
        """The subsystem called ``name`` (KeyError if there is none)."""
        by_name: dict[str, Subsystem] = self.__dict__["_by_name"]
        return by_name[name]

    def index(self) -> dict[str, int]:
        return {s.name: i for i, s in enumerate(self.subsystems)}


def _is_frozen(a: object, nb: int) -> bool:
    """True for a read-only float array of shape (nb,) that nothing can change (its base,
    if any, is read-only too): such an array is kept as it is, not copied."""
    if type(a) is not np.ndarray or a.dtype != np.float64 or a.shape != (nb,):
        return False
    if a.flags.writeable:
        return False
    base = a.base
    return base is None or (isinstance(base, np.ndarray) and not base.flags.writeable)


def _frozen_rows(arrays: list[object], nb: int) -> list[Array] | None:
    """Read-only copies of many per-band arrays at once (rows of one stacked array), or
    None if any is not already a float array of shape (nb,) (then each is checked alone)."""
    for a in arrays:
        if not isinstance(a, np.ndarray) or a.shape != (nb,):
            return None
    block = np.array(arrays, dtype=float)
    block.setflags(write=False)
    return list(block)


def _freeze_field(
    records: tuple[Subsystem, ...] | tuple[Connection, ...], attr: str, nb: int
) -> list[Array]:
    """The ``attr`` arrays of the records, every one read-only: kept where already frozen,
    the others copied together (raises ModelError from :func:`_frozen` for a bad shape)."""
    out: list[Array] = [getattr(r, attr) for r in records]
    todo = [i for i, a in enumerate(out) if not _is_frozen(a, nb)]
    if todo:
        rows = _frozen_rows([out[i] for i in todo], nb)
        if rows is None:
            rows = [_frozen(out[i], nb, attr) for i in todo]
        for i, row in zip(todo, rows, strict=True):
            out[i] = row
    return out


def _checked_subsystems(subsystems: tuple[Subsystem, ...], nb: int) -> tuple[Subsystem, ...]:
    """The subsystems with read-only per-band arrays, checked all at once.

    Records whose arrays are already frozen are kept, not copied. If anything is wrong,
    the records are checked one by one so that the error is the first in model order, with
    the same message as always.
    """
    try:
        md = _freeze_field(subsystems, "modal_density", nb)
        dm = _freeze_field(subsystems, "damping", nb)
    except (ModelError, ValueError, TypeError):  # checked one by one below
        md = dm = []
    if md:
        m, d = np.array(md), np.array(dm)
        sink = np.fromiter((s.sink for s in subsystems), bool, len(subsystems))
        with np.errstate(invalid="ignore"):
            ok = ((np.isfinite(m) & (m > 0)).all(axis=1) | sink) & (np.isfinite(d) & (d >= 0)).all(
                axis=1
            )
        if ok.all():
            return tuple(
                s
                if (a is s.modal_density and b is s.damping)
                else _with(s, modal_density=a, damping=b)
                for s, a, b in zip(subsystems, md, dm, strict=True)
            )
    return tuple(_checked_subsystem(s, nb) for s in subsystems)  # raises the first error


def _checked_subsystem(s: Subsystem, nb: int) -> Subsystem:
    md = _frozen(s.modal_density, nb, f"subsystems.{s.name}.modal_density")
    dm = _frozen(s.damping, nb, f"subsystems.{s.name}.damping")
    if not s.sink and not np.all(np.isfinite(md) & (md > 0)):
        raise ModelError(f"subsystems.{s.name}.modal_density must be positive and finite")
    if not np.all(np.isfinite(dm) & (dm >= 0)):
        raise ModelError(f"subsystems.{s.name}.damping must be >= 0 and finite")
    return _with(s, modal_density=md, damping=dm)


def _checked_connections(
    connections: tuple[Connection, ...], nb: int, known: Mapping[str, Subsystem], sinks: set[str]
) -> tuple[Connection, ...]:
    """The connections with read-only coupling loss factors, checked all at once (one by
    one if anything is wrong, so that the first error in model order is raised)."""
    if not connections:
        return ()
    try:
        etas = _freeze_field(connections, "coupling_loss_factor", nb)
    except (ModelError, ValueError, TypeError):  # checked one by one below
        etas = []
    if etas:
        e = np.array(etas)
        with np.errstate(invalid="ignore"):
            ok = bool((np.isfinite(e) & (e > 0)).all())
        names = {c.name for c in connections}
        ok = ok and len(names) == len(connections)
        ok = ok and all(
            c.a in known and c.b in known and c.a != c.b and c.a not in sinks for c in connections
        )
        if ok:
            return tuple(
                c if eta is c.coupling_loss_factor else _with(c, coupling_loss_factor=eta)
                for c, eta in zip(connections, etas, strict=True)
            )
    cons = []
    cnames: set[str] = set()
    for c in connections:  # one by one: raises the first error in model order
        if c.name in cnames:
            raise ModelError(f"duplicate connection name {c.name!r}")
        cnames.add(c.name)
        for end in (c.a, c.b):
            if end not in known:
                raise ModelError(f"connections.{c.name}: unknown subsystem {end!r}")
        if c.a == c.b:
            raise ModelError(f"connections.{c.name}: a subsystem cannot connect to itself")
        eta = _frozen(c.coupling_loss_factor, nb, f"connections.{c.name}.coupling_loss_factor")
        if not np.all(np.isfinite(eta) & (eta > 0)):
            raise ModelError(f"connections.{c.name}.coupling_loss_factor must be positive")
        if c.a in sinks and c.b in sinks:
            raise ModelError(f"connections.{c.name}: two exterior sinks cannot be connected")
        if c.a in sinks:
            raise ModelError(
                f"connections.{c.name}: state the coupling from the structure to the exterior "
                f"(put {c.b!r} first in 'between')"
            )
        cons.append(_with(c, coupling_loss_factor=eta))
    return tuple(cons)


def _with(obj: _R, **changes: object) -> _R:
    """A copy of the frozen record ``obj`` with ``changes`` (no re-validation: the fields
    are already checked; cheaper than :func:`dataclasses.replace`)."""
    new = object.__new__(type(obj))
    new.__dict__.update(obj.__dict__)
    new.__dict__.update(changes)
    return new
