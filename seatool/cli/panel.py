"""``seatool panel``: band-by-band properties of one flat isotropic panel (parse, call, print).

For a material (built-in name or properties on the command line), a thickness and a size
``lx`` x ``ly``, print the table of :func:`seatool.analysis.panel.panel_table`: per band
the coincidence (critical) frequency, modal density, modes in band, modal overlap (with
``--loss-factor``, default the material's), bending wavelength, radiation efficiency, the
two-room SEA transmission loss and, with a treatment option, the treatment's columns;
``--csv FILE`` writes the same table. Materials, fluids, treatments and the panel table are
reached through the lazy package attributes of :mod:`seatool`.
"""

from __future__ import annotations

import argparse
import math
from pathlib import Path
from typing import Any

import seatool

from ..errors import InputError, Problem, closest
from ._common import Command, print_caution

__all__ = ["PANEL", "render", "spec_from_args"]


def _arguments(p: argparse.ArgumentParser) -> None:
    defaults = seatool.analysis.panel
    volumes, t60 = defaults.DEFAULT_ROOM_VOLUMES, defaults.DEFAULT_REVERBERATION_TIME
    p.add_argument(
        "--material",
        metavar="NAME",
        help="built-in material (" + ", ".join(seatool.materials.load_materials()) + "); properties given "
        "below replace the material's",
    )
    p.add_argument("--density", metavar="KG_M3", help="density [kg/m^3]")
    p.add_argument("--youngs-modulus", metavar="PA", help="Young's modulus [Pa]")
    p.add_argument("--poisson-ratio", metavar="NU", help="Poisson's ratio")
    p.add_argument("--thickness", metavar="M", help="thickness [m]")
    p.add_argument("--lx", metavar="M", help="side length [m]")
    p.add_argument("--ly", metavar="M", help="other side length [m]")
    p.add_argument(
        "--loss-factor",
        metavar="ETA",
        help="the panel's total loss factor as mounted, e.g. measured; used as given "
        "(default: the material's internal loss factor plus the losses into a laboratory "
        "opening, EN ISO 12354-1 Annex C)",
    )
    p.add_argument(
        "--edge-absorption",
        metavar="ALPHA",
        help="bending-wave absorption coefficient (0 .. 1) of the edges: the losses at the "
        "edges instead of those into a laboratory opening (a stated absorption; --seal "
        "computes it for gaskets and sealant); not with --loss-factor",
    )
    seal = defaults.DEFAULT_SEAL
    p.add_argument(
        "--seal",
        action="store_true",
        help="the panel held in the opening by a resilient, lossy strip on each face "
        "(glazing gasket, sealant bead): adds the bending-wave absorption of its edges to the "
        "laboratory losses; by default an EPDM glazing gasket (common practice, from memory): "
        "the four options below; the default mounting of glazing (glass, pmma, polycarbonate)",
    )
    p.add_argument(
        "--no-seal",
        action="store_true",
        help="the laboratory opening's losses alone, also for glazing (whose default is --seal)",
    )
    for option, metavar, what, value in (
        ("modulus", "PA", "Young's modulus of the strips [Pa]", seal.youngs_modulus),
        ("loss-factor", "ETA", "loss factor of the strips", seal.loss_factor),
        ("width", "M", "contact width of each strip on the panel [m]", seal.width),
        ("thickness", "M", "thickness of each strip [m]", seal.thickness),
    ):
        p.add_argument(
            f"--seal-{option}",
            metavar=metavar,
            help=f"{what} (default {value:g}; implies --seal)",
        )
    p.add_argument(
        "--fluid",
        metavar="NAME",
        default="air",
        help="fluid for the coincidence frequency (" + ", ".join(seatool.materials.load_fluids()) + "; default air)",
    )
    p.add_argument("--lowest", metavar="HZ", default="50", help="lowest band centre (default 50)")
    p.add_argument(
        "--highest", metavar="HZ", default="10000", help="highest band centre (default 10000)"
    )
    p.add_argument("--octave", action="store_true", help="octave bands (default third-octave)")
    p.add_argument("--csv", metavar="FILE", help="write the table to FILE")
    p.add_argument(
        "--plot", metavar="FILE",
        help="draw transmission loss and radiation efficiency to FILE (.png, .pdf or .svg)",
    )  # fmt: skip
    p.add_argument(
        "--room-volumes",
        nargs=2,
        metavar=("V1", "V2"),
        default=None,
        help="volumes of the source and receiving rooms of the transmission-loss model "
        f"[m^3] (default {volumes[0]:g} {volumes[1]:g})",
    )
    p.add_argument(
        "--room-reverberation-time",
        metavar="S",
        default=None,
        help="reverberation time of both rooms [s] "
        f"(default {t60:g})",
    )
    library = seatool.catalogue.load_treatments()
    g = p.add_argument_group("treatment")
    g.add_argument(
        "--damping-layer",
        metavar="NAME",
        help="viscoelastic layer of the treatment library bonded to the panel: adds the "
        "composite_loss_factor column ("
        + ", ".join(n for n, t in library.items() if t.kind == "viscoelastic")
        + ")",
    )
    g.add_argument(
        "--cover",
        metavar="MATERIAL:THICKNESS",
        help="constraining cover over the damping layer (constrained layer), e.g. steel:0.0005",
    )
    g.add_argument(
        "--trim",
        metavar="NAME",
        help="trim layer or build-up of the treatment library on one face: adds its "
        "diffuse rigid-backed absorption and its field-incidence insertion loss ("
        + ", ".join(library)
        + ")",
    )


