"""Connection kinds whose coupling loss factors are derived from physics.

Importing this module registers these readers into
:data:`seatool.modelfile.CONNECTION_KINDS`:

``radiation``
    plate or shell (bending field) <-> cavity or the exterior sink, resonant radiation
    ``eta = rho c sigma / (omega m'')`` with the band-averaged radiation efficiency.
``nonresonant``
    cavity <-> cavity through a named panel, the forced-wave ("mass-law") path
    ``eta_12 = c S tau_NR / (4 omega V_1)``.
``line``
    line junction of two or more plates along a seam, rigid, wave model with bending
    and (when the plates carry them) in-plane wave fields,
    ``eta_ij = c_g,i L tau_ij / (pi omega S_i)``.
``point``
    rigid point connections between plates and beams from drive-point mobilities.
``mount``
    resilient mounts (massless springs with a loss factor) at points.
``leak``
    aperture between two cavities, ``eta = c S_a tau_a / (4 omega V)``.

Every reader states each coupling loss factor in one direction only; the solver derives
the other by reciprocity (``n_a eta_ab = n_b eta_ba``). The formulas live in
:mod:`seatool.physics` and are only called here; see ``docs/theory/coupling.md``
("How the model-file readers use the formulas") and ``docs/model-format.md``.

The readers rely on the ``Subsystem.properties`` contract of ``DEVELOPERS.md``; a
subsystem whose properties lack what a kind needs is reported on one line naming the
connection key and the missing property.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Connection, Subsystem
from ..modelfile import CONNECTION_KINDS, DEFAULT_FLUID, Reader
from ..physics import (
    coupling,
    elastic,
    junctions,
    mobility,
    plates,
    radiation,
    radiation_curved,
    transmission,
)

__all__ = [
    "RADIATION_EDGES",
    "RADIATION_METHODS",
    "TAU_FLOOR",
    "cavity_pair_clf",
    "default_angles",
    "fluid_of",
    "is_curved",
    "panel_critical_frequency",
    "radiation_clf",
    "nonresonant_clf",
    "treatment_factor",
]

Array = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

#: Radiation-efficiency formulas offered by ``method`` (see :mod:`seatool.physics.radiation`).
RADIATION_METHODS = ("leppington", "maidanik", "en12354")

#: Edge conditions offered by ``edges`` (see
#: :func:`seatool.physics.radiation.radiation_efficiency_leppington`).
RADIATION_EDGES = ("simply_supported", "clamped")

#: Default junction angles [deg] by number of plates: L, T (the second plate is the stem), X.
_DEFAULT_ANGLES = {2: (0.0, 90.0), 3: (0.0, 90.0, 180.0), 4: (0.0, 90.0, 180.0, 270.0)}

#: Floor of a transmission coefficient that the physics gives as exactly zero (the
#: non-resonant path at and above coincidence): 300 dB, negligible, keeps eta > 0.
TAU_FLOOR = 1e-30

#: Relative tolerance for "bending stiffness of a homogeneous plate" (line junctions).
_HOMOGENEOUS = 1e-6

#: Relative tolerance within which two fluids count as the same.
_SAME_FLUID = 1e-6

_COMMON = ("kind", "description", "between")


# ----------------------------------------------------------------------------------------
# Small helpers


def _join(path: str, key: str) -> str:
    return f"{path}.{key}"


def _per_band(value: Any, nb: int) -> Array:
    arr = np.asarray(value, dtype=float)
    return np.array(np.broadcast_to(arr, (nb,)), dtype=float)


def _get(obj: Any, *names: str) -> Any:
    """First of ``names`` found in a mapping or as an attribute, else None."""
    for n in names:
        if isinstance(obj, Mapping):
            if n in obj:
                return obj[n]
        elif hasattr(obj, n):
            return getattr(obj, n)
    return None


def fluid_of(sub: Subsystem) -> tuple[float, float] | None:
    """``(density, sound_speed)`` of a cavity (properties first, then attributes)."""
    p = sub.properties
    rho = p.get("density", sub.density)
    c = p.get("sound_speed", sub.sound_speed)
    if rho is None or c is None:
        return None
    return float(rho), float(c)


def _is_cavity(sub: Subsystem) -> bool:
    return (
        not sub.sink
        and sub.quantity == "sound_pressure"
        and _volume(sub) is not None
        and fluid_of(sub) is not None
    )


def _volume(sub: Subsystem) -> float | None:
    v = sub.properties.get("volume", sub.volume)
    return None if v is None else float(v)


def _describe(sub: Subsystem) -> str:
    wt = sub.properties.get("wave_type")
    return f"{sub.name!r} ({sub.kind}" + (f", {wt} field)" if wt else ")")


def _same_fluid(a: tuple[float, float], b: tuple[float, float]) -> bool:
    return all(math.isclose(x, y, rel_tol=_SAME_FLUID) for x, y in zip(a, b, strict=True))


def _shared_fluid(
    rd: Reader, path: str, ends: list[Subsystem], what: str
) -> tuple[tuple[float, float], tuple[float, float]] | None:
    """The (density, sound speed) of two cavities, or None after one error if they differ."""
    f1, f2 = fluid_of(ends[0]), fluid_of(ends[1])
    assert f1 is not None and f2 is not None
    if not _same_fluid(f1, f2):
        rd.error(
            _join(path, "between"),
            f"cavities {ends[0].name!r} and {ends[1].name!r} hold different fluids; the "
            f"{what} assumes the same fluid on both sides",
        )
        return None
    return f1, f2


def _choice(rd: Reader, value: Any, path: str, choices: Sequence[str]) -> str | None:
    from ..errors import closest

    if not isinstance(value, str) or value not in choices:
        hint = closest(value, choices) if isinstance(value, str) else ""
        rd.error(path, f"must be one of {', '.join(map(repr, choices))}, got {value!r}" + hint)
        return None
    return value


def _count(rd: Reader, table: Mapping[str, Any], key: str, path: str) -> int | None:
    """A positive integer option (default 1)."""
    if key not in table:
        return 1
    v = table[key]
    if isinstance(v, bool) or not isinstance(v, int) or v < 1:
        rd.error(_join(path, key), f"must be a whole number >= 1, got {v!r}")
        return None
    return int(v)


def _flag(rd: Reader, table: Mapping[str, Any], key: str, path: str) -> bool | None:
    if key not in table:
        return False
    v = table[key]
    if not isinstance(v, bool):
        rd.error(_join(path, key), f"must be true or false, got {v!r}")
        return None
    return v


def cavity_pair_clf(eta_12: Array, eta_21: Array, n_1: Array, n_2: Array) -> Array:
    """The CLF 1 -> 2 of a cavity-to-cavity path, independent of the stated direction.

    The diffuse-field relations (intensity ``c E/(4 V)`` on a wall) give ``eta_12`` from
    ``V_1`` and ``eta_21`` from ``V_2``; they obey ``n_1 eta_12 = n_2 eta_21`` exactly only
    with the volume term of the cavity modal density. With the surface and edge terms of
    the cavities' own ``n`` (which the solver uses for reciprocity) the two differ slightly,
    so the connection states the geometric mean ``sqrt(eta_12 eta_21 n_2 / n_1)``: the same
    model results whichever cavity is named first, and each physical value is recovered
    when the cavities' ``n/V`` are equal.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann (consistency relation n_1 eta_12 = n_2 eta_21;
       room-to-room coupling through a wall; from memory). The geometric mean is this
       project's choice to make the stated direction irrelevant.
    """
    return np.asarray(np.sqrt(eta_12 * eta_21 * n_2 / n_1), dtype=float)


def _need_two(rd: Reader, path: str, ends: list[Subsystem], what: str) -> bool:
    if len(ends) != 2:
        rd.error(_join(path, "between"), f"a {what} joins two subsystems, got {len(ends)}")
        return False
    return True


# ----------------------------------------------------------------------------------------
# Panels


def _panel(rd: Reader, path: str, sub: Subsystem) -> dict[str, Any] | None:
    """The bending-field properties a panel coupling needs, or None after one error."""
    p = sub.properties
    if p.get("wave_type") != "bending" or "area" not in p:
        rd.error(
            path,
            f"{_describe(sub)} is not the bending field of a plate or shell "
            "(needs properties wave_type = 'bending' and area)",
        )
        return None
    missing = [k for k in ("lx", "ly", "mass_per_area", "bending_stiffness") if k not in p]
    if missing:
        rd.error(
            path,
            f"plate {sub.name!r} lacks the properties {', '.join(missing)} "
            "(use a plate or shell subsystem kind derived from dimensions)",
        )
        return None
    return dict(p)


def panel_critical_frequency(props: Mapping[str, Any], sound_speed: float, nb: int) -> Array:
    """Critical frequency of a panel in a fluid of the given sound speed, per band [Hz].

    Recomputed from the properties' ``bending_stiffness`` and ``mass_per_area`` with
    :func:`seatool.physics.plates.critical_frequency`, so it holds for the fluid on
    the radiating side even when that is not the model's air (for which the properties'
    ``critical_frequency`` was computed). A per-band (sandwich, effective) bending
    stiffness gives a per-band value: the coincidence ratio k_B/k_0 of that band.
    """
    d = _per_band(props["bending_stiffness"], nb)
    m = float(props["mass_per_area"])
    return _per_band(plates.critical_frequency(d, m, sound_speed), nb)


def treatment_factor(props: Mapping[str, Any], face: str | None, nb: int) -> Array:
    """Power factor ``10^(-IL/10)`` of a panel's treatment, per band (1 where none).

    ``props["treatment"]`` (if any) has ``insertion_loss_db`` (per band or None) and
    ``face`` (the name of the subsystem its treated face looks into). With
    ``face=None`` the factor applies whatever face is treated (the non-resonant path
    crosses the whole build-up). Reducing a coupling loss factor by the trim's
    insertion loss is common practice in SEA trim modelling (the insertion loss is by
    definition the reduction of transmitted power caused by the layer); it assumes the
    trim changes the transmitted power but not the panel's modal energy.
    """
    t = props.get("treatment")
    if t is None:
        return np.ones(nb)
    il = _get(t, "insertion_loss_db")
    tface = _get(t, "face")
    if il is None or (face is not None and tface != face):
        return np.ones(nb)
    return np.asarray(10.0 ** (-_per_band(il, nb) / 10.0), dtype=float)


def radiation_clf(
    rd: Reader,
    props: Mapping[str, Any],
    fluid: tuple[float, float],
    *,
    method: str = "leppington",
    corner_factor: float = 1.0,
    edges: str = "simply_supported",
) -> tuple[Array, Array]:
    """Radiation CLF panel -> fluid per band and the band-averaged sigma used.

    ``sigma`` from :func:`seatool.physics.radiation.radiation_efficiency_band` over the
    model's band edges, with the critical frequency in that fluid; for a shell or curved
    panel (properties ``radius`` and ``ring_frequency``, :func:`is_curved`) with the default
    method, from :func:`seatool.physics.radiation_curved.radiation_efficiency_curved_panel`
    (Szechenyi 1971). ``eta`` from :func:`seatool.physics.coupling.clf_radiation`. No
    treatment factor applied here. ``edges`` is passed to the flat-panel formula (the reader
    refuses ``"clamped"`` where the curved-panel formula is used).
    """
    assert rd.bands is not None
    bands = rd.bands
    nb = len(bands)
    rho, c = fluid
    f_c = panel_critical_frequency(props, c, nb)
    if is_curved(props) and method == "leppington":
        sigma = _curved_sigma(props, bands, f_c, c)
        eta = coupling.clf_radiation(
            bands.centre, sigma, float(props["mass_per_area"]), rho0=rho, c0=c
        )
        return _per_band(eta, nb), _per_band(sigma, nb)
    sigma = radiation.radiation_efficiency_band(
        bands.centre,
        float(props["lx"]),
        float(props["ly"]),
        f_c,
        method=method,  # type: ignore[arg-type]
        f_lower=bands.lower,
        f_upper=bands.upper,
        c0=c,
        corner_factor=corner_factor,
        edges=edges,  # type: ignore[arg-type]
    )
    eta = coupling.clf_radiation(bands.centre, sigma, float(props["mass_per_area"]), rho0=rho, c0=c)
    return _per_band(eta, nb), _per_band(sigma, nb)


def is_curved(props: Mapping[str, Any]) -> bool:
    """True for the bending field of a shell or curved panel (``radius`` and ``ring_frequency``)."""
    return props.get("wave_type") == "bending" and "radius" in props and "ring_frequency" in props


def _curved_sigma(props: Mapping[str, Any], bands: Any, f_c: Array, c: float) -> Array:
    """Band sigma of a curved panel or closed cylinder (lx axial, ly developed arc).

    c_L' = 2 pi a f_r (the definition of the ring frequency) is divided by
    sqrt(m'' / (rho h)) so that the membrane stiffness sees the same mass per area (with an
    added treatment mass) as the critical frequency; without the material, nu = 0.3 and no
    added-mass correction.
    """
    mat = props.get("material")
    nu = _get(mat, "poisson_ratio")
    rho_w = _get(mat, "density")
    m = float(props["mass_per_area"])
    c_l = 2.0 * math.pi * float(props["radius"]) * float(props["ring_frequency"])
    if rho_w is not None and "thickness" in props:
        c_l *= math.sqrt(float(rho_w) * float(props["thickness"]) / m)
    return radiation_curved.radiation_efficiency_curved_panel(
        bands.centre,
        float(props["lx"]),
        float(props["ly"]),
        f_c,
        float(props["radius"]),
        longitudinal_speed=c_l,
        poisson_ratio=float(nu) if nu is not None else 0.3,
        closed=bool(props.get("closed", False)),
        f_lower=bands.lower,
        f_upper=bands.upper,
        c0=c,
    )


def nonresonant_clf(
    rd: Reader,
    props: Mapping[str, Any],
    fluid: tuple[float, float],
    volume: float,
    *,
    stiffness_factor: bool = False,
) -> Array:
    """Non-resonant CLF cavity (``volume``) -> cavity through the panel, per band.

    ``tau_NR`` from :func:`seatool.physics.transmission.transmission_nonresonant` (zero
    at and above the critical frequency in that fluid), ``eta`` from
    :func:`seatool.physics.coupling.clf_nonresonant` with the panel area. No treatment
    factor applied here.
    """
    assert rd.bands is not None
    bands = rd.bands
    nb = len(bands)
    rho, c = fluid
    f_c = panel_critical_frequency(props, c, nb)
    tau = transmission.transmission_nonresonant(
        bands.centre,
        float(props["mass_per_area"]),
        float(props["lx"]),
        float(props["ly"]),
        f_c,
        stiffness_factor=stiffness_factor,
        rho0=rho,
        c0=c,
    )
    # tau_NR = 0 at and above coincidence; a model connection needs eta > 0, so the
    # transmission coefficient is floored at TAU_FLOOR (300 dB), which keeps reciprocity.
    tau = np.maximum(tau, TAU_FLOOR)
    eta = coupling.clf_nonresonant(bands.centre, float(props["area"]), tau, volume, c0=c)
    return _per_band(eta, nb)


# ----------------------------------------------------------------------------------------
# kind = "radiation"


def _read_radiation(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
) -> Connection | None:
    path = f"connections.{name}"
    if not rd.keys(s, path, (*_COMMON, "method", "corner_factor", "edges", "fluid")):
        return None
    if not _need_two(rd, path, ends, "radiation connection"):
        return None
    # The panel is whichever end is not a cavity or the exterior.
    k_air = [i for i, e in enumerate(ends) if e.sink or _is_cavity(e)]
    if len(k_air) != 1:
        what = "two cavities" if len(k_air) == 2 else "no cavity or exterior"
        rd.error(
            _join(path, "between"),
            f"radiation joins a plate or shell and a cavity or the exterior, got {what}",
        )
        return None
    air = ends[k_air[0]]
    panel = ends[1 - k_air[0]]
    props = _panel(rd, f"{path}.between[{1 - k_air[0]}]", panel)
    if props is None:
        return None
    ok = True
    method = "leppington"
    if "method" in s:
        got = _choice(rd, s["method"], _join(path, "method"), RADIATION_METHODS)
        ok = ok and got is not None
        method = got or method
    corner = 1.0
    if "corner_factor" in s:
        if method != "maidanik":
            rd.error(_join(path, "corner_factor"), "is used by method = 'maidanik' only; remove it")
            ok = False
        else:
            cf = rd.number(
                s["corner_factor"], _join(path, "corner_factor"), minimum=0.0, strict=False
            )
            ok = ok and cf is not None
            corner = cf if cf is not None else corner
    edges = "simply_supported"
    if "edges" in s:
        got = _choice(rd, s["edges"], _join(path, "edges"), RADIATION_EDGES)
        if got == "clamped" and method == "en12354":
            rd.error(_join(path, "edges"), "'clamped' is not available with method = 'en12354'")
            got = None
        elif got == "clamped" and is_curved(props) and method == "leppington":
            rd.error(
                _join(path, "edges"),
                "'clamped' is not available for a shell or curved panel "
                "(the curved-panel radiation efficiency has no edge option)",
            )
            got = None
        ok = ok and got is not None
        edges = got or edges
    if air.sink:
        fname = "air"
        if "fluid" in s:
            got = rd.name_ref(s["fluid"], _join(path, "fluid"), rd.fluids, "fluid")
            ok = ok and got is not None
            fname = got or fname
        fl = rd.fluids.get(fname, DEFAULT_FLUID)
        fluid = (float(fl["density"]), float(fl["sound_speed"]))
    else:
        if "fluid" in s:
            rd.error(
                _join(path, "fluid"),
                f"the fluid of cavity {air.name!r} is used; 'fluid' is for the exterior only",
            )
            ok = False
        got_fluid = fluid_of(air)
        assert got_fluid is not None
        fluid = got_fluid
    if not ok:
        return None
    assert rd.bands is not None
    eta, sigma = radiation_clf(rd, props, fluid, method=method, corner_factor=corner, edges=edges)
    eta = eta * treatment_factor(props, air.name, len(rd.bands))
    where = "the exterior" if air.sink else f"cavity {air.name!r}"
    return Connection(
        name,
        panel.name,
        air.name,
        eta,
        kind="radiation",
        provenance={
            "coupling_loss_factor": (
                f"resonant radiation into {where}: rho c sigma/(omega m''), sigma "
                + (
                    "band-averaged for the curved panel (Szechenyi 1971 statistical mode "
                    "count, Heckl shell dispersion, Leppington edge modes)"
                    if is_curved(props) and method == "leppington"
                    else f"band-averaged ({method}, {edges.replace('_', ' ')} edges"
                    + (", flat-panel formula: curvature not included)" if is_curved(props) else ")")
                )
                + (", reduced by the treatment insertion loss" if _treated(props, air) else "")
            )
        },
    )


def _treated(props: Mapping[str, Any], face: Subsystem | None) -> bool:
    t = props.get("treatment")
    if t is None or _get(t, "insertion_loss_db") is None:
        return False
    return face is None or _get(t, "face") == face.name


# ----------------------------------------------------------------------------------------
# kind = "nonresonant"


def _read_nonresonant(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
) -> Connection | None:
    path = f"connections.{name}"
    if not rd.keys(s, path, (*_COMMON, "through", "stiffness_factor"), ("through",)):
        return None
    if not _need_two(rd, path, ends, "non-resonant path"):
        return None
    ok = True
    for k, e in enumerate(ends):
        if not (_is_cavity(e) or e.sink):
            rd.error(
                f"{path}.between[{k}]",
                f"{_describe(e)} is not a cavity; the non-resonant path joins two cavities "
                "(or a cavity and the exterior)",
            )
            ok = False
    pname = rd.name_ref(s["through"], _join(path, "through"), subs, "subsystem")
    sf = _flag(rd, s, "stiffness_factor", path)
    if not ok or pname is None or sf is None:
        return None
    props = _panel(rd, _join(path, "through"), subs[pname])
    if props is None:
        return None
    sinks = [e for e in ends if e.sink]
    if sinks:
        # Cavity -> free field: eta = c S tau_NR / (4 omega V) from the cavity, no return.
        room = ends[0] if sinks[0] is ends[1] else ends[1]
        f_room, v_room = fluid_of(room), _volume(room)
        assert f_room is not None and v_room is not None and rd.bands is not None
        eta_out = nonresonant_clf(rd, props, f_room, v_room, stiffness_factor=sf)
        eta_out = eta_out * treatment_factor(props, None, len(rd.bands))
        return Connection(
            name,
            room.name,
            sinks[0].name,
            eta_out,
            kind="nonresonant",
            provenance={
                "coupling_loss_factor": (
                    f"non-resonant (forced-wave) transmission through {pname!r} into the "
                    "exterior: c S tau_NR/(4 omega V), tau_NR = 0 above coincidence"
                    + (", reduced by the treatment insertion loss" if _treated(props, None) else "")
                )
            },
        )
    fluids = _shared_fluid(rd, path, ends, "non-resonant path model")
    if fluids is None:
        return None
    f1, f2 = fluids
    v1, v2 = _volume(ends[0]), _volume(ends[1])
    assert v1 is not None and v2 is not None and rd.bands is not None
    eta = cavity_pair_clf(
        nonresonant_clf(rd, props, f1, v1, stiffness_factor=sf),
        nonresonant_clf(rd, props, f1, v2, stiffness_factor=sf),
        ends[0].modal_density,
        ends[1].modal_density,
    )
    eta = eta * treatment_factor(props, None, len(rd.bands))
    return Connection(
        name,
        ends[0].name,
        ends[1].name,
        eta,
        kind="nonresonant",
        provenance={
            "coupling_loss_factor": (
                f"non-resonant (forced-wave) transmission through {pname!r}: "
                "c S tau_NR/(4 omega V_1), tau_NR = 0 above coincidence"
                + (", reduced by the treatment insertion loss" if _treated(props, None) else "")
            )
        },
    )


# ----------------------------------------------------------------------------------------
# kind = "line"


def default_angles(n: int) -> tuple[float, ...] | None:
    """Default junction angles [deg]: L for 2 plates, T for 3, X for 4 (else None)."""
    return _DEFAULT_ANGLES.get(n)


def _junction_plate(
    rd: Reader, path: str, sub: Subsystem, angle_deg: float, nb: int
) -> tuple[list[junctions.JunctionPlate], bool] | None:
    """Per-band plates of the wave model for one subsystem, and whether it is equivalent.

    A homogeneous isotropic plate is used as it is (density from the mass per area, so an
    added treatment mass is included). Any other flat panel (orthotropic, ribbed,
    sandwich: ``bending_stiffness`` differs from ``E h^3/(12(1 - nu^2))``) is replaced by
    the equivalent isotropic plate with the subsystem's own bending stiffness and mass
    per area (thickness ``h_eq = (12 (1 - nu^2) D / E)^(1/3)``), so that the bending
    wavenumber, which dominates the junction, is the subsystem's; its in-plane stiffness is
    then that of ``h_eq`` (an approximation, stated in the provenance).
    """
    p = sub.properties
    mat = p.get("material")
    vals = {k: _get(mat, k) for k in ("density", "youngs_modulus", "poisson_ratio")}
    if mat is None or any(v is None for v in vals.values()) or "mass_per_area" not in p:
        rd.error(
            path,
            f"plate {sub.name!r} has no material (properties 'material' with density, "
            "youngs_modulus, poisson_ratio, and 'mass_per_area'); the line junction wave "
            "model needs them",
        )
        return None
    e, nu = float(vals["youngs_modulus"]), float(vals["poisson_ratio"])
    m = float(p["mass_per_area"])
    d = _per_band(p.get("bending_stiffness", np.nan), nb)
    h = p.get("thickness")
    if h is not None and np.ndim(h) == 0:
        d_iso = float(plates.bending_stiffness(e, float(h), nu))
        homogeneous = bool(np.allclose(d, d_iso, rtol=_HOMOGENEOUS, atol=0.0))
    else:
        homogeneous = False
    if not np.all(np.isfinite(d) & (d > 0)):
        rd.error(path, f"plate {sub.name!r} has no valid bending_stiffness property")
        return None
    if homogeneous:
        assert h is not None
        h_eq = np.full(nb, float(h))
    else:
        h_eq = (12.0 * (1.0 - nu**2) * d / e) ** (1 / 3)
    cache: dict[float, junctions.JunctionPlate] = {}
    out = []
    try:
        for hb in h_eq:
            key = float(hb)
            if key not in cache:
                cache[key] = junctions.JunctionPlate(
                    thickness=key,
                    youngs_modulus=e,
                    density=m / key,
                    poisson=nu,
                    angle=math.radians(angle_deg),
                )
            out.append(cache[key])
    except ValueError as exc:
        rd.error(path, f"plate {sub.name!r}: {exc}")
        return None
    return out, not homogeneous


def _group_speed(sub: Subsystem, plate: junctions.JunctionPlate, wave: str, f: Array) -> Array:
    """Group speed of a plate wave field: the subsystem's own, else from its material."""
    nb = f.size
    if "group_speed" in sub.properties:
        return _per_band(sub.properties["group_speed"], nb)
    e, rho, nu, h = plate.youngs_modulus, plate.density, plate.poisson, plate.thickness
    if wave == "bending":
        d = plates.bending_stiffness(e, h, nu)
        return _per_band(plates.plate_bending_group_speed(f, d, rho * h), nb)
    if wave == "longitudinal":
        return _per_band(elastic.plate_longitudinal_speed(e, rho, nu), nb)
    return _per_band(elastic.shear_speed(e, rho, nu), nb)


