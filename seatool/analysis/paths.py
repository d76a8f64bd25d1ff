"""Where the noise comes from: source contributions, connection powers, transmission paths.

Definitions (see ``docs/theory/analysis.md``):

* **Sources** are the power excitations (each excitation on its own) and the subsystems
  held at a prescribed level. The power balance is linear in the input powers P and the
  held energies E_H *jointly*: ``L_UU E_U = P_U / omega + L_UH E_H``. Solving with one
  source switched on and every other one off (other inputs zero, other held subsystems
  held at zero energy, i.e. acting as absorbers) gives energies that sum exactly to the
  full solution. A held subsystem is a source through its couplings; its own energy
  counts entirely as its own contribution.
* **Connection powers** into the receiver are the net powers of the solved model through
  each connection touching it; together with the receiver's external input they add up
  to the power it dissipates (for the exterior sink: the power it absorbs).
* **Paths**: in the one-source solve of source s, net power flows from higher to lower
  modal energy E/n (Vigran 2008, sec. 7; Lyon & DeJong 1995), so the directed graph of
  net flows is acyclic. The power entering each subsystem k (external input plus gross
  inflow), I_k, is shared among what k dissipates and sends on in proportion to those
  outflows ("proportional sharing"; the principle used for tracing flows in networks,
  e.g. Bialek 1996, "Tracing the flow of electricity", IEE Proc. Gener. Transm. Distrib.
  143(4), 313-320, from memory). The power a path s -> k1 -> ... -> r delivers is::

      P_path = w_{s,k1} * prod_{(u, v) later on the path} w_uv / I_u

  and the path powers of all paths from s to r add up exactly to the gross inflow of r
  in that solve (induction in topological order). Each path is given the share
  P_path / I_r of the source's contribution to the receiver. Paths longer than
  ``max_length`` connections (or beyond ``max_paths`` per source and band) are lumped
  into one remainder row so the table still adds up. The graph formulation of SEA path
  analysis follows Guasch & Cortes (2009), "Graph theory applied to noise and vibration
  control in statistical energy analysis models", J. Acoust. Soc. Am. 125(6), 3657-3665
  (from memory); their path strengths are products of energy ratios, ours are power
  shares that sum to the total.
* A diffuse field on a panel face is two sources: its resonant input to the panel and
  its non-resonant (mass-law) part, named ``NAME (non-resonant)``, which enters the cavity
  on the other side directly; that part's paths are written from the panel
  (``panel > cavity > ...``), the first step being the forced wave through it.

Every table carries the receiver's per-band validity (``modes_in_band``,
``modal_overlap``, ``valid``: False with fewer than one mode per band or modal overlap
below 1).
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

import networkx as nx
import numpy as np
import numpy.typing as npt
import pandas as pd

from ..levels import db
from ..model import Model
from ..results import Result
from ..solve import assemble
from ._system import level_offset, receiver_index, solve_sources, validity_columns

__all__ = [
    "Source",
    "connection_powers",
    "contributions",
    "path_ranking",
    "paths",
    "sources",
]

Array = npt.NDArray[np.float64]

#: Label of the row that lumps the paths not enumerated.
OTHER_PATHS = "(other paths)"


@dataclass(frozen=True)
class Source:
    """One source of a model: a power excitation or a held (prescribed-level) subsystem."""

    name: str  # excitation name
    drive: str  # 'power' or 'held level' (the column source_drive)
    subsystem: str
    index: int


def sources(model: Model) -> list[Source]:
    """The sources of ``model`` in excitation order (the exterior sink is not a source)."""
    idx = model.index()
    out = []
    for e in model.excitations:
        drive = "power" if e.drive == "power" else "held level"
        out.append(Source(e.name, drive, e.subsystem, idx[e.subsystem]))
    return out


def _source_arrays(model: Model, srcs: list[Source]) -> tuple[Array, Array]:
    n, nb, ns = len(model.subsystems), len(model.bands), len(srcs)
    power = np.zeros((n, ns, nb))
    held = np.zeros((n, ns, nb))
    by_name = {e.name: e for e in model.excitations}
    for k, s in enumerate(srcs):
        e = by_name[s.name]
        if e.drive == "power":
            assert e.power is not None
            power[s.index, k] = e.power
        else:
            assert e.energy is not None
            held[s.index, k] = e.energy
    return power, held


@dataclass(frozen=True)
class _PerSource:
    model: Model
    srcs: list[Source]
    energy: Array  # (N, S, B)
    flow: Array  # (C, S, B) net power a -> b
    inflow: Array  # (N, S, B) external input + gross inflow
    dissipated: Array  # (N, S, B) damping loss, or absorbed (sinks, held at zero)
    a: npt.NDArray[np.int64]  # (C,) connection ends
    b: npt.NDArray[np.int64]


def _per_source(model: Model) -> _PerSource:
    asm = assemble(model)
    srcs = sources(model)
    power, held = _source_arrays(model, srcs)
    energy = solve_sources(model, asm, power, held)
    a, b = asm.a, asm.b
    om = asm.omega
    flow = om * (asm.eta_ab[:, None, :] * energy[a] - asm.eta_ba[:, None, :] * energy[b])
    n = len(model.subsystems)
    gross_in = np.zeros_like(energy)
    np.add.at(gross_in, b, np.maximum(flow, 0.0))
    np.add.at(gross_in, a, np.maximum(-flow, 0.0))
    net_out = np.zeros_like(energy)
    np.add.at(net_out, a, flow)
    np.add.at(net_out, b, -flow)
    damp = om * asm.damping[:, None, :] * energy
    # External input: given power, or for a held source the power needed to hold it.
    ext = power.copy()
    for k, s in enumerate(srcs):
        if s.drive == "held level":
            ext[s.index, k] = damp[s.index, k] + net_out[s.index, k]
    inflow = ext + gross_in
    held_mask = asm.held
    dissipated = np.where(held_mask[:, None, None], -net_out, damp)
    for k, s in enumerate(srcs):
        if s.drive == "held level":
            dissipated[s.index, k] = damp[s.index, k]
    del n
    return _PerSource(model, srcs, energy, flow, inflow, dissipated, a, b)


def _band_cols(model: Model, rows: int) -> dict[str, Array]:
    return {
        "band_hz": np.tile(model.bands.nominal, rows),
        "band_exact_hz": np.tile(model.bands.centre, rows),
    }


def contributions(model: Model, receiver: str) -> pd.DataFrame:
    """Contribution of each source to the receiver, per band.

    Returns
    -------
    pandas.DataFrame
        One row per source and band: ``receiver, source, source_drive, source_subsystem,
        band_hz, band_exact_hz, energy_J`` (receiver energy with only this source on; NaN
        for the exterior sink), ``power_W`` (power the receiver dissipates, for the sink:
        absorbs, with only this source on), ``share`` (fraction of the receiver's total;
        energy for subsystems, power for the sink; 0 where the total is 0),
        ``level_dB`` (the receiver's level with only this source), ``modes_in_band``,
        ``modal_overlap``, ``valid``. Energies and powers sum over sources to the full
        solve exactly (superposition).
    """
    r = receiver_index(model, receiver)
    ps = _per_source(model)
    return _contrib_table(ps, r)


def _contrib_table(ps: _PerSource, r: int) -> pd.DataFrame:
    model = ps.model
    nb = len(model.bands)
    ns = len(ps.srcs)
    sink = model.subsystems[r].sink
    e = ps.energy[r]  # (S, B)
    p = ps.dissipated[r]
    what = p if sink else e
    total = what.sum(axis=0)
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(total > 0, what / total, 0.0)
    lv = np.full_like(e, np.nan) if sink else db(e) + level_offset(model, r)
    asm_valid = validity_columns(model, assemble(model), r)
    return pd.DataFrame(
        {
            "receiver": model.subsystems[r].name,
            "source": np.repeat([s.name for s in ps.srcs], nb),
            "source_drive": np.repeat([s.drive for s in ps.srcs], nb),
            "source_subsystem": np.repeat([s.subsystem for s in ps.srcs], nb),
            **_band_cols(model, ns),
            "energy_J": (np.full_like(e, np.nan) if sink else e).ravel(),
            "power_W": p.ravel(),
            "share": share.ravel(),
            "level_dB": lv.ravel(),
            **{k: np.tile(v, ns) for k, v in asm_valid.items()},
        }
    )


def connection_powers(result: Result, receiver: str) -> pd.DataFrame:
    """Net power arriving at the receiver through each of its connections, per band.

    One row per connection touching the receiver and band, plus a row
    ``connection = '(input)'`` with the receiver's external input (for a held level: the
    power needed to hold it). Columns: ``receiver, connection, neighbour, band_hz,
    band_exact_hz, power_in_W`` (net, positive into the receiver), ``dissipated_W`` (the
    receiver's dissipated power, for the sink: absorbed), ``share`` (power_in /
    dissipated), ``modes_in_band, modal_overlap, valid``. Per band, ``power_in_W`` sums
    to ``dissipated_W`` (the receiver's power balance).

    The connection powers are the solver's W_ab = omega (eta_ab E_a - eta_ba E_b)
    (Lyon & DeJong 1995, Theory and Application of SEA, 2nd ed., ch. 3; Vigran 2008,
    Building Acoustics, eq. 7.4); this function only selects and signs them.
    """
    model = result.model
    r = receiver_index(model, receiver)
    sol = result.solution
    rows_name: list[str] = []
    rows_nb: list[str] = []
    vals: list[Array] = []
    for k, c in enumerate(model.connections):
        if c.a == model.subsystems[r].name:
            rows_name.append(c.name)
            rows_nb.append(c.b)
            vals.append(-sol.connection_power[k])
        elif c.b == model.subsystems[r].name:
            rows_name.append(c.name)
            rows_nb.append(c.a)
            vals.append(sol.connection_power[k])
    rows_name.append("(input)")
    rows_nb.append("")
    vals.append(sol.input_power[r])
    nrow = len(vals)
    nb = len(model.bands)
    diss = sol.dissipated_power[r]
    v = np.vstack(vals)
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(diss != 0, v / np.where(diss != 0, diss, 1.0), 0.0)
    valid = validity_columns(model, assemble(model), r)
    return pd.DataFrame(
        {
            "receiver": model.subsystems[r].name,
            "connection": np.repeat(rows_name, nb),
            "neighbour": np.repeat(rows_nb, nb),
            **_band_cols(model, nrow),
            "power_in_W": v.ravel(),
            "dissipated_W": np.tile(diss, nrow),
            "share": share.ravel(),
            **{k: np.tile(x, nrow) for k, x in valid.items()},
        }
    )


def _band_paths(
    ps: _PerSource, k: int, j: int, r: int, max_length: int, max_paths: int
) -> list[tuple[tuple[int, ...], float]]:
    """(path, path power) from source k to receiver r in band j; remainder last as ()."""
    s = ps.srcs[k].index
    target = ps.inflow[r, k, j]
    if target <= 0:
        return []
    if s == r:
        return [((r,), float(target))]
    asm_a, asm_b = ps.a, ps.b
    f = ps.flow[:, k, j]
    g = nx.DiGraph()
    for c in range(f.size):
        u, v, w = (int(asm_a[c]), int(asm_b[c]), float(f[c]))
        if w < 0:
            u, v, w = v, u, -w
        if w <= 0:
            continue
        if g.has_edge(u, v):
            g[u][v]["w"] += w  # parallel connections between the same two subsystems
        else:
            g.add_edge(u, v, w=w)
    if s not in g or r not in g:
        return [((), float(target))]
    keep = (nx.descendants(g, s) | {s}) & (nx.ancestors(g, r) | {r})
    h = g.subgraph(keep)
    inflow = ps.inflow[:, k, j]
    out: list[tuple[tuple[int, ...], float]] = []
    found = 0.0
    gen = nx.all_simple_paths(h, s, r, cutoff=max_length)
    for path in itertools.islice(gen, max_paths):
        pw = h[path[0]][path[1]]["w"]
        for u, v in itertools.pairwise(path[1:]):
            pw *= h[u][v]["w"] / inflow[u]
        out.append((tuple(int(x) for x in path), float(pw)))
        found += pw
    rest = float(target - found)
    if abs(rest) > 1e-12 * target:
        out.append(((), rest))
    return out


def paths(
    model: Model, receiver: str, *, max_length: int = 6, max_paths: int = 2000
) -> pd.DataFrame:
    """Transmission paths from every source to the receiver, per band, ranked.

    Parameters
    ----------
    model : Model
    receiver : str
        Receiving subsystem.
    max_length : int, optional
        Longest path enumerated, in connections (default 6).
    max_paths : int, optional
        Most paths enumerated per source and band (default 2000).

    Returns
    -------
    pandas.DataFrame
        One row per path and band: ``receiver, source, source_drive, path`` (subsystem
        names joined by ``' > '``; ``'(other paths)'`` for the remainder), ``length``
        (connections), ``band_hz, band_exact_hz, path_power_W`` (power the path delivers
        into the receiver in the one-source solve), ``source_share`` (fraction of the
        source's arrival at the receiver), ``energy_J`` (share of the source's
        contribution to the receiver energy; for the sink: absorbed power [W] share,
        column ``power_W``), ``share`` (fraction of the receiver's total), ``rank`` (1 =
        strongest in its band), ``modes_in_band, modal_overlap, valid``. Per band, the
        ``share`` column sums to 1 (to rounding) wherever the receiver gets anything.
    """
    if max_length < 1:
        raise ValueError("max_length must be >= 1")
    r = receiver_index(model, receiver)
    ps = _per_source(model)
    names = model.names
    sink = model.subsystems[r].sink
    quantity = ps.dissipated[r] if sink else ps.energy[r]  # (S, B)
    total = quantity.sum(axis=0)
    valid = validity_columns(model, assemble(model), r)
    idx = model.index()
    # A diffuse field's non-resonant part enters its receiver through the panel: the path
    # is written from the panel (a forced wave, not the panel's resonant field).
    via = {e.name: (idx[e.through],) for e in model.excitations if e.through}
    recs: list[dict[str, object]] = []
    for j in range(len(model.bands)):
        for k, src in enumerate(ps.srcs):
            target = ps.inflow[r, k, j]
            for path0, pw in _band_paths(ps, k, j, r, max_length, max_paths):
                path = via.get(src.name, ()) + path0 if path0 else path0
                frac = pw / target if target > 0 else 0.0
                part = frac * quantity[k, j]
                recs.append(
                    {
                        "receiver": names[r],
                        "source": src.name,
                        "source_drive": src.drive,
                        "path": " > ".join(names[i] for i in path) if path else OTHER_PATHS,
                        "length": len(path) - 1 if path else -1,
                        "band_hz": float(model.bands.nominal[j]),
                        "band_exact_hz": float(model.bands.centre[j]),
                        "path_power_W": pw,
                        "source_share": frac,
                        ("power_W" if sink else "energy_J"): part,
                        "share": part / total[j] if total[j] > 0 else 0.0,
                        "modes_in_band": float(valid["modes_in_band"][j]),
                        "modal_overlap": float(valid["modal_overlap"][j]),
                        "valid": bool(valid["valid"][j]),
                    }
                )
    cols = [
        "receiver", "source", "source_drive", "path", "length", "band_hz", "band_exact_hz",
        "path_power_W", "source_share", "power_W" if sink else "energy_J", "share",
        "rank", "modes_in_band", "modal_overlap", "valid",
    ]  # fmt: skip
    if not recs:
        return pd.DataFrame({c: [] for c in cols})
    df = pd.DataFrame(recs)
    df["rank"] = (
        df.groupby("band_hz")["share"].rank(ascending=False, method="first").astype(int)
    )
    df = df.sort_values(["band_exact_hz", "rank"], kind="stable").reset_index(drop=True)
    return df[cols]


def path_ranking(path_table: pd.DataFrame) -> pd.DataFrame:
    """Overall ranking of the paths of :func:`paths` over all bands.

    The quantity of each path (``energy_J``, or ``power_W`` for the sink) is summed over
    the bands; ``share`` is its fraction of the receiver's summed quantity (for energies,
    the fraction of the overall, unweighted band-summed level's mean square), ``bands_invalid``
    counts the bands in which the path carries energy while the receiver fails the
    validity conditions. Sorted, ``rank`` 1 first.
    """
    q = "energy_J" if "energy_J" in path_table.columns else "power_W"
    if path_table.empty:
        return pd.DataFrame(
            {c: [] for c in ["rank", "source", "path", "length", q, "share", "bands_invalid"]}
        )
    t = path_table.assign(_inv=(~path_table["valid"].astype(bool)) & (path_table[q] > 0))
    g = t.groupby(["source", "path", "length"], sort=False).agg(
        **{q: (q, "sum"), "bands_invalid": ("_inv", "sum")}
    )
    g = g.reset_index()
    total = float(g[q].sum())
    g["share"] = g[q] / total if total > 0 else 0.0
    g = g.sort_values(q, ascending=False, kind="stable").reset_index(drop=True)
    g.insert(0, "rank", np.arange(1, len(g) + 1))
    return g[["rank", "source", "path", "length", q, "share", "bands_invalid"]]
