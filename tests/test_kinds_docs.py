"""The key tables of docs/model-format.md are generated from the kinds' declarations:
every declared kind has its table and no table is stale (regenerate with
``python -m seatool.kinds.docs``)."""

from __future__ import annotations

from seatool.kinds import docs
from seatool.kinds.params import Kind, Param
from seatool.kinds.registry import KINDS


def test_every_kind_is_documented_and_tables_are_current():
    text = docs.DOC.read_text(encoding="utf-8")
    assert docs.missing_blocks(text) == []
    assert docs.update(text) == text, "stale key tables: run python -m seatool.kinds.docs"


def test_a_new_parameter_makes_the_tables_stale(monkeypatch):
    # the check can fail: a parameter added to a declaration changes the generated table
    text = docs.DOC.read_text(encoding="utf-8")
    plate = next(k for k in KINDS if k.name == "plate")
    extra = Kind(plate.family, plate.name, plate.doc, (*plate.params, Param("x", unit="m")), plate.derive)
    monkeypatch.setattr(docs, "KINDS", tuple(extra if k is plate else k for k in KINDS))
    assert docs.update(text) != text


def test_an_undocumented_kind_is_reported(monkeypatch):
    text = docs.DOC.read_text(encoding="utf-8")
    new = Kind("connection", "undocumented_example", "test", (Param("length", unit="m"),), lambda *a: None)
    monkeypatch.setattr(docs, "KINDS", (*KINDS, new))
    assert docs.missing_blocks(text) == [("connection", "undocumented_example")]


def test_declarations_are_well_formed():
    # every parameter has a meaning; numeric parameters state a unit or are dimensionless
    # by name (loss factors, ratios, counts); bounds are ordered
    for k in KINDS:
        assert k.doc, k.name
        # every derived connection kind says over what it couples (point, line, area)
        assert k.family != "connection" or k.name == "given" or k.extent, k.name
        for p in k.params:
            assert p.doc, (k.name, p.name)
            if p.bounds is not None:
                assert p.bounds[0] <= p.bounds[1], (k.name, p.name)
            if p.typical is not None and p.bounds is not None:
                assert p.bounds[0] <= p.typical[0] <= p.typical[1] <= p.bounds[1], (k.name, p.name)