def _angles(rd: Reader, s: Mapping[str, Any], path: str, n: int) -> list[float] | None:
    if "angles" not in s:
        dflt = default_angles(n)
        if dflt is None:
            rd.error(
                _join(path, "angles"),
                f"missing: {n} plates need their angles in degrees (defaults exist for 2, 3, 4)",
            )
            return None
        return list(dflt)
    a = s["angles"]
    p = _join(path, "angles")
    if not isinstance(a, list) or any(
        isinstance(x, bool) or not isinstance(x, int | float) for x in a
    ):
        rd.error(p, "must be an array of numbers (degrees), one per plate in 'between'")
        return None
    if len(a) != n:
        rd.error(p, f"has {len(a)} angles but 'between' names {n} plates")
        return None
    vals = [float(x) for x in a]
    if not all(math.isfinite(x) for x in vals):
        rd.error(p, "angles must be finite")
        return None
    norm = [x % 360.0 for x in vals]
    for i in range(n):
        for j in range(i):
            d = abs(norm[i] - norm[j])
            if min(d, 360.0 - d) < 1.0:
                rd.error(
                    p,
                    f"plates {j} and {i} point in the same direction ({vals[j]:g} and "
                    f"{vals[i]:g} deg); give distinct angles",
                )
                return None
    return vals


