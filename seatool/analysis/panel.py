"""Band-by-band properties of one flat isotropic panel (the table of ``seatool panel``).

For a material, a thickness and a size ``lx`` x ``ly``, :func:`panel_table` gives per band:

* the coincidence (critical) frequency, modal density, modes in band, modal overlap and
  bending wavelength (:mod:`seatool.physics`);
* with a treatment (``damping_layer``, ``cover``, ``trim`` of :class:`PanelSpec`): the
  composite loss factor and bonded mass of a damping layer, the absorption, insertion loss
  and mass of a trim, read by the model file's own reader
  (:func:`seatool.kinds.plate_treatment.read_plate_treatment`,
  :func:`seatool.kinds.layers.lining_absorption`);
* the band-averaged radiation efficiency and the transmission loss of the two-room SEA
  model of the panel (:func:`two_room_model`, :func:`room_transmission_loss`);
* the panel's total loss factor as mounted (:func:`installed_loss_factor`): unless a
  loss factor is stated (``mounting="stated"``), the material's internal loss factor plus
  the losses into the laboratory opening (``"laboratory"``), plus those of a resilient,
  lossy edge seal (``"sealed"``, :class:`EdgeSeal`), or the losses into edges of a stated
  absorption coefficient (``"edges"``); without a stated mounting glazing is sealed and
  every other panel in the laboratory opening (:func:`default_mounting`).

Bad treatment input raises :class:`seatool.errors.InputError` whose key paths start with
the :class:`PanelSpec` field name (``damping_layer``, ``cover``, ``trim``).
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt
import pandas as pd

from ..bands import BandAxis
from ..errors import InputError, Problem
from ..kinds.layers import lining_absorption
from ..kinds.plate_treatment import read_plate_treatment
from ..levels import db
from ..materials import Fluid, Material
from ..model import Model
from ..modelfile import Reader, build
from ..physics import coupling, damping, edge_mounting, installed_damping, plates, radiation
from ..physics import validity as pv
from ..solve import solve

__all__ = [
    "DEFAULT_REVERBERATION_TIME",
    "DEFAULT_ROOM_VOLUMES",
    "DEFAULT_SEAL",
    "EdgeSeal",
    "GLAZING_MATERIALS",
    "MOUNTINGS",
    "PanelSpec",
    "basic_columns",
    "coupling_columns",
    "default_mounting",
    "MOUNTING_NOTE",
    "installed_loss_factor",
    "mounting_note",
    "panel_table",
    "room_transmission_loss",
    "seal_edge_absorption",
    "treatment_columns",
    "two_room_model",
]

Array = npt.NDArray[np.float64]

#: Default room volumes [m^3]: of the order of laboratory rooms (EN ISO 10140-5 asks for
#: at least 50 m^3, from memory), different so that their modes do not coincide.
DEFAULT_ROOM_VOLUMES = (60.0, 75.0)
#: Default reverberation time of both rooms [s] (common practice for test rooms).
DEFAULT_REVERBERATION_TIME = 1.5
#: How the panel's edges lose energy (:func:`installed_loss_factor`).
MOUNTINGS = ("laboratory", "sealed", "edges", "stated")
#: The note of :func:`mounting_note`.
MOUNTING_NOTE = (
    "note: at coincidence this panel loses more by radiation than internally and into a "
    "laboratory opening, so its coincidence dip depends on the losses of its mounting "
    "(putty, gaskets, screws), which the laboratory form (fitted to heavy walls) does not "
    "give: for a panel held in gaskets or sealant add its edge seal (--seal, --seal-*), or "
    "state the loss factor as mounted (--loss-factor) or the edges' absorption "
    "(--edge-absorption); see docs/theory/subsystems.md, section 11"
)
#: Shape of the rooms: side ratios (product 1) of a shoebox, common practice.
_ROOM_RATIOS = (0.8, 1.0, 1.25)


@dataclass(frozen=True)
class EdgeSeal:
    """A resilient strip on each face of the panel along its whole perimeter.

    The panel sits in a rigid frame (the laboratory opening) through the two strips
    (:func:`seatool.physics.edge_mounting.seal_stiffness`).

    Attributes
    ----------
    youngs_modulus : float
        Effective compression modulus of the strip material [Pa].
    loss_factor : float
        Loss factor of the strip material [-].
    width : float
        Contact width of each strip on the panel face [m].
    thickness : float
        Thickness of each strip between panel and frame [m].
    """

    youngs_modulus: float
    loss_factor: float
    width: float
    thickness: float

    def __post_init__(self) -> None:
        for name in ("youngs_modulus", "width", "thickness"):
            v = getattr(self, name)
            if not (np.isfinite(v) and v > 0):
                msg = f"{name} of the seal must be finite and > 0, got {v!r}"
                raise ValueError(msg)
        if not (np.isfinite(self.loss_factor) and self.loss_factor >= 0):
            msg = f"loss_factor of the seal must be finite and >= 0, got {self.loss_factor!r}"
            raise ValueError(msg)


#: A glazing gasket of EPDM rubber (values common practice, from memory, not fitted to any
#: measurement): Shore A 60 - 70, Young's modulus about 5 MPa (plausible 2 - 10 MPa), loss
#: factor 0.2 (0.1 - 0.5), 10 mm contact width (5 - 15 mm), 4 mm thick (2 - 6 mm). A
#: silicone or polyurethane sealant bead lies in the same range (0.5 - 5 MPa, 0.1 - 0.3);
#: putty and butyl are softer and lossier. docs/theory/subsystems.md, section 11, shows
#: the ratings across these ranges.
DEFAULT_SEAL = EdgeSeal(youngs_modulus=5.0e6, loss_factor=0.2, width=0.010, thickness=0.004)

#: Built-in materials whose panels are glazing. Glazing is set into its frame, and into the
#: opening of a test laboratory, with a resilient seal on each face (gaskets, sealant or
#: putty: common practice; the laboratory mounting of glazing in EN ISO 10140-1:2016
#: Annex B, from memory), so :func:`default_mounting` gives them ``"sealed"``.
GLAZING_MATERIALS = frozenset({"glass", "pmma", "polycarbonate"})


def default_mounting(material: Material) -> str:
    """The mounting of a panel of ``material`` when none is given.

    ``"sealed"`` (the laboratory opening plus :data:`DEFAULT_SEAL`) for the glazing
    materials of :data:`GLAZING_MATERIALS`, ``"laboratory"`` for every other material:
    heavy or stiff panels (walls, floors, sheet metal) are built into the opening rigidly,
    and a seal under them would wrongly free their edges (on 150 mm concrete the seal's
    edge term changes the transmission loss by up to 3.5 dB, docs/theory/subsystems.md,
    section 11.1).

    Parameters
    ----------
    material : Material
        The panel's material (its ``name`` decides).

    Returns
    -------
    str
        ``"sealed"`` or ``"laboratory"``.
    """
    return "sealed" if material.name in GLAZING_MATERIALS else "laboratory"


@dataclass(frozen=True)
class PanelSpec:
    """One flat isotropic panel and the options of its table.

    Attributes
    ----------
    material : Material
        Panel material (density [kg/m^3], Young's modulus [Pa], Poisson's ratio,
        loss factor).
    thickness : float
        Thickness h [m].
    lx, ly : float
        Side lengths [m].
    loss_factor : float
        The material's internal loss factor [-], or with ``mounting="stated"`` the panel's
        total loss factor as mounted (a measured value), used as given.
    fluid : Fluid
        Fluid on the panel's faces (coincidence frequency, rooms of the two-room model).
    room_volumes : (float, float)
        Volumes of the source and receiving rooms of the two-room model [m^3].
    room_reverberation_time : float
        Reverberation time of both rooms [s].
    damping_layer : str or None
        Viscoelastic layer of the treatment library bonded to the panel.
    cover : (str, float) or None
        Constraining cover over the damping layer: material name and thickness [m].
    trim : str or None
        Trim layer or build-up of the treatment library on one face.
    mounting : {"laboratory", "sealed", "edges", "stated"} or None
        Losses at the edges added to ``loss_factor`` (:func:`installed_loss_factor`);
        None (the default) takes :func:`default_mounting` of the material: ``"sealed"``
        for glazing, ``"laboratory"`` otherwise.
    edge_absorption : float
        Bending-wave absorption coefficient of every edge for ``mounting="edges"`` [-].
    seal : EdgeSeal
        The edge seal of ``mounting="sealed"``.
    """

    material: Material
    thickness: float
    lx: float
    ly: float
    loss_factor: float
    fluid: Fluid
    room_volumes: tuple[float, float] = DEFAULT_ROOM_VOLUMES
    room_reverberation_time: float = DEFAULT_REVERBERATION_TIME
    damping_layer: str | None = None
    cover: tuple[str, float] | None = None
    trim: str | None = None
    mounting: str | None = None
    edge_absorption: float = 0.0
    seal: EdgeSeal = DEFAULT_SEAL

    def __post_init__(self) -> None:
        if self.mounting is None:
            object.__setattr__(self, "mounting", default_mounting(self.material))
        if self.mounting not in MOUNTINGS:
            msg = f"mounting must be one of {MOUNTINGS}, got {self.mounting!r}"
            raise ValueError(msg)
        if not 0.0 <= self.edge_absorption <= 1.0:
            msg = f"edge_absorption must lie in 0 .. 1, got {self.edge_absorption!r}"
            raise ValueError(msg)

    @property
    def area(self) -> float:
        """lx * ly [m^2]."""
        return self.lx * self.ly

    @property
    def mass_per_area(self) -> float:
        """rho h [kg/m^2]."""
        return self.material.density * self.thickness

    @property
    def bending_stiffness(self) -> float:
        """D [N m] (:func:`seatool.physics.plates.bending_stiffness`)."""
        m = self.material
        return float(plates.bending_stiffness(m.youngs_modulus, self.thickness, m.poisson_ratio))

    @property
    def critical_frequency(self) -> float:
        """Coincidence frequency in the fluid [Hz]."""
        return float(
            plates.critical_frequency(
                self.bending_stiffness, self.mass_per_area, self.fluid.sound_speed
            )
        )


def installed_loss_factor(spec: PanelSpec, f: npt.ArrayLike) -> Array:
    """The panel's loss factor as mounted, per frequency [-] (radiation not included).

    * ``"stated"``: ``spec.loss_factor`` as given (a measured total loss factor wins);
    * ``"laboratory"`` (default): the internal loss factor plus the losses into the
      heavy opening of a test laboratory,
      :func:`seatool.physics.installed_damping.laboratory_loss_factor`
      (EN ISO 12354-1:2017 Annex C);
    * ``"sealed"``: the laboratory value plus the edge term of the seal's bending-wave
      absorption on the whole perimeter (:func:`seal_edge_absorption`, diffuse average,
      in the edge term of EN ISO 12354-1:2017 Annex C);
    * ``"edges"``: the internal loss factor plus the absorption of ``edge_absorption`` on
      the whole perimeter,
      :func:`seatool.physics.installed_damping.edge_absorption_loss_factor`
      (EN ISO 12354-1:2017 Annex C, in situ).

    The radiation losses into the rooms are the radiation couplings of the two-room
    model, not part of this value.
    """
    f_a = np.asarray(f, dtype=np.float64)
    if spec.mounting == "stated":
        return np.full(f_a.shape, float(spec.loss_factor))
    if spec.mounting == "edges":
        return np.asarray(spec.loss_factor + _edge_term(spec, f_a, spec.edge_absorption))
    lab = installed_damping.laboratory_loss_factor(f_a, spec.mass_per_area, spec.loss_factor)
    if spec.mounting == "sealed":
        return np.asarray(lab + _edge_term(spec, f_a, seal_edge_absorption(spec, f_a)))
    return lab


def _edge_term(spec: PanelSpec, f: Array, alpha: npt.ArrayLike) -> Array:
    """The edge term of EN ISO 12354-1 Annex C with ``alpha`` on the whole perimeter."""
    return installed_damping.edge_absorption_loss_factor(
        f,
        spec.area,
        2.0 * (spec.lx + spec.ly) * np.asarray(alpha, dtype=np.float64),
        spec.critical_frequency,
        c0=spec.fluid.sound_speed,
    )


def seal_edge_absorption(spec: PanelSpec, f: npt.ArrayLike) -> Array:
    """Diffuse-field bending-wave absorption coefficient of the panel's edge seal [-].

    The seal's strips (:attr:`PanelSpec.seal`) as translational and rotational springs per
    unit length (:func:`seatool.physics.edge_mounting.seal_stiffness`, one strip on each
    face), the panel as a thin plate
    (:func:`seatool.physics.edge_mounting.elastic_edge_absorption_diffuse`).
    """
    seal = spec.seal
    return edge_mounting.seal_absorption_diffuse(
        f,
        spec.bending_stiffness,
        spec.mass_per_area,
        spec.material.poisson_ratio,
        seal.youngs_modulus,
        seal.loss_factor,
        seal.width,
        seal.thickness,
    )


def mounting_note(spec: PanelSpec, bands: BandAxis, table: pd.DataFrame) -> str | None:
    """:data:`MOUNTING_NOTE` where the default mounting leaves the coincidence dip to chance.

    With ``mounting="laboratory"``, the note is returned when in some band at or above the
    one holding the critical frequency the installed loss factor (column ``loss_factor``) is
    below the radiation loss factor of the panel's two faces,
    2 :func:`seatool.physics.coupling.clf_radiation` with the band's
    ``radiation_efficiency``. There the transmission loss at the dip goes as
    10 lg(eta + eta_rad) (docs/theory/subsystems.md, section 11), so losses of the mounting
    that are small against the laboratory opening's still move it by several dB: measured
    glazing needs 0.015 - 0.03 where the laboratory form gives under 0.001. ``None``
    otherwise (a stated or edge-absorption mounting, a heavy panel, or no band reaching
    the critical frequency).
    """
    if spec.mounting != "laboratory":
        return None
    f = bands.centre
    at_or_above = bands.upper > spec.critical_frequency
    if not np.any(at_or_above):
        return None
    eta_rad = 2.0 * coupling.clf_radiation(
        f,
        table["radiation_efficiency"].to_numpy(),
        spec.mass_per_area,
        rho0=spec.fluid.density,
        c0=spec.fluid.sound_speed,
    )
    below = table["loss_factor"].to_numpy() < eta_rad
    return MOUNTING_NOTE if bool(np.any(below & at_or_above)) else None


def basic_columns(spec: PanelSpec, bands: BandAxis) -> dict[str, Array]:
    """Coincidence frequency, modal density, modes in band, installed loss factor, modal
    overlap, bending wavelength; with ``mounting="sealed"`` also ``seal_absorption`` (the
    edge seal's diffuse bending-wave absorption coefficient, :func:`seal_edge_absorption`)."""
    f = bands.centre
    d, m = spec.bending_stiffness, spec.mass_per_area
    n = plates.plate_bending_modal_density(f, spec.area, d, m)
    k = plates.plate_bending_wavenumber(f, d, m)
    eta = installed_loss_factor(spec, f)
    out = {
        "critical_frequency_hz": np.full(f.shape, spec.critical_frequency),
        "modal_density_per_hz": n,
        "modes_in_band": pv.modes_in_band(n, bands.width),
        "loss_factor": eta,
    }
    if spec.mounting == "sealed":
        out["seal_absorption"] = seal_edge_absorption(spec, f)
    out["modal_overlap"] = pv.modal_overlap(f, n, eta)
    out["bending_wavelength_m"] = 2.0 * np.pi / k
    return out


def treatment_columns(spec: PanelSpec, bands: BandAxis) -> dict[str, Array]:
    """Treatment columns (none unless ``damping_layer`` or ``trim`` is given).

    The treatment is read by the model file's plate-treatment reader, so the panel table
    and a model file agree: ``composite_loss_factor`` and ``bonded_mass_kg_m2`` of a damping
    layer; ``trim_absorption`` (diffuse, rigid-backed), ``trim_insertion_loss_dB`` (field
    incidence) and ``trim_mass_kg_m2`` of a trim.
    """
    value: dict[str, Any] = {}
    if spec.damping_layer:
        value["damping_layer"] = spec.damping_layer
    if spec.trim:
        value["trim"] = spec.trim
        value["face"] = "treated side"
    if spec.cover is not None:
        value["cover"] = {"material": spec.cover[0], "thickness": spec.cover[1]}
    if not value:
        return {}
    m = spec.material
    plate = {
        "thickness": spec.thickness,
        "material": {
            "density": m.density,
            "youngs_modulus": m.youngs_modulus,
            "poisson_ratio": m.poisson_ratio,
            "loss_factor": m.loss_factor,
        },
        "mass_per_area": spec.mass_per_area,
        "fluid": {"density": spec.fluid.density, "sound_speed": spec.fluid.sound_speed},
    }
    rd = Reader(file="", base_dir=Path("."), bands=bands)
    got = read_plate_treatment(rd, value, "", plate)
    if rd.problems or got is None:
        raise InputError(
            [Problem("", p.path, p.message) for p in rd.problems]
            or [Problem("", "trim", "treatment could not be read")]
        )
    out: dict[str, Array] = {}
    if got.loss_factor is not None:
        out["composite_loss_factor"] = np.asarray(got.loss_factor)
        out["bonded_mass_kg_m2"] = np.full(len(bands), got.added_mass_per_area)
    if got.insertion_loss_db is not None:
        out["trim_absorption"] = lining_absorption(
            bands.centre, got.trim, rho0=spec.fluid.density, c0=spec.fluid.sound_speed
        )
        out["trim_insertion_loss_dB"] = np.asarray(got.insertion_loss_db)
        out["trim_mass_kg_m2"] = np.full(len(bands), got.trim_mass_per_area)
    return out


def two_room_model(spec: PanelSpec, bands: BandAxis) -> Model:
    """The room-panel-room :class:`seatool.model.Model` of the panel (read from data).

    The laboratory arrangement of ISO 10140-2 (two diffuse rooms, the panel between them)
    as an SEA model: a source room (``source_room``), the panel (``panel``, kind
    ``plate``) and a receiving room (``receiving_room``); ``radiation`` on both faces and
    the ``nonresonant`` path through the panel; 1 mW into the source room. Room damping
    from :attr:`PanelSpec.room_reverberation_time` through the model file's
    ``reverberation_time`` damping form (eta = 2.2/(f T), common practice); rooms are
    shoeboxes of side ratios 0.8 : 1 : 1.25 for the modal density's surface and edge
    terms; the panel keeps the loss factor of ``spec``.

    References
    ----------
    ISO 10140-2:2021, Acoustics - Laboratory measurement of sound insulation of building
    elements - Part 2: Measurement of airborne sound insulation.
    Crocker, M.J., Price, A.J. (1969). Sound transmission using statistical energy
    analysis. Journal of Sound and Vibration 9(3), 469-486 (the three-subsystem model;
    from memory).
    """
    rooms = {}
    for name, v in zip(("source_room", "receiving_room"), spec.room_volumes, strict=True):
        side = v ** (1.0 / 3.0)
        rooms[name] = {
            "kind": "cavity",
            "fluid": "panel_fluid",
            "dimensions": [side * r for r in _ROOM_RATIOS],
            "damping": {"reverberation_time": spec.room_reverberation_time},
        }
    mat = spec.material
    data = {
        "bands": {
            "spacing": bands.spacing,
            "lowest": float(bands.nominal[0]),
            "highest": float(bands.nominal[-1]),
        },
        "fluids": {
            "panel_fluid": {"density": spec.fluid.density, "sound_speed": spec.fluid.sound_speed}
        },
        "subsystems": {
            **rooms,
            "panel": {
                "kind": "plate",
                "material": {
                    "density": mat.density,
                    "youngs_modulus": mat.youngs_modulus,
                    "poisson_ratio": mat.poisson_ratio,
                },
                "thickness": spec.thickness,
                "lx": spec.lx,
                "ly": spec.ly,
                "fluid": "panel_fluid",
                "damping": {
                    "band_hz": [float(x) for x in bands.centre],
                    "values": [float(x) for x in installed_loss_factor(spec, bands.centre)],
                },
            },
        },
        "connections": {
            "panel_source": {"kind": "radiation", "between": ["panel", "source_room"]},
            "panel_receiving": {"kind": "radiation", "between": ["panel", "receiving_room"]},
            "mass_law": {
                "kind": "nonresonant",
                "between": ["source_room", "receiving_room"],
                "through": "panel",
            },
        },
        "excitations": {"source": {"subsystem": "source_room", "power": 1e-3}},
    }
    return build(data, file="<seatool panel two-room model>")


def room_transmission_loss(
    model: Model, energy: Array, source: str, receiver: str, area: float
) -> Array:
    """Transmission loss [dB] of a partition from the solved energies of two rooms.

    Parameters
    ----------
    model : Model
        A model holding the two rooms (cavities with ``volume``, ``sound_speed``).
    energy : ndarray (N, B)
        Solved band energies of every subsystem [J] (:attr:`seatool.solve.Solution.energy`).
    source, receiver : str
        Names of the source and receiving rooms.
    area : float
        Area S of the partition [m^2].

    Returns
    -------
    ndarray (B,)
        TL [dB] per band.

    Notes
    -----
    The laboratory definition of the sound reduction index from the level difference
    (ISO 10140-2:2021, clause 3):

    .. math:: TL = L_1 - L_2 + 10 \\lg(S / A_2)

    with the mean-square pressures <p^2> = rho c^2 E / V (the same rho c^2 in both rooms
    cancels) and the receiving room's equivalent absorption area
    ``A2 = 8 pi f eta_2 V_2 / c`` (Sabine's ``A = 24 ln(10) V / (c T)`` with the decay time
    ``T = 6 ln(10) / (pi f eta)`` of a loss factor eta; Vigran 2008, sec. 7).

    References
    ----------
    ISO 10140-2:2021 (see :func:`two_room_model`).
    Vigran, T.E. (2008). Building Acoustics. Taylor & Francis.
    """
    idx = model.index()
    s1, s2 = model.subsystem(source), model.subsystem(receiver)
    if s1.volume is None or s2.volume is None or s2.sound_speed is None:
        raise ValueError(f"{source!r} and {receiver!r} must be cavities with a volume")
    p1 = energy[idx[source]] / s1.volume
    p2 = energy[idx[receiver]] / s2.volume
    f = model.bands.centre
    a2 = damping.absorption_area_from_loss_factor(f, s2.volume, s2.damping, c0=s2.sound_speed)
    return np.asarray(db(p1 / p2) + db(area / a2), dtype=float)


def coupling_columns(spec: PanelSpec, bands: BandAxis) -> dict[str, Array]:
    """``radiation_efficiency`` (band-averaged, Leppington) and ``transmission_loss_sea_dB``."""
    sigma = radiation.radiation_efficiency_band(
        bands.centre,
        spec.lx,
        spec.ly,
        spec.critical_frequency,
        f_lower=bands.lower,
        f_upper=bands.upper,
        c0=spec.fluid.sound_speed,
    )
    model = two_room_model(spec, bands)
    tl = room_transmission_loss(
        model, solve(model).energy, "source_room", "receiving_room", spec.area
    )
    return {
        "radiation_efficiency": np.asarray(sigma, dtype=float),
        "transmission_loss_sea_dB": tl,
    }


def panel_table(spec: PanelSpec, bands: BandAxis) -> pd.DataFrame:
    """The panel table: ``band_hz`` (nominal), ``band_exact_hz`` and every column above.

    Columns in order: :func:`basic_columns`, :func:`treatment_columns`,
    :func:`coupling_columns`; one row per band.
    """
    cols: dict[str, Any] = {"band_hz": bands.nominal, "band_exact_hz": bands.centre}
    for part in (basic_columns, treatment_columns, coupling_columns):
        for key, val in part(spec, bands).items():
            cols[key] = np.asarray(val, dtype=float)
    return pd.DataFrame(cols)
