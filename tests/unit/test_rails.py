"""Split supplies: the two rails' designs are merged field by field, none copied by accident."""

from __future__ import annotations

import dataclasses

from docgen.design import Design
from docgen.rails import MERGED_FIELDS, POS_REF_MAP, REF_MAP
from docgen.regulators import all_kinds


def test_every_design_field_is_merged_explicitly():
    assert set(MERGED_FIELDS) == {f.name for f in dataclasses.fields(Design)}


def test_negative_rail_designators_do_not_collide_with_the_positive_rail():
    for kind in all_kinds():
        rail = set(kind.refs) | {"C1"}
        positive = {POS_REF_MAP.get(r, r) for r in rail}
        negative = {REF_MAP.get(r, r) for r in rail}
        assert len(positive) == len(negative) == len(rail), kind.kind
        assert not positive & negative, kind.kind
