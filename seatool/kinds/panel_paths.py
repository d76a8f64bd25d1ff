"""Connection kinds through a panel: ``radiation`` and ``nonresonant``.

``radiation``
    plate or shell (bending field) <-> cavity or the exterior sink, resonant radiation
    ``eta = rho c sigma / (omega m'')`` with the band-averaged radiation efficiency.
``nonresonant``
    cavity <-> cavity (or the exterior) through a named panel, the forced-wave
    ("mass-law") path ``eta_12 = c S tau_NR / (4 omega V_1)``.

The formulas live in :mod:`seatool.physics` and are only called here; see
``docs/theory/coupling.md`` ("How the model-file readers use the formulas").
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Connection, Subsystem
from ..physics import coupling, radiation, radiation_curved, transmission
from ..properties import PanelProps, ShellProps, is_cavity
from .links import (
    BETWEEN,
    cavity_pair_clf,
    critical_frequency_per_band,
    describe,
    fluid_of,
    need_two,
    panel_of,
    per_band,
    shared_fluid,
    treated,
    treatment_factor,
    volume_of,
)
from .params import Kind, Param
from .reader import DEFAULT_FLUID, Reader

__all__ = [
    "NONRESONANT",
    "RADIATION",
    "RADIATION_EDGES",
    "RADIATION_METHODS",
    "TAU_FLOOR",
    "nonresonant_clf",
    "radiation_clf",
]

Array = npt.NDArray[np.float64]

#: Radiation-efficiency formulas offered by ``method`` (see :mod:`seatool.physics.radiation`).
RADIATION_METHODS = ("leppington", "maidanik", "en12354")

#: Edge conditions offered by ``edges`` (see
#: :func:`seatool.physics.radiation.radiation_efficiency_leppington`).
RADIATION_EDGES = ("simply_supported", "clamped")

#: Floor of a transmission coefficient that the physics gives as exactly zero (the
#: non-resonant path at and above coincidence): 300 dB, negligible, keeps eta > 0.
TAU_FLOOR = 1e-30


def _curved(props: PanelProps) -> bool:
    return isinstance(props, ShellProps)


def radiation_clf(
    rd: Reader,
    props: PanelProps,
    fluid: tuple[float, float],
    *,
    method: str = "leppington",
    corner_factor: float = 1.0,
    edges: str = "simply_supported",
) -> tuple[Array, Array]:
    """Radiation CLF panel -> fluid per band and the band-averaged sigma used.

    ``sigma`` from :func:`seatool.physics.radiation.radiation_efficiency_band` over the
    model's band edges, with the critical frequency in that fluid; for a shell or curved
    panel (:class:`seatool.properties.ShellProps`) with the default method, from
    :func:`seatool.physics.radiation_curved.radiation_efficiency_curved_panel` (Szechenyi 1971).
    ``eta`` from :func:`seatool.physics.coupling.clf_radiation`. No treatment factor
    applied here. ``edges`` is passed to the flat-panel formula (the reader refuses
    ``"clamped"`` where the curved-panel formula is used).
    """
    assert rd.bands is not None
    bands = rd.bands
    nb = len(bands)
    rho, c = fluid
    f_c = critical_frequency_per_band(props, c, nb)
    if isinstance(props, ShellProps) and method == "leppington":
        sigma = _curved_sigma(props, bands, f_c, c)
        eta = coupling.clf_radiation(
            bands.centre, sigma, float(props.mass_per_area), rho0=rho, c0=c
        )
        return per_band(eta, nb), per_band(sigma, nb)
    sigma = radiation.radiation_efficiency_band(
        bands.centre,
        float(props.lx),
        float(props.ly),
        f_c,
        method=method,  # type: ignore[arg-type]
        f_lower=bands.lower,
        f_upper=bands.upper,
        c0=c,
        corner_factor=corner_factor,
        edges=edges,  # type: ignore[arg-type]
    )
    eta = coupling.clf_radiation(bands.centre, sigma, float(props.mass_per_area), rho0=rho, c0=c)
    return per_band(eta, nb), per_band(sigma, nb)


def _curved_sigma(props: ShellProps, bands: Any, f_c: Array, c: float) -> Array:
    """Band sigma of a curved panel or closed cylinder (lx axial, ly developed arc).

    c_L' = 2 pi a f_r (the definition of the ring frequency) is divided by
    sqrt(m'' / (rho h)) so that the membrane stiffness sees the same mass per area (with an
    added treatment mass) as the critical frequency.
    """
    mat = props.material
    m = float(props.mass_per_area)
    c_l = 2.0 * math.pi * float(props.radius) * float(props.ring_frequency)
    c_l *= math.sqrt(float(mat.density) * float(props.thickness) / m)
    return radiation_curved.radiation_efficiency_curved_panel(
        bands.centre,
        float(props.lx),
        float(props.ly),
        f_c,
        float(props.radius),
        longitudinal_speed=c_l,
        poisson_ratio=float(mat.poisson_ratio),
        closed=bool(props.closed),
        f_lower=bands.lower,
        f_upper=bands.upper,
        c0=c,
    )


def nonresonant_clf(
    rd: Reader,
    props: PanelProps,
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
    f_c = critical_frequency_per_band(props, c, nb)
    tau = transmission.transmission_nonresonant(
        bands.centre,
        float(props.mass_per_area),
        float(props.lx),
        float(props.ly),
        f_c,
        stiffness_factor=stiffness_factor,
        rho0=rho,
        c0=c,
    )
    # tau_NR = 0 at and above coincidence; a model connection needs eta > 0, so the
    # transmission coefficient is floored at TAU_FLOOR (300 dB), which keeps reciprocity.
    tau = np.maximum(tau, TAU_FLOOR)
    eta = coupling.clf_nonresonant(bands.centre, float(props.area), tau, volume, c0=c)
    return per_band(eta, nb)


def _radiation(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
) -> Connection | None:
    if not need_two(rd, path, ends, "radiation connection"):
        return None
    # The panel is whichever end is not a cavity or the exterior.
    k_air = [i for i, e in enumerate(ends) if e.sink or is_cavity(e)]
    if len(k_air) != 1:
        what = "two cavities" if len(k_air) == 2 else "no cavity or exterior"
        rd.error(
            f"{path}.between",
            f"radiation joins a plate or shell and a cavity or the exterior, got {what}",
        )
        return None
    air = ends[k_air[0]]
    panel = ends[1 - k_air[0]]
    props = panel_of(rd, f"{path}.between[{1 - k_air[0]}]", panel)
    if props is None:
        return None
    ok = True
    method, edges = v["method"], v["edges"]
    corner = 1.0
    if "corner_factor" in s:
        if method != "maidanik":
            rd.error(f"{path}.corner_factor", "is used by method = 'maidanik' only; remove it")
            ok = False
        else:
            corner = v["corner_factor"]
    if edges == "clamped" and method == "en12354":
        rd.error(f"{path}.edges", "'clamped' is not available with method = 'en12354'")
        ok = False
    elif edges == "clamped" and _curved(props) and method == "leppington":
        rd.error(
            f"{path}.edges",
            "'clamped' is not available for a shell or curved panel "
            "(the curved-panel radiation efficiency has no edge option)",
        )
        ok = False
    if air.sink:
        fname = "air"
        if "fluid" in s:
            got = rd.name_ref(s["fluid"], f"{path}.fluid", rd.fluids, "fluid")
            ok = ok and got is not None
            fname = got or fname
        fl = rd.fluids.get(fname, DEFAULT_FLUID)
        fluid = (float(fl["density"]), float(fl["sound_speed"]))
    else:
        if "fluid" in s:
            rd.error(
                f"{path}.fluid",
                f"the fluid of cavity {air.name!r} is used; 'fluid' is for the exterior only",
            )
            ok = False
        got_fluid = fluid_of(air)
        assert got_fluid is not None
        fluid = got_fluid
    if not ok:
        return None
    assert rd.bands is not None
    eta, _ = radiation_clf(rd, props, fluid, method=method, corner_factor=corner, edges=edges)
    eta = eta * treatment_factor(props, air.name, len(rd.bands))
    where = "the exterior" if air.sink else f"cavity {air.name!r}"
    curved = _curved(props)
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
                    if curved and method == "leppington"
                    else f"band-averaged ({method}, {edges.replace('_', ' ')} edges"
                    + (", flat-panel formula: curvature not included)" if curved else ")")
                )
                + (", reduced by the treatment insertion loss" if treated(props, air) else "")
            )
        },
    )


def _nonresonant(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
) -> Connection | None:
    if not need_two(rd, path, ends, "non-resonant path"):
        return None
    ok = True
    for k, e in enumerate(ends):
        if not (is_cavity(e) or e.sink):
            rd.error(
                f"{path}.between[{k}]",
                f"{describe(e)} is not a cavity; the non-resonant path joins two cavities "
                "(or a cavity and the exterior)",
            )
            ok = False
    pname, sf = v["through"], v["stiffness_factor"]
    if not ok:
        return None
    if pname not in subs:
        return None  # that subsystem had its own problems, already reported
    props = panel_of(rd, f"{path}.through", subs[pname])
    if props is None:
        return None
    sinks = [e for e in ends if e.sink]
    if sinks:
        # Cavity -> free field: eta = c S tau_NR / (4 omega V) from the cavity, no return.
        room = ends[0] if sinks[0] is ends[1] else ends[1]
        f_room, v_room = fluid_of(room), volume_of(room)
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
                    + (", reduced by the treatment insertion loss" if treated(props, None) else "")
                )
            },
        )
    fluids = shared_fluid(rd, path, ends, "non-resonant path model")
    if fluids is None:
        return None
    f1, _ = fluids
    v1, v2 = volume_of(ends[0]), volume_of(ends[1])
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
                + (", reduced by the treatment insertion loss" if treated(props, None) else "")
            )
        },
    )


RADIATION = Kind(
    "connection", "radiation",
    "Resonant radiation of a plate or shell (bending field) into a cavity or the exterior.",
    (
        Param("method", "choice", doc="radiation efficiency formula", choices=RADIATION_METHODS, default="leppington"),
        Param("edges", "choice", doc="edge condition of the flat-panel formula", choices=RADIATION_EDGES, default="simply_supported"),
        Param("corner_factor", doc="corner-mode factor of method = 'maidanik'", strict=False, default=1.0, bounds=(0.0, 10.0)),
        Param("fluid", "string", doc="fluid of the exterior (a cavity's own fluid is used)", default_doc="air"),
    ),
    _radiation,
    implicit=BETWEEN,
    extent="area",
)  # fmt: skip

NONRESONANT = Kind(
    "connection", "nonresonant",
    "Non-resonant (mass-law) transmission between two cavities, or a cavity and the exterior, through a panel.",
    (
        Param("through", "subsystem", doc="the panel between the two", required=True),
        Param("stiffness_factor", "flag", doc="include the panel's stiffness below coincidence", default=False),
    ),
    _nonresonant,
    implicit=BETWEEN,
    extent="area",
)  # fmt: skip
