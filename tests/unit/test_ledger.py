"""The ledger is checkable: every stage writes only the ids it declares, every id is written
before any stage reads it, and the template and the HTML context read only ids that exist."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from docgen import pipeline
from docgen.parts.location import library_for
from docgen.regulators import regulator
from docgen.spec import load_requirements
from docgen.stages import (
    insulation,
    mains,
    margins,
    model,
    protection,
    rectifier,
    reservoir,
    transformer,
)
from docgen.stages.context import SizingContext
from docgen.verify import evaluate

from ..conftest import ROOT
from ..golden.snapshot import SPECS

STAGE_WRITES = {"margins": margins.WRITES, "mains": mains.WRITES,
                "transformer": transformer.WRITES, "reservoir": reservoir.WRITES,
                "model": model.WRITES, "rectifier": rectifier.WRITES,
                "protection": protection.WRITES, "corners": evaluate.WRITES,
                "insulation": insulation.WRITES}
SINGLE_RAIL = [s for s in SPECS if "split" not in s.stem]


def _declared(stage: str, kind: str) -> tuple[str, ...]:
    if stage in ("regulator_needs", "regulator"):
        return regulator(kind).writes
    return STAGE_WRITES[stage]


@pytest.fixture(scope="module")
def designs():
    return {s.stem: pipeline.run(load_requirements(s)) for s in SPECS}


@pytest.mark.parametrize("spec", SINGLE_RAIL, ids=[s.stem for s in SINGLE_RAIL])
def test_every_stage_writes_only_what_it_declares(spec, designs):
    design = designs[spec.stem]
    kind = design.requirements.output[0].regulator
    for v in design.values.values():
        assert v.id.startswith(_declared(v.stage, kind)), (v.stage, v.id)


@pytest.mark.parametrize("spec", SINGLE_RAIL, ids=[s.stem for s in SINGLE_RAIL])
def test_every_id_is_written_before_it_is_read(spec):
    loaded = load_requirements(spec)
    reg = regulator(loaded.requirements.output[0].regulator)
    ctx = SizingContext(spec=loaded.requirements, spec_path=str(spec),
                        library=library_for(loaded))
    L = pipeline._size(ctx, reg)
    order = {vid: k for k, vid in enumerate(L.values)}
    stage_of = {vid: v.stage for vid, v in L.values.items()}
    stages = [sid for sid, _ in pipeline._stages(reg)]
    assert L.reads, "the ledger recorded no reads"
    for reader, vid in L.reads:
        assert vid in order, f"{reader} read {vid}, which no stage wrote"
        # the value's stage comes no later than the reader's (same stage: written earlier)
        assert stages.index(stage_of[vid]) <= max(
            i for i, s in enumerate(stages) if s == reader), (reader, vid)


def _report_templates() -> str:
    """The report's template and the section files it includes."""
    files = sorted((ROOT / "templates").glob("*.j2"))
    return "\n".join(p.read_text(encoding="utf-8") for p in files if p.name != "diff.html.j2")


def _template_ids() -> set[str]:
    return set(re.findall(r'values\["([a-z_.]+)"\]', _report_templates()))


def test_template_reads_only_ids_that_exist(designs):
    written = set().union(*(d.values for d in designs.values()))
    ids = _template_ids()
    assert ids, "no value ids found in the template"
    assert ids <= written, sorted(ids - written)
    text = _report_templates()
    for vid in ids:  # an id only some designs have must be guarded in the template
        if not all(vid in d.values for d in designs.values()):
            assert f'"{vid}" in values' in text, vid


def test_html_context_key_values_exist(designs):
    source = Path(ROOT / "docgen" / "render" / "html.py").read_text(encoding="utf-8")
    block = source[source.index("key_ids = ["):source.index("]", source.index("key_ids = ["))]
    ids = set(re.findall(r'"([a-z_]+\.[a-z_]+)"', block))
    written = set().union(*(d.values for d in designs.values()))
    assert ids and ids <= written, sorted(ids - written)
