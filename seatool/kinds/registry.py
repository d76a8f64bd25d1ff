"""The one explicit list of the model file's kinds.

Every kind module is imported here and each of its kinds listed once in :data:`KINDS`;
:mod:`seatool.modelfile` reads the file through the family tables below, and
:mod:`seatool.kinds.docs` writes the key tables of ``docs/model-format.md`` from the same
list. Adding a kind: write its physics function, its kind module (declaration + derive
function) and its tests, then add one line to :data:`KINDS`.

Derive signatures by family:

* ``subsystem``: ``derive(reader, name, values, table, path)`` -> Subsystem, a list of
  them (one per wave field) or None after reporting problems;
* ``connection``: ``derive(reader, name, values, table, ends, subsystems, path)`` ->
  Connection, a list, or None (``ends``: the subsystems named in ``between``, in order);
* ``excitation``: ``derive(reader, subsystem, values, key_path, table)`` ->
  ``("power", W)``, ``("prescribed", J)`` or None;
* ``damping``: ``derive(reader, table, path, context)`` -> loss factor per band or None;
* ``low_frequency``: ``box``: ``derive(reader, cavity, values, path, subsystems, panels)``
  -> LowFrequency or None; ``panel``: ``derive(reader, name, values, path, subsystem,
  dims)`` -> PanelPlacement or None (both called by
  :func:`seatool.kinds.low_frequency.read_low_frequency_section`);
* ``treatment``, ``layer``: read by :func:`seatool.kinds.plate_treatment.read_plate_treatment`
  and :func:`seatool.kinds.layers.read_layers` (the declarations drive checks and docs).
"""

from __future__ import annotations

from . import (
    beams,
    cavities,
    damping_forms,
    edge_seal,
    excitations,
    given,
    junction_lines,
    layers,
    leaks,
    low_frequency,
    panel_paths,
    plate_treatment,
    plates,
    point_links,
    resilient_lines,
    shells,
)
from .params import Kind

__all__ = [
    "CONNECTION_KINDS",
    "DAMPING_KINDS",
    "EXCITATION_KINDS",
    "KINDS",
    "RENAMED",
    "SUBSYSTEM_KINDS",
    "by_family",
]

#: Every kind of the model file, by family, in the order of the documentation.
KINDS: tuple[Kind, ...] = (
    given.STRUCTURE,
    given.EXTERIOR,
    plates.PLATE,
    plates.ORTHOTROPIC_PLATE,
    plates.RIBBED_PLATE,
    plates.SANDWICH_PANEL,
    shells.CYLINDRICAL_SHELL,
    beams.BEAM,
    cavities.CAVITY,
    cavities.DUCT,
    given.RESONATOR,
    given.GIVEN,
    panel_paths.RADIATION,
    panel_paths.NONRESONANT,
    junction_lines.LINE,
    resilient_lines.RESILIENT_LINE,
    point_links.POINT,
    point_links.MOUNT,
    leaks.LEAK,
    *excitations.EXCITATION_KINDS,
    *damping_forms.DAMPING_KINDS,
    plate_treatment.TREATMENT,
    edge_seal.EDGE_SEAL,
    *layers.LAYER_KINDS,
    *low_frequency.LOW_FREQUENCY_KINDS,
)

#: Kind names that were renamed, by family: old -> new (answered with "renamed to ...").
RENAMED: dict[str, dict[str, str]] = {"subsystem": dict(cavities.RENAMED)}


def by_family(family: str) -> dict[str, Kind]:
    """The kinds of one family by name, in :data:`KINDS` order."""
    return {k.name: k for k in KINDS if k.family == family}


SUBSYSTEM_KINDS = by_family("subsystem")
CONNECTION_KINDS = by_family("connection")
EXCITATION_KINDS = by_family("excitation")
DAMPING_KINDS = by_family("damping")