def _num(
    problems: list[Problem], value: str | None, option: str, *, minimum: float | None = 0.0
) -> float | None:
    if value is None:
        return None
    try:
        x = float(value)
    except ValueError:
        problems.append(Problem("", option, f"must be a number, got {value!r}"))
        return None
    if not math.isfinite(x):
        problems.append(Problem("", option, f"must be finite, got {value!r}"))
        return None
    if minimum is not None and x <= minimum:
        problems.append(Problem("", option, f"must be > {minimum:g}, got {value}"))
        return None
    return x


def spec_from_args(
    args: argparse.Namespace,
) -> tuple[seatool.analysis.panel.PanelSpec, seatool.BandAxis]:
    """Validate the options of ``seatool panel``; raises InputError (one line per problem)."""
    problems: list[Problem] = []
    mats = seatool.materials.load_materials()
    base: seatool.materials.Material | None = None
    if args.material is not None:
        if args.material not in mats:
            hint = closest(args.material, mats) or f" (known: {', '.join(mats)})"
            problems.append(Problem("", "--material", f"unknown material {args.material!r}{hint}"))
        else:
            base = mats[args.material]
    rho = _num(problems, args.density, "--density")
    e = _num(problems, args.youngs_modulus, "--youngs-modulus")
    nu = _num(problems, args.poisson_ratio, "--poisson-ratio", minimum=-1.0)
    if nu is not None and nu >= 0.5:
        problems.append(Problem("", "--poisson-ratio", f"must be < 0.5, got {nu:g}"))
        nu = None
    for option in ("thickness", "lx", "ly"):
        if getattr(args, option) is None:
            problems.append(Problem("", f"--{option}", "missing required option"))
    h = _num(problems, args.thickness, "--thickness")
    lx = _num(problems, args.lx, "--lx")
    ly = _num(problems, args.ly, "--ly")
    eta = _num(problems, args.loss_factor, "--loss-factor")
    mounting: str | None = "stated" if eta is not None else None
    alpha = _num(problems, args.edge_absorption, "--edge-absorption", minimum=None)
    if alpha is not None:
        if not 0.0 <= alpha <= 1.0:
            problems.append(Problem("", "--edge-absorption", f"must lie in 0 .. 1, got {alpha:g}"))
        elif args.loss_factor is not None:
            problems.append(
                Problem(
                    "",
                    "--edge-absorption",
                    "not with --loss-factor (a stated loss factor is the total as mounted)",
                )
            )
        else:
            mounting = "edges"
    seal = _seal(problems, args)
    if seal is not None:
        for given, option in ((eta, "--loss-factor"), (alpha, "--edge-absorption")):
            if given is not None:
                problems.append(Problem("", "--seal", f"not with {option}"))
        mounting = "sealed"
    if args.no_seal:
        for given, option in ((eta, "--loss-factor"), (alpha, "--edge-absorption"), (seal, "--seal")):
            if given is not None:
                problems.append(Problem("", "--no-seal", f"not with {option}"))
        mounting = "laboratory"
    lo = _num(problems, args.lowest, "--lowest")
    hi = _num(problems, args.highest, "--highest")
    fluids = seatool.materials.load_fluids()
    fluid = fluids.get(args.fluid)
    if fluid is None:
        hint = closest(args.fluid, fluids) or f" (known: {', '.join(fluids)})"
        problems.append(Problem("", "--fluid", f"unknown fluid {args.fluid!r}{hint}"))
    if base is None and args.material is None:
        missing = [
            o
            for o, v in (
                ("--density", args.density),
                ("--youngs-modulus", args.youngs_modulus),
                ("--poisson-ratio", args.poisson_ratio),
            )
            if v is None
        ]
        if missing:
            problems.append(
                Problem("", "--material", "give a material name or " + ", ".join(missing))
            )
    material: seatool.materials.Material | None = None
    if not problems:
        changes = {
            k: v
            for k, v in (("density", rho), ("youngs_modulus", e), ("poisson_ratio", nu))
            if v is not None
        }
        if base is not None:
            material = base.replace(**changes) if changes else base
        else:
            assert rho is not None and e is not None and nu is not None
            material = seatool.materials.Material("command line", rho, e, nu, 0.0, source="command line")
        if eta is None:
            eta = material.loss_factor
            if eta <= 0:
                problems.append(Problem("", "--loss-factor", "needed (the material has none)"))
    bands: seatool.BandAxis | None = None
    if lo is not None and hi is not None:
        try:
            bands = seatool.BandAxis.from_range(lo, hi, "octave" if args.octave else "third-octave")
        except seatool.bands.BandError as exc:
            problems.append(Problem("", "--lowest/--highest", str(exc)))
    defaults = seatool.analysis.panel
    vols: tuple[float, float] = defaults.DEFAULT_ROOM_VOLUMES
    if args.room_volumes is not None:
        got = [_positive(problems, v, "--room-volumes") for v in args.room_volumes]
        if got[0] is not None and got[1] is not None:
            vols = (got[0], got[1])
    t60 = defaults.DEFAULT_REVERBERATION_TIME
    if args.room_reverberation_time is not None:
        t60 = _positive(problems, args.room_reverberation_time, "--room-reverberation-time") or t60
    cover: tuple[str, float] | None = None
    if args.cover:
        mat_name, _, thick = str(args.cover).partition(":")
        try:
            cover = (mat_name, float(thick))
        except ValueError:
            problems.append(
                Problem("", "--cover", f"give MATERIAL:THICKNESS_M, got {args.cover!r}")
            )
    if args.csv is not None and not Path(args.csv).resolve().parent.exists():
        problems.append(Problem("", "--csv", f"folder of {args.csv!r} does not exist"))
    if problems:
        raise InputError(problems)
    assert material is not None and h is not None and lx is not None and ly is not None
    assert eta is not None and fluid is not None and bands is not None
    spec = seatool.PanelSpec(
        material,
        h,
        lx,
        ly,
        eta,
        fluid,
        room_volumes=vols,
        room_reverberation_time=t60,
        damping_layer=args.damping_layer or None,
        cover=cover,
        trim=args.trim or None,
        mounting=mounting,
        edge_absorption=alpha or 0.0,
        seal=seal or seatool.analysis.panel.DEFAULT_SEAL,
    )
    return spec, bands