_WAVES = junctions.WAVE_TYPES


def _read_line(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
) -> list[Connection] | None:
    path = f"connections.{name}"
    if not rd.keys(s, path, (*_COMMON, "length", "angles"), ("length",)):
        return None
    length = rd.number(s["length"], _join(path, "length"), unit="m")
    angles = _angles(rd, s, path, len(ends))
    per_plate: list[list[junctions.JunctionPlate]] = []
    equivalent: list[str] = []
    ok = length is not None and angles is not None
    assert rd.bands is not None
    nb = len(rd.bands)
    for k, e in enumerate(ends):
        bp = f"{path}.between[{k}]"
        if e.properties.get("wave_type") != "bending" or "area" not in e.properties:
            rd.error(
                bp,
                f"{_describe(e)} is not the bending field of a plate (a line junction joins "
                "plates; name their bending fields, the in-plane fields are found by name)",
            )
            ok = False
            continue
        if angles is not None:
            got = _junction_plate(rd, bp, e, angles[k], nb)
            if got is None:
                ok = False
            else:
                per_plate.append(got[0])
                if got[1]:
                    equivalent.append(e.name)
    if not ok:
        return None
    assert length is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    # Bands that share the same set of plates are solved together (one group unless a
    # plate has a per-band bending stiffness).
    groups: dict[tuple[int, ...], list[int]] = {}
    for j in range(nb):
        groups.setdefault(tuple(id(pp[j]) for pp in per_plate), []).append(j)
    note = (
        f"; equivalent isotropic plate (same D and m'') for {', '.join(map(repr, equivalent))}"
        if equivalent
        else ""
    )
    # Wave fields present in the model, per plate: bending always, in-plane if declared.
    fields: list[dict[str, Subsystem]] = []
    for e in ends:
        fd: dict[str, Subsystem] = {"bending": e}
        for w in ("longitudinal", "shear"):
            other = subs.get(f"{e.component}.{w}")
            if (
                other is not None
                and other.component == e.component
                and other.properties.get("wave_type") == w
            ):
                fd[w] = other
        fields.append(fd)
    out: list[Connection] = []
    for i, fi in enumerate(fields):
        area_i = float(ends[i].properties["area"])
        for a, src in fi.items():
            ia = _WAVES.index(a)
            tau = np.empty((nb, len(ends), 3))
            for idx in groups.values():
                plates = [pp[idx[0]] for pp in per_plate]
                tau[idx] = junctions.line_junction_transmission_diffuse(
                    f[idx],
                    plates,
                    source=i,
                    incident=a,  # type: ignore[arg-type]
                )
            cg = _group_speed(src, per_plate[i][0], a, f)
            for j, fj in enumerate(fields):
                for b, dst in fj.items():
                    jb = _WAVES.index(b)
                    if (j, jb) <= (i, ia):
                        continue  # each unordered pair once; reciprocity gives the other
                    eta = _per_band(
                        coupling.clf_line_junction(f, cg, length, tau[:, j, jb], area_i), f.size
                    )
                    eta = np.maximum(eta, np.finfo(float).tiny)
                    out.append(
                        Connection(
                            f"{name}[{src.name}->{dst.name}]",
                            src.name,
                            dst.name,
                            eta,
                            kind="line",
                            provenance={
                                "coupling_loss_factor": (
                                    f"rigid line junction, wave model ({a} -> {b}): "
                                    "c_g L tau_bar/(pi omega S)" + note
                                )
                            },
                        )
                    )
    return out


