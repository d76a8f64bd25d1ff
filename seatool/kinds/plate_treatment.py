"""Plate treatments: the ``treatment`` key of a flat panel or shell.

``treatment = { damping_layer = LAYER, constrained = false, cover = { material, thickness },
trim = LAYERS, facing = "cavity name", description = "..." }`` gives a
:class:`PlateTreatment`: the bonded added mass, the composite loss factor of a free or
constrained damping layer (Oberst; Ross, Kerwin & Ungar) and the insertion loss of a trim
build-up (transfer-matrix method, field incidence). With ``facing`` the trim also lines the
cavity it faces: :mod:`seatool.kinds.facing` adds its absorption to that cavity (one
declaration with all its effects). ``face`` (the older key) gives the insertion loss only;
the cavity's absorption is then stated in its own ``surfaces`` list. Layers are read by
:mod:`seatool.kinds.layers`.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Model
from ..physics import bridges, damping_layers, tmm, tmm_transmission
from .layers import TrimLayer, buildup_text, quiet, read_layers, tmm_layers, validity_notes
from .params import Kind, Param
from .reader import DEFAULT_FLUID, Reader, join
from .validate import read_material

__all__ = ["TREATMENT", "PlateTreatment", "read_plate_treatment", "summary_lines"]

Array = npt.NDArray[np.float64]


def _type(value: Any) -> str:
    return type(value).__name__


def _keys_ok(
    rd: Reader,
    table: Mapping[str, Any],
    path: str,
    allowed: tuple[str, ...],
    required: tuple[str, ...] = (),
) -> bool:
    """:meth:`Reader.keys`, but False on unknown keys too (one line per problem)."""
    n = len(rd.problems)
    rd.keys(table, path, allowed, required)
    return len(rd.problems) == n


def _get(obj: Any, key: str) -> Any:
    """A value of a mapping or an attribute of a record (None if absent)."""
    if isinstance(obj, Mapping):
        return obj.get(key)
    return getattr(obj, key, None)


@dataclass(frozen=True)
class PlateTreatment:
    """A plate's treatment as read from the model file.

    Attributes
    ----------
    added_mass_per_area : float
        Mass per area bonded to the plate and moving with it [kg/m^2]: damping layer and
        constraining cover. Add it to the plate's ``mass_per_area``.
    loss_factor : ndarray or None
        Composite damping loss factor per band [-] of the plate with its damping layer
        (includes the base material's loss factor); None without a damping layer. It
        replaces the plate's damping unless the plate states ``damping`` itself.
    insertion_loss_db : ndarray or None
        Insertion loss per band [dB] of the trim on the face looking into cavity
        :attr:`face` (transfer-matrix method, field incidence); None without a trim.
    face : str or None
        Name of the cavity subsystem the trimmed face looks into.
    absorbs : bool
        True when declared with ``facing``: the trim also adds its absorption (panel area
        times its diffuse-field absorption coefficient) to the cavity :attr:`face`.
    description : str
        One line describing the treatment with its masses per area.
    bending_stiffness : ndarray or None
        Re D* of the damped plate per band [N m] (for information; None without a layer).
    damping_layer : str or None
        Name of the damping layer.
    constrained : bool
        True for a constrained layer (with a cover).
    damping_mass_per_area : float
        Mass per area of the damping layer alone [kg/m^2].
    cover_mass_per_area : float
        Mass per area of the constraining cover [kg/m^2].
    trim : tuple of TrimLayer
        Trim layers from the plate outwards.
    trim_mass_per_area : float
        Mass per area of the trim [kg/m^2]. Not in :attr:`added_mass_per_area`: a trim's
        mass acts through its insertion loss (already in the TMM), and a decoupled trim does
        not move with the plate above its mass-spring resonance.
    bare_mass_per_area : float
        Mass per area of the plate without treatment [kg/m^2].
    notes : tuple of str
        Validity notes (e.g. porous models outside their fitting range).
    """

    added_mass_per_area: float
    loss_factor: Array | None
    insertion_loss_db: Array | None
    face: str | None
    description: str
    bending_stiffness: Array | None = None
    damping_layer: str | None = None
    constrained: bool = False
    damping_mass_per_area: float = 0.0
    cover_mass_per_area: float = 0.0
    trim: tuple[TrimLayer, ...] = ()
    trim_mass_per_area: float = 0.0
    bare_mass_per_area: float = 0.0
    notes: tuple[str, ...] = field(default=())
    absorbs: bool = False

    @property
    def treated_mass_per_area(self) -> float:
        """Plate plus bonded layers [kg/m^2] (the plate's ``mass_per_area`` when treated)."""
        return self.bare_mass_per_area + self.added_mass_per_area

    def report(self, name: str) -> list[str]:
        """Lines for ``seatool check``: masses per area, loss factor and insertion loss."""
        out = [f"  {name}: {self.description}"]
        out.append(
            f"    mass per area: bare {self.bare_mass_per_area:.3g} + bonded "
            f"{self.added_mass_per_area:.3g} = {self.treated_mass_per_area:.3g} kg/m^2"
            + (
                f"; trim {self.trim_mass_per_area:.3g} kg/m^2 (in its insertion loss)"
                if self.trim
                else ""
            )
        )
        if self.loss_factor is not None:
            out.append(f"    composite loss factor {_rng(self.loss_factor)}")
        if self.insertion_loss_db is not None:
            out.append(
                f"    trim insertion loss {_rng(self.insertion_loss_db)} dB into {self.face!r}"
            )
        out.extend(f"    note: {n}" for n in self.notes)
        return out

    def provenance(self) -> dict[str, str]:
        """Provenance entries for the treated plate subsystem."""
        out = {"treatment": self.description}
        if self.loss_factor is not None:
            out["damping"] = (
                "constrained-layer composite loss factor (Ross, Kerwin & Ungar 1959)"
                if self.constrained
                else "free-layer composite loss factor (Oberst 1952; Ross, Kerwin & Ungar 1959)"
            )
        if self.insertion_loss_db is not None:
            out["trim_insertion_loss"] = (
                "transfer-matrix method, field incidence (Allard & Atalla 2009), in parallel "
                "with the structure-borne bridges of its fixings and edges (Sharp 1978)"
            )
        return out


def _rng(a: Array) -> str:
    lo, hi = float(np.min(a)), float(np.max(a))
    return f"{lo:.3g}" if math.isclose(lo, hi, rel_tol=1e-3) else f"{lo:.3g} .. {hi:.3g}"


def _material(rd: Reader, value: Any, path: str) -> Any:
    return read_material(rd, value, path)


def _prop(mat: Mapping[str, Any], key: str, default: float) -> float:
    """A material property, or ``default`` when it is missing or None."""
    v = _get(mat, key)
    return default if v is None else float(v)


def _homogeneous(plate: Mapping[str, Any]) -> tuple[float, Any] | None:
    h = plate.get("thickness")
    mat = plate.get("material")
    if h is None or mat is None:
        return None
    if any(_get(mat, k) is None for k in ("density", "youngs_modulus")):
        return None
    if np.ndim(h) != 0:
        return None
    return float(h), mat


def read_plate_treatment(
    rd: Reader, value: Any, path: str, plate: Mapping[str, Any]
) -> PlateTreatment | None:
    """Read a plate's ``treatment`` table.

    Parameters
    ----------
    rd : Reader
        Reader (its bands are used).
    value : Any
        The value of the ``treatment`` key::

            treatment = { damping_layer = LAYER, constrained = false,
                          cover = { material = "steel", thickness = 0.0005 },
                          trim = LAYERS, face = "cavity name", description = "..." }

        ``LAYER``: a viscoelastic library name or inline table; ``LAYERS``: see
        :func:`read_layers`.
    path : str
        Key path (``subsystems.NAME.treatment``).
    plate : mapping
        The plate's properties (DEVELOPERS.md keys: ``thickness``, ``material``,
        ``mass_per_area``, ...; optionally ``fluid`` with ``density`` and ``sound_speed``).

    Returns
    -------
    PlateTreatment or None
        None after reporting problems through ``rd.error``.
    """
    t = rd.table(value, path)
    if t is None or rd.bands is None:
        return None
    if not _keys_ok(rd, t, path, TREATMENT.allowed):
        return None
    if "damping_layer" not in t and "trim" not in t:
        rd.error(path, "give damping_layer, trim or both")
        return None
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=np.float64)
    fluid = plate.get("fluid")
    rho0 = float(_get(fluid, "density") or DEFAULT_FLUID["density"])
    c0 = float(_get(fluid, "sound_speed") or DEFAULT_FLUID["sound_speed"])
    m_bare = plate.get("mass_per_area")
    homog = _homogeneous(plate)
    ok = True
    parts: list[str] = []
    notes: list[str] = []

    constrained = t.get("constrained", "cover" in t)
    if not isinstance(constrained, bool):
        rd.error(join(path, "constrained"), f"must be true or false, got {_type(constrained)}")
        return None
    if "damping_layer" not in t:
        for k in ("constrained", "cover"):
            if k in t:
                rd.error(join(path, k), "only with a damping_layer")
                ok = False
    if constrained and "cover" not in t and "damping_layer" in t:
        rd.error(join(path, "cover"), "a constrained layer needs a cover = { material, thickness }")
        ok = False
    if not constrained and "cover" in t:
        rd.error(
            join(path, "constrained"),
            "a cover makes a constrained layer; remove constrained = false or the cover",
        )
        ok = False

    eta: Array | None = None
    stiff: Array | None = None
    layer_name: str | None = None
    m_layer = m_cover = 0.0
    base_extra: list[tmm.Layer] = []
    if "damping_layer" in t and ok:
        lp = join(path, "damping_layer")
        got = read_layers(
            rd, t["damping_layer"], lp, modulus_kind="shear" if constrained else "young"
        )
        if got is None:
            return None
        if len(got) != 1 or got[0].kind != "viscoelastic" or got[0].treatment is None:
            rd.error(
                lp,
                "must be one viscoelastic layer (e.g. 'damping_sheet_free', 'vem_core_constrained')",
            )
            return None
        layer = got[0]
        vt = layer.treatment
        assert vt is not None and vt.modulus is not None and vt.density is not None
        want = "shear" if constrained else "young"
        if vt.modulus.quantity != want:
            what = (
                "a constrained core needs a shear modulus table"
                if constrained
                else "a free layer needs a Young's modulus table (a constrained layer needs "
                "cover = { material, thickness })"
            )
            rd.error(lp, f"{layer.name!r} has a {vt.modulus.quantity} modulus table; {what}")
            return None
        if homog is None:
            rd.error(lp, "a damping layer needs a homogeneous plate (thickness and material)")
            return None
        h1, mat = homog
        e1, rho1 = float(_get(mat, "youngs_modulus")), float(_get(mat, "density"))
        nu1 = _prop(mat, "poisson_ratio", 0.3)
        eta1 = _prop(mat, "loss_factor", 0.0)
        nu2 = vt.poisson if vt.poisson is not None else 0.3
        layer_name = layer.name
        if constrained:
            cp = join(path, "cover")
            ct = rd.table(t["cover"], cp)
            if ct is None or not _keys_ok(
                rd, ct, cp, ("material", "thickness"), ("material", "thickness")
            ):
                return None
            cmat = _material(rd, ct["material"], join(cp, "material"))
            h3 = rd.number(ct["thickness"], join(cp, "thickness"), unit="m")
            if cmat is None or h3 is None:
                return None
            res = damping_layers.constrained_layer_damping(
                f, h1, e1, rho1, layer.thickness, vt.density, vt.modulus,
                h3, float(cmat.youngs_modulus), float(cmat.density),
                base_loss_factor=eta1, cover_loss_factor=_prop(cmat, "loss_factor", 0.0),
                base_poisson=nu1, cover_poisson=_prop(cmat, "poisson_ratio", 0.3),
            )  # fmt: skip
            m_cover = float(cmat.density) * h3
            parts.append(
                f"constrained layer {layer.name} {1000 * layer.thickness:.3g} mm under "
                f"{1000 * h3:.3g} mm cover ({vt.density * layer.thickness + m_cover:.3g} kg/m^2)"
            )
        else:
            res = damping_layers.free_layer_damping(
                f, h1, e1, rho1, layer.thickness, vt.density, vt.modulus,
                base_loss_factor=eta1, base_poisson=nu1, layer_poisson=nu2,
            )  # fmt: skip
            parts.append(
                f"free damping layer {layer.name} {1000 * layer.thickness:.3g} mm "
                f"({vt.density * layer.thickness:.3g} kg/m^2)"
            )
        m_layer = vt.density * layer.thickness
        eta, stiff = res.loss_factor, res.bending_stiffness
        base_extra = [tmm.LimpLayer(res.added_mass_per_area)]
        lo, hi = vt.modulus.frequency[0], vt.modulus.frequency[-1]
        if f[0] < lo / 1.12 or f[-1] > hi * 1.12:
            notes.append(
                f"{layer.name}: modulus table covers {lo:g} - {hi:g} Hz; held constant outside"
            )

    il: Array | None = None
    trim: tuple[TrimLayer, ...] = ()
    face: str | None = None
    absorbs = "facing" in t
    if "face" in t and absorbs:
        rd.error(
            join(path, "facing"),
            "give facing or face, not both (facing also adds the trim's absorption to the "
            "cavity; face gives its insertion loss only)",
        )
        return None
    fkey = "facing" if absorbs else "face"
    if "trim" in t:
        trim_layers = read_layers(rd, t["trim"], join(path, "trim"))
        if fkey not in t:
            rd.error(
                join(path, "face"),
                "missing: name the cavity subsystem the trim faces: facing = 'NAME' (its "
                "insertion loss and absorption), or face = 'NAME' (insertion loss only)",
            )
            ok = False
        else:
            face = rd.string(t[fkey], join(path, fkey))
            if face is not None and rd.declared and face not in rd.declared:
                face = rd.name_ref(face, join(path, fkey), list(rd.declared), "subsystem")
            ok = ok and face is not None
        if trim_layers is None or not ok:
            return None
        trim = tuple(trim_layers)
        if homog is not None:
            h1, mat = homog
            base: list[tmm.Layer] = [
                tmm.PlateLayer(
                    h1,
                    float(_get(mat, "youngs_modulus")),
                    float(_get(mat, "density")),
                    _prop(mat, "poisson_ratio", 0.3),
                    _prop(mat, "loss_factor", 0.01),
                ),
                *base_extra,
            ]
        elif m_bare is not None:
            base = [tmm.LimpLayer(float(m_bare))]
            notes.append(
                "trim insertion loss on a limp base of the plate's mass (no thickness/material)"
            )
        else:
            rd.error(join(path, "trim"), "the plate has no mass per area to put the trim on")
            return None
        res_il = quiet(tmm_transmission.insertion_loss, f, base, tmm_layers(trim), rho0=rho0, c0=c0)
        il = np.asarray(res_il.insertion_loss, dtype=np.float64)
        bridged = _bridges(rd, t, path, f, trim, plate, c0)
        if bridged is None:
            return None
        ratio, bridge_text = bridged
        il = bridges.bridged_insertion_loss(il, ratio)
        notes.extend(validity_notes(trim, f, rho0))
        if np.max(il) > IL_NOTE_DB:
            j = int(np.argmax(il))
            note = (
                f"trim insertion loss reaches {il[j]:.0f} dB at {f[j]:.0f} Hz, above the "
                f"about {IL_NOTE_DB:.0f} dB installed trims rarely exceed (leaks, fixings, "
                "edges): check the fixings and edges stated"
            )
            notes.append(note)
            rd.notes.append(f"{path}: {note}" if path else note)
        parts.append(
            f"trim {buildup_text(trim)} ({tmm.mass_per_area(tmm_layers(trim)):.3g} kg/m^2) "
            f"facing {face!r}" + (" (insertion loss and absorption)" if absorbs else "")
            + f", {bridge_text}"
        )
    elif fkey in t:
        rd.error(join(path, fkey), "only with a trim")
        return None
    else:
        for key in ("fixings_per_area", "fixing_stiffness", "edge_stiffness", "edge_width"):
            if key in t:
                rd.error(join(path, key), "only with a trim")
                ok = False
    if not ok:
        return None
    desc = t.get("description")
    if desc is not None and not isinstance(desc, str):
        rd.error(join(path, "description"), f"must be a string, got {_type(desc)}")
        return None
    text = "; ".join(parts) + (f" -- {desc}" if desc else "")
    return PlateTreatment(
        added_mass_per_area=m_layer + m_cover,
        loss_factor=_frozen(eta),
        insertion_loss_db=_frozen(il),
        face=face,
        description=text,
        bending_stiffness=_frozen(stiff),
        damping_layer=layer_name,
        constrained=constrained and layer_name is not None,
        damping_mass_per_area=m_layer,
        cover_mass_per_area=m_cover,
        trim=trim,
        trim_mass_per_area=tmm.mass_per_area(tmm_layers(trim)) if trim else 0.0,
        bare_mass_per_area=float(m_bare) if m_bare is not None else 0.0,
        notes=tuple(notes),
        absorbs=absorbs and face is not None,
    )


#: Fixings of a trim when the model does not state them: 4 per m^2 (0.5 m spacing), rigid,
#: each moving a 20 mm diameter footprint of the trim's cover (invented round numbers,
#: common practice for clipped or pinned trims; state the real ones).
DEFAULT_FIXINGS_PER_AREA = 4.0
FIXING_FOOTPRINT_AREA = math.pi * 0.01**2
#: Width of the cover strip an edge bridge moves [m] (invented; state the real one).
DEFAULT_EDGE_WIDTH = 0.02
#: Insertion loss [dB] above which a trim gets a note: installed trims rarely exceed about
#: 30-35 dB (common practice).
IL_NOTE_DB = 35.0


def _cover(trim: tuple[TrimLayer, ...]) -> tuple[float, float]:
    """(mass per area [kg/m^2], bending stiffness [N m]) of the trim's outermost solid layer.

    The outermost limp or elastic layer is the cover the bridges drive; without one (a
    porous layer alone) the whole trim's mass, limp.
    """
    for layer in reversed(tmm_layers(trim)):
        if isinstance(layer, tmm.LimpLayer):
            return float(layer.surface_mass), 0.0
        if isinstance(layer, tmm.PlateLayer):
            d = layer.young * layer.thickness**3 / (12.0 * (1.0 - layer.poisson**2))
            return float(layer.density * layer.thickness), float(d)
    return float(tmm.mass_per_area(tmm_layers(trim))), 0.0


def _bridges(
    rd: Reader,
    t: Mapping[str, Any],
    path: str,
    f: Array,
    trim: tuple[TrimLayer, ...],
    plate: Mapping[str, Any],
    c0: float,
) -> tuple[Array, str] | None:
    """Power ratio of the trim's fixings and edges to the bare base, and a description."""
    got: dict[str, float] = {}
    for key, default in (
        ("fixings_per_area", DEFAULT_FIXINGS_PER_AREA),
        ("fixing_stiffness", math.inf),
        ("edge_stiffness", 0.0),
        ("edge_width", DEFAULT_EDGE_WIDTH),
    ):
        if key not in t:
            got[key] = default
            continue
        v = t[key]
        if isinstance(v, bool) or not isinstance(v, (int, float)) or math.isnan(v) or v < 0:
            rd.error(join(path, key), f"must be a number >= 0, got {v!r}")
            return None
        got[key] = float(v)
    if got["fixing_stiffness"] == 0.0:
        rd.error(join(path, "fixing_stiffness"), "must be > 0 (leave it out for rigid fixings)")
        return None
    m2, d2 = _cover(trim)
    ratio = np.zeros_like(f)
    text = []
    if got["fixings_per_area"] > 0:
        ratio = ratio + bridges.point_bridge_power_ratio(
            f, got["fixings_per_area"], got["fixing_stiffness"], m2,
            cover_bending_stiffness=d2, footprint_area=FIXING_FOOTPRINT_AREA, c0=c0,
        )  # fmt: skip
        k = got["fixing_stiffness"]
        text.append(
            f"{got['fixings_per_area']:g} fixings/m^2 "
            + ("rigid" if math.isinf(k) else f"of {k:.3g} N/m")
        )
    lpa = plate.get("perimeter_per_area")
    if got["edge_stiffness"] > 0 and lpa:
        ratio = ratio + bridges.line_bridge_power_ratio(
            f, float(lpa), got["edge_stiffness"], m2,
            cover_bending_stiffness=d2, width=got["edge_width"], c0=c0,
        )  # fmt: skip
        text.append(f"edges of {got['edge_stiffness']:.3g} N/m^2")
    return ratio, ("bridged by " + " and ".join(text)) if text else "no bridges"


def _frozen(a: Array | None) -> Array | None:
    if a is None:
        return None
    out = np.array(a, dtype=np.float64)
    out.setflags(write=False)
    return out


def _no_derive(*args: Any) -> None:
    """Read by :func:`read_plate_treatment` (the declaration drives the key checks and docs)."""


#: The ``treatment`` table of a flat panel or shell.
TREATMENT = Kind(
    "treatment",
    "treatment",
    "Damping layer and/or trim on a plate or shell (``treatment = { ... }``).",
    (
        Param("damping_layer", "layers", doc="one viscoelastic layer bonded to the plate (free, or constrained under a cover)"),
        Param("constrained", "flag", doc="a constrained layer", default_doc="true if a cover is given"),
        Param("cover", "table", doc="{ material, thickness [m] }: the constraining layer"),
        Param("trim", "layers", doc="trim layer(s) or build-up on one face, from the plate outwards"),
        Param("facing", "subsystem", doc="the cavity the trimmed face looks into: the trim's insertion loss into it and its absorption (panel area x the trim's diffuse absorption coefficient) added to that cavity's damping"),
        Param("face", "subsystem", doc="older form of facing: the insertion loss only (the cavity's absorption stated in its own surfaces list)"),
        Param("fixings_per_area", unit="1/m^2", doc="fixings of the trim per area, each a structure-borne bridge to its cover (0: none)", strict=False, default=DEFAULT_FIXINGS_PER_AREA),
        Param("fixing_stiffness", unit="N/m", doc="stiffness of one fixing (loss factor 0.1)", default_doc="rigid"),
        Param("edge_stiffness", unit="N/m^2", doc="stiffness per length of the trim's edges on the panel's perimeter (loss factor 0.1)", default_doc="edges not bridged"),
        Param("edge_width", unit="m", doc="width of the cover strip an edge bridge moves", default=DEFAULT_EDGE_WIDTH),
    ),
    _no_derive,
    implicit=("description",),
)  # fmt: skip


def summary_lines(model: Model) -> list[str]:
    """Lines for ``seatool check``: treated plates and cavity linings with masses per area.

    Plate treatments come from ``props.treatment``; cavity linings from the
    reports the ``surfaces`` damping form left in :attr:`Model.reports`.
    """
    lines: list[str] = []
    for s in model.subsystems:
        t = getattr(s.props, "treatment", None)
        if isinstance(t, PlateTreatment):
            lines.extend(t.report(s.name))
    lines.extend(model.reports)
    return (["treatments:", *lines]) if lines else []