def _seal(problems: list[Problem], args: argparse.Namespace) -> Any:
    """The :class:`EdgeSeal` of ``--seal`` and ``--seal-*`` (None without them)."""
    given = {
        "youngs_modulus": _num(problems, args.seal_modulus, "--seal-modulus"),
        "loss_factor": _num(problems, args.seal_loss_factor, "--seal-loss-factor", minimum=None),
        "width": _num(problems, args.seal_width, "--seal-width"),
        "thickness": _num(problems, args.seal_thickness, "--seal-thickness"),
    }
    raw = (args.seal_modulus, args.seal_loss_factor, args.seal_width, args.seal_thickness)
    if not args.seal and all(v is None for v in raw):
        return None
    eta = given["loss_factor"]
    if eta is not None and eta < 0:
        problems.append(Problem("", "--seal-loss-factor", f"must be >= 0, got {eta:g}"))
        return None
    default = seatool.analysis.panel.DEFAULT_SEAL
    values = {k: getattr(default, k) if v is None else v for k, v in given.items()}
    return seatool.analysis.panel.EdgeSeal(**values)


def _positive(problems: list[Problem], value: Any, option: str) -> float | None:
    try:
        x = float(value)
    except (TypeError, ValueError):
        problems.append(Problem("", option, f"must be a number, got {value!r}"))
        return None
    if not math.isfinite(x) or x <= 0:
        problems.append(Problem("", option, f"must be a finite number > 0, got {value!r}"))
        return None
    return x


