"""Built-in library of generic acoustic and damping treatment layers.

The table lives in ``seatool/data/treatments.csv``. Every row is *invented, typical*: values
of the kind found for generic material classes (light glass fibre, dense mineral wool,
open-cell polyurethane foam, EPDM-like heavy layers, viscoelastic damping materials), not
any vendor's product. Use them for demonstrations and first estimates; override them with
:meth:`Treatment.replace` (``dataclasses.replace`` with validation) when measured data are
known.

Kinds
-----
``porous``
    Rigid- or limp-frame equivalent fluid (JCA parameters; Delany–Bazley/Miki need only the
    flow resistivity).
``heavy_layer``
    Limp impervious mass layer.
``viscoelastic``
    Damping material with a frequency-dependent complex modulus table
    (:class:`seatool.physics.damping_layers.ModulusTable`), for
    :func:`~seatool.physics.damping_layers.free_layer_damping` or
    :func:`~seatool.physics.damping_layers.constrained_layer_damping`.
``buildup``
    A sequence of other rows, listed from the base panel outwards.
"""

from __future__ import annotations

import csv
import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass
from importlib import resources
from pathlib import Path
from typing import Any, Literal

from seatool.physics import tmm
from seatool.physics.damping_layers import ModulusTable

__all__ = [
    "Treatment",
    "buildup_layers",
    "load_treatments",
    "to_tmm_layer",
]

TreatmentKind = Literal["porous", "heavy_layer", "viscoelastic", "buildup"]
_KINDS = ("porous", "heavy_layer", "viscoelastic", "buildup")