# ----------------------------------------------------------------------------------------
# kind = "point" and kind = "mount"


def _point_mobility(
    rd: Reader, path: str, sub: Subsystem, f: Array
) -> tuple[ComplexArray, float] | None:
    """Drive-point force mobility (infinite-system value) and mass of a structure."""
    p = sub.properties
    wt = p.get("wave_type")
    nb = f.size
    mass = sub.mass
    y: Any = None
    if wt == "bending" and "bending_stiffness" in p and "mass_per_area" in p:
        y = mobility.plate_point_mobility(p["bending_stiffness"], p["mass_per_area"])
        if mass is None and "area" in p:
            mass = float(p["area"]) * float(p["mass_per_area"])
    elif (
        "section" in p
        and "mass_per_length" in p
        and wt
        in (
            "bending",
            "bending_y",
            "bending_z",
            "longitudinal",
        )
    ):
        sec = p["section"]
        e = _get(p.get("material"), "youngs_modulus")
        rho = _get(p.get("material"), "density")
        if wt == "longitudinal":
            area = _get(sec, "area")
            if e is not None and rho is not None and area is not None:
                y = mobility.rod_point_mobility(e, rho, area)
        else:
            i_b = (
                _get(sec, "I_z", "second_moment_z")
                if wt == "bending_z"
                else _get(sec, "I_y", "second_moment_y")
            )
            if e is not None and i_b is not None:
                y = mobility.beam_point_mobility(f, e, i_b, p["mass_per_length"])
        if mass is None and "length" in p:
            mass = float(p["length"]) * float(p["mass_per_length"])
    if wt == "resonator":
        rd.error(
            path,
            f"{sub.name!r} is a resonator: its spring is the connection; join it with "
            "kind = 'point' to one plate or beam (resilient mounts and other ends are not "
            "supported)",
        )
        return None
    if y is None or mass is None:
        rd.error(
            path,
            f"{_describe(sub)} has no drive-point mobility: a point connection joins plate "
            "bending fields (bending_stiffness, mass_per_area) or beam fields (section, "
            "mass_per_length, material; bending or longitudinal)",
        )
        return None
    return np.array(np.broadcast_to(np.asarray(y, dtype=complex), (nb,))), float(mass)