def _as_options(exc: InputError) -> InputError:
    """Key paths of :class:`PanelSpec` fields (``cover.material``) as options (``--cover``)."""
    problems = []
    for pr in exc.problems:
        key, _, rest = pr.path.partition(".")
        option = "--" + key.replace("_", "-") if key else "--trim"
        problems.append(Problem("", option + (f" ({rest})" if rest else ""), pr.message))
    return InputError(problems)


_FORMATS = {
    "critical_frequency_hz": "{:.0f}",
    "modal_density_per_hz": "{:.4g}",
    "modes_in_band": "{:.3g}",
    "modal_overlap": "{:.3g}",
    "bending_wavelength_m": "{:.4g}",
}


def render(spec: seatool.PanelSpec, table: Any, bands: seatool.BandAxis) -> str:
    """Text version of :func:`seatool.analysis.panel.panel_table` with a header naming the
    panel."""
    m = spec.material
    lines = [
        f"panel: {m.name}, h = {spec.thickness:g} m, {spec.lx:g} x {spec.ly:g} m "
        f"(m'' = {spec.mass_per_area:.4g} kg/m^2, D = {spec.bending_stiffness:.4g} N m)",
        f"coincidence frequency in {spec.fluid.name}: {spec.critical_frequency:.0f} Hz; "
        f"loss factor {_loss_factor_text(spec)}",
    ]
    cols = [c for c in table.columns if c not in ("band_hz", "band_exact_hz")]
    head = ["band", *cols]
    rows = []
    for j in range(len(table)):
        row = [bands.label(j)]
        for c in cols:
            v = float(table[c].iloc[j])
            row.append(_FORMATS.get(c, "{:.4g}").format(v))
        rows.append(row)
    widths = [max(len(r[k]) for r in [head, *rows]) for k in range(len(head))]
    fmt = "  ".join(f"{{:>{w}}}" for w in widths)
    lines += [fmt.format(*head), fmt.format(*["-" * w for w in widths])]
    lines += [fmt.format(*r) for r in rows]
    rating = seatool.analysis.rating.rating_of_bands(
        bands, table["transmission_loss_sea_dB"].to_numpy()
    )
    if rating is not None:
        lines.append(f"single-number rating of the transmission loss (ISO 717-1): {rating}")
    note = seatool.analysis.panel.mounting_note(spec, bands, table)
    if note is not None:
        lines.append(note)
    return "\n".join(lines)


def _loss_factor_text(spec: seatool.PanelSpec) -> str:
    if spec.mounting == "stated":
        return f"{spec.loss_factor:g} (stated, as mounted)"
    if spec.mounting == "sealed":
        seal = spec.seal
        glazing = (
            "; the default for glazing, --no-seal for the opening alone"
            if spec.material.name in seatool.analysis.panel.GLAZING_MATERIALS
            else ""
        )
        return (
            f"{spec.loss_factor:g} internal + laboratory opening (EN ISO 12354-1 Annex C) + "
            f"edge seal ({seal.youngs_modulus / 1e6:g} MPa, loss factor {seal.loss_factor:g}, strips "
            f"{seal.width * 1e3:g} mm wide, {seal.thickness * 1e3:g} mm thick on both faces)"
            + glazing
        )
    if spec.mounting == "edges":
        return (
            f"{spec.loss_factor:g} internal + edges of absorption coefficient "
            f"{spec.edge_absorption:g} (EN ISO 12354-1 Annex C)"
        )
    return f"{spec.loss_factor:g} internal + laboratory opening (EN ISO 12354-1 Annex C)"


def _handler(args: argparse.Namespace) -> int:
    plot_path = seatool.plot.plot_target(args.plot)
    spec, bands = spec_from_args(args)
    try:
        table = seatool.panel_table(spec, bands)
    except InputError as exc:
        raise _as_options(exc) from None
    print(render(spec, table, bands))
    if args.csv:
        seatool.results.write_csv(table, args.csv)
        print(f"wrote {args.csv}")
    if plot_path is not None:
        title = render(spec, table, bands).splitlines()[0]
        seatool.plot.plot_panel(table, bands, plot_path, title=title)
        print(f"wrote {plot_path}")
    print_caution()
    return 0


PANEL = Command(
    "panel",
    help="band-by-band properties of one flat panel (coincidence, modes, overlap)",
    arguments=_arguments,
    handler=_handler,
    loads_model=False,
)