@dataclass(frozen=True)
class Treatment:
    """One treatment layer or build-up of the library.

    Attributes
    ----------
    name : str
        Table key.
    kind : {"porous", "heavy_layer", "viscoelastic", "buildup"}
        Layer kind.
    description : str
        Short description.
    thickness : float or None
        Thickness [m] (None for a build-up).
    density : float or None
        Bulk (apparent) density [kg/m^3] (None for a build-up).
    flow_resistivity : float or None
        Static airflow resistivity [Pa s/m^2] (porous).
    porosity, tortuosity : float or None
        Open porosity [-] and high-frequency tortuosity [-] (porous).
    viscous_length, thermal_length : float or None
        JCA characteristic lengths [m] (porous).
    poisson : float or None
        Poisson's ratio [-] (viscoelastic).
    modulus : ModulusTable or None
        Complex modulus table (viscoelastic).
    layers : tuple of str
        Names of the layers of a build-up, from the base outwards.
    source : str
        Provenance (``invented, typical`` for the built-in rows).
    notes : str
        Free text.
    """

    name: str
    kind: TreatmentKind
    description: str = ""
    thickness: float | None = None
    density: float | None = None
    flow_resistivity: float | None = None
    porosity: float | None = None
    tortuosity: float | None = None
    viscous_length: float | None = None
    thermal_length: float | None = None
    poisson: float | None = None
    modulus: ModulusTable | None = None
    layers: tuple[str, ...] = ()
    source: str = "user"
    notes: str = ""

    def __post_init__(self) -> None:
        """Check that the fields needed by the kind are present and physical."""
        if self.kind not in _KINDS:
            msg = f"{self.name}: kind must be one of {_KINDS}, got {self.kind!r}"
            raise ValueError(msg)
        for field in (
            "thickness",
            "density",
            "flow_resistivity",
            "tortuosity",
            "viscous_length",
            "thermal_length",
        ):
            value = getattr(self, field)
            if value is not None and not (math.isfinite(value) and value > 0.0):
                msg = f"{self.name}: {field} must be finite and > 0, got {value!r}"
                raise ValueError(msg)
        if self.kind == "buildup":
            if not self.layers:
                msg = f"{self.name}: a build-up needs at least one layer name in 'layers'"
                raise ValueError(msg)
            return
        if self.thickness is None or self.density is None:
            msg = f"{self.name}: thickness and density are required for kind {self.kind!r}"
            raise ValueError(msg)
        if self.kind == "porous":
            self._check_porous()
        elif self.kind == "viscoelastic" and self.modulus is None:
            msg = f"{self.name}: a viscoelastic treatment needs a modulus table"
            raise ValueError(msg)

    def _check_porous(self) -> None:
        if self.flow_resistivity is None:
            msg = f"{self.name}: a porous treatment needs flow_resistivity"
            raise ValueError(msg)
        if self.porosity is not None and not 0.0 < self.porosity <= 1.0:
            msg = f"{self.name}: porosity must lie in (0, 1], got {self.porosity!r}"
            raise ValueError(msg)
        if self.tortuosity is not None and self.tortuosity < 1.0:
            msg = f"{self.name}: tortuosity must be >= 1, got {self.tortuosity!r}"
            raise ValueError(msg)
        if (
            self.viscous_length is not None
            and self.thermal_length is not None
            and self.thermal_length < self.viscous_length
        ):
            msg = f"{self.name}: thermal_length must be >= viscous_length (fix one of them)"
            raise ValueError(msg)

    @property
    def mass_per_area(self) -> float:
        """Mass per area of a single layer [kg/m^2] (0 for a build-up; see
        :func:`buildup_layers` and :func:`seatool.physics.tmm.mass_per_area`)."""
        if self.thickness is None or self.density is None:
            return 0.0
        return self.thickness * self.density

    def replace(self, **changes: Any) -> Treatment:
        """Return a copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)


def _float_or_none(text: str) -> float | None:
    text = text.strip()
    return float(text) if text else None


def _parse_modulus(name: str, kind: str, text: str) -> ModulusTable | None:
    text = text.strip()
    if not text:
        return None
    if kind not in ("young", "shear"):
        msg = f"{name}: modulus_kind must be 'young' or 'shear', got {kind!r}"
        raise ValueError(msg)
    f: list[float] = []
    e: list[float] = []
    eta: list[float] = []
    for item in text.split("|"):
        parts = item.split(":")
        if len(parts) != 3:
            msg = f"{name}: modulus_table entries must be 'f:storage:loss_factor', got {item!r}"
            raise ValueError(msg)
        f.append(float(parts[0]))
        e.append(float(parts[1]))
        eta.append(float(parts[2]))
    return ModulusTable(tuple(f), tuple(e), tuple(eta), quantity=kind)  # type: ignore[arg-type]


def _row_to_treatment(row: Mapping[str, str]) -> Treatment:
    name = row["name"].strip()
    layers = tuple(s.strip() for s in row.get("layers", "").split("+") if s.strip())
    return Treatment(
        name=name,
        kind=row["kind"].strip(),  # type: ignore[arg-type]
        description=row.get("description", "").strip(),
        thickness=_float_or_none(row.get("thickness_m", "")),
        density=_float_or_none(row.get("density_kg_m3", "")),
        flow_resistivity=_float_or_none(row.get("flow_resistivity_Pa_s_m2", "")),
        porosity=_float_or_none(row.get("porosity", "")),
        tortuosity=_float_or_none(row.get("tortuosity", "")),
        viscous_length=_float_or_none(row.get("viscous_length_m", "")),
        thermal_length=_float_or_none(row.get("thermal_length_m", "")),
        poisson=_float_or_none(row.get("poisson", "")),
        modulus=_parse_modulus(
            name, row.get("modulus_kind", "").strip(), row.get("modulus_table", "")
        ),
        layers=layers,
        source=row.get("source", "").strip(),
        notes=row.get("notes", "").strip(),
    )


def load_treatments(path: str | Path | None = None) -> dict[str, Treatment]:
    """Load a treatment table.

    Parameters
    ----------
    path : str or Path, optional
        CSV file with the columns of ``seatool/data/treatments.csv``; default: the built-in
        table.

    Returns
    -------
    dict of str to Treatment
        Frozen treatments keyed by name, in file order.

    Raises
    ------
    ValueError
        On duplicate names, bad values, or a build-up naming an unknown layer.
    """
    if path is None:
        text = resources.files("seatool").joinpath("data/treatments.csv").read_text("utf-8")
    else:
        text = Path(path).read_text("utf-8")
    out: dict[str, Treatment] = {}
    for row in csv.DictReader(text.splitlines()):
        t = _row_to_treatment(row)
        if t.name in out:
            msg = f"duplicate treatment name {t.name!r}"
            raise ValueError(msg)
        out[t.name] = t
    for t in out.values():
        for layer in t.layers:
            if layer not in out or out[layer].kind == "buildup":
                msg = f"{t.name}: layer {layer!r} is not a single-layer treatment of the table"
                raise ValueError(msg)
    return out


def to_tmm_layer(
    treatment: Treatment,
    *,
    model: Literal["jca", "delany_bazley", "miki"] = "jca",
    frame: Literal["rigid", "limp"] = "rigid",
) -> tmm.Layer:
    """Convert a single-layer treatment to a transfer-matrix layer.

    Parameters
    ----------
    treatment : Treatment
        A ``porous``, ``heavy_layer`` or ``viscoelastic`` treatment.
    model : {"jca", "delany_bazley", "miki"}, optional
        Equivalent-fluid model for porous layers.
    frame : {"rigid", "limp"}, optional
        Frame model for porous layers (limp needs ``model="jca"``).

    Returns
    -------
    Layer
        :class:`~seatool.physics.tmm.PorousLayer` or, for heavy and viscoelastic layers, a
        :class:`~seatool.physics.tmm.LimpLayer` of the same mass per area (their bending
        stiffness is neglected).
    """
    if treatment.kind == "buildup":
        msg = f"{treatment.name}: use buildup_layers() for a build-up"
        raise ValueError(msg)
    if treatment.kind == "porous":
        assert treatment.thickness is not None and treatment.flow_resistivity is not None
        return tmm.PorousLayer(
            thickness=treatment.thickness,
            model=model,
            flow_resistivity=treatment.flow_resistivity,
            porosity=treatment.porosity if treatment.porosity is not None else 0.98,
            tortuosity=treatment.tortuosity if treatment.tortuosity is not None else 1.0,
            viscous_length=treatment.viscous_length,
            thermal_length=treatment.thermal_length,
            bulk_density=treatment.density or 0.0,
            frame=frame,
        )
    return tmm.LimpLayer(treatment.mass_per_area)


def buildup_layers(
    name: str,
    library: Mapping[str, Treatment] | None = None,
    *,
    model: Literal["jca", "delany_bazley", "miki"] = "jca",
    frame: Literal["rigid", "limp"] = "rigid",
) -> list[tmm.Layer]:
    """Transfer-matrix layers of a build-up (or of one layer), from the base outwards.

    Parameters
    ----------
    name : str
        Name of a build-up or single layer in ``library``.
    library : mapping, optional
        Treatments (default: :func:`load_treatments`).
    model, frame
        As in :func:`to_tmm_layer`.

    Returns
    -------
    list of Layer
        Use with :func:`seatool.physics.tmm_transmission.insertion_loss` (``trim`` argument);
        :func:`seatool.physics.tmm.mass_per_area` gives its mass per area.
    """
    lib = load_treatments() if library is None else library
    if name not in lib:
        msg = f"unknown treatment {name!r}; known: {', '.join(sorted(lib))}"
        raise KeyError(msg)
    t = lib[name]
    names = t.layers if t.kind == "buildup" else (t.name,)
    return [to_tmm_layer(lib[n], model=model, frame=frame) for n in names]