def _read_point_like(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    *,
    resilient: bool,
) -> Connection | None:
    path = f"connections.{name}"
    extra = ("points", "stiffness", "loss_factor") if resilient else ("points",)
    req = ("stiffness",) if resilient else ()
    if not rd.keys(s, path, (*_COMMON, *extra), req):
        return None
    what = "mount connection" if resilient else "point connection"
    if not _need_two(rd, path, ends, what):
        return None
    resonators = [e for e in ends if e.properties.get("wave_type") == "resonator"]
    if len(resonators) == 1 and not resilient:
        return _resonator_point(rd, name, s, ends, resonators[0])
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    got = [_point_mobility(rd, f"{path}.between[{k}]", e, f) for k, e in enumerate(ends)]
    n = _count(rd, s, "points", path)
    k_m = eta_m = None
    if resilient:
        k_m = rd.spectrum(s["stiffness"], _join(path, "stiffness"), unit="N/m")
        eta_m = (
            rd.spectrum(s["loss_factor"], _join(path, "loss_factor"), minimum=0.0, strict=False)
            if "loss_factor" in s
            else np.zeros(f.size)
        )
    if None in got or n is None or (resilient and (k_m is None or eta_m is None)):
        return None
    (y1, m1), (y2, _) = got  # type: ignore[misc]
    if resilient:
        assert k_m is not None and eta_m is not None
        eta = junctions.clf_point_resilient(f, y1, y2, m1, k_m, loss_factor=eta_m, n_points=n)
        desc = f"{n} resilient mount(s), incoherent: N Re Y2/(omega M1 |Y1 + Ym + Y2|^2)"
    else:
        eta = junctions.clf_point_rigid(f, y1, y2, m1, n_points=n)
        desc = f"{n} rigid point(s), incoherent: N Re Y2/(omega M1 |Y1 + Y2|^2)"
    eta = np.maximum(_per_band(eta, f.size), np.finfo(float).tiny)
    return Connection(
        name,
        ends[0].name,
        ends[1].name,
        eta,
        kind="mount" if resilient else "point",
        provenance={"coupling_loss_factor": desc + ", infinite-system drive-point mobilities"},
    )


#: Loss factor through a resonator's spring above which the weak-coupling estimate is
#: flagged (the neglected frequency shift is of the same order; common practice).
WEAK_RESONATOR_COUPLING = 0.1


def _resonator_point(
    rd: Reader, name: str, s: dict[str, Any], ends: list[Subsystem], res: Subsystem
) -> Connection | None:
    """A resonator's spring attached at one point of a plate or beam (junctions.clf_resonator_point)."""
    path = f"connections.{name}"
    if "points" in s:
        rd.error(
            _join(path, "points"),
            "a resonator subsystem is one spring-mass; model several as separate resonators",
        )
        return None
    k_idx = 1 if ends[0] is res else 0
    other = ends[k_idx]
    p = res.properties
    f0 = float(p["natural_frequency"])
    got = _point_mobility(rd, f"{path}.between[{k_idx}]", other, np.array([f0]))
    if got is None:
        return None
    y0 = got[0][0]
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    eta = junctions.clf_resonator_point(f, f0, float(p["stiffness"]), y0)
    eta0 = float(junctions.clf_resonator_point(f0, f0, float(p["stiffness"]), y0))
    if eta0 > WEAK_RESONATOR_COUPLING:
        rd.notes.append(
            f"{name}: the resonator {res.name!r} is strongly coupled to {other.name!r} "
            f"(loss factor {eta0:.2g} through its spring at f0 = {f0:.4g} Hz, above "
            f"{WEAK_RESONATOR_COUPLING:g}): the weak-coupling estimate is rough; its natural "
            "frequency shifts on this structure"
        )
    eta = np.maximum(_per_band(eta, f.size), np.finfo(float).tiny)
    return Connection(
        name,
        res.name,
        other.name,
        eta,
        kind="point",
        provenance={
            "coupling_loss_factor": "resonator spring on the structure's infinite-system "
            f"mobility at f0 = {f0:.4g} Hz: eta = Re(a)/(1 + Im(a)) (omega0/omega), a = k Y/omega0"
        },
    )


def _read_point(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
) -> Connection | None:
    return _read_point_like(rd, name, s, ends, resilient=False)


def _read_mount(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
) -> Connection | None:
    return _read_point_like(rd, name, s, ends, resilient=True)


# ----------------------------------------------------------------------------------------
# kind = "leak"

LEAK_MODELS = ("circular", "open")


def _read_leak(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
) -> Connection | None:
    path = f"connections.{name}"
    if not rd.keys(s, path, (*_COMMON, "area", "depth", "model", "holes"), ("area",)):
        return None
    if not _need_two(rd, path, ends, "leak"):
        return None
    ok = True
    for k, e in enumerate(ends):
        if not _is_cavity(e):
            rd.error(
                f"{path}.between[{k}]",
                f"{_describe(e)} is not a cavity; a leak joins two cavities",
            )
            ok = False
    model: str | None = "circular"
    if "model" in s:
        model = _choice(rd, s["model"], _join(path, "model"), LEAK_MODELS)
        ok = ok and model is not None
    area = rd.number(s["area"], _join(path, "area"), unit="m^2")
    holes = _count(rd, s, "holes", path)
    depth: float | None = 0.0
    if model == "circular":
        if "depth" not in s:
            rd.error(
                _join(path, "depth"),
                "missing required key for model = 'circular' (wall thickness [m]; "
                "model = 'open' takes tau = 1)",
            )
            ok = False
        else:
            depth = rd.number(s["depth"], _join(path, "depth"), unit="m", strict=False)
    elif model == "open" and "depth" in s:
        rd.error(_join(path, "depth"), "is not used by model = 'open' (tau = 1); remove it")
        ok = False
    if not ok or area is None or holes is None or depth is None:
        return None
    fluids = _shared_fluid(rd, path, ends, "leak model")
    if fluids is None:
        return None
    f1, f2 = fluids
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    rho, c = f1
    if model == "circular":
        radius = math.sqrt(area / (holes * math.pi))
        tau: Any = coupling.aperture_transmission_circular(f, radius, depth, rho0=rho, c0=c)
        desc = f"{holes} circular hole(s), tube with piston-radiation ends"
    else:
        tau = 1.0
        desc = "open area, tau = 1"
    v1, v2 = _volume(ends[0]), _volume(ends[1])
    assert v1 is not None and v2 is not None
    eta = cavity_pair_clf(
        _per_band(coupling.clf_aperture(f, area, v1, tau, c0=c), f.size),
        _per_band(coupling.clf_aperture(f, area, v2, tau, c0=c), f.size),
        ends[0].modal_density,
        ends[1].modal_density,
    )
    eta = np.maximum(eta, np.finfo(float).tiny)
    return Connection(
        name,
        ends[0].name,
        ends[1].name,
        eta,
        kind="leak",
        provenance={"coupling_loss_factor": f"leak: c S_a tau/(4 omega V_1), {desc}"},
    )


CONNECTION_KINDS["radiation"] = _read_radiation
CONNECTION_KINDS["nonresonant"] = _read_nonresonant
CONNECTION_KINDS["line"] = _read_line
CONNECTION_KINDS["point"] = _read_point
CONNECTION_KINDS["mount"] = _read_mount
CONNECTION_KINDS["leak"] = _read_leak
