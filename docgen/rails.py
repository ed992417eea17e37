"""Split supplies: a bridge on a center-tapped winding feeding a positive and a negative rail.

Each rail is a center-tap full-wave rectifier of its half winding with its own reservoir and
regulator, so each is sized and verified by the single-rail pipeline. The transformer is shared:
after a first pass it is chosen for the larger half-winding voltage and for the combined winding
current (each half winding carries the positive rail's pulses in one half-cycle and the negative
rail's in the other, so the RMS currents add in quadrature), and both rails are run again with it.
The two results are merged into one Design; the negative rail's values carry the prefix "neg.".
"""

from __future__ import annotations

import dataclasses
import math

from . import equations as eq
from . import standards
from .design import Check, Design, Stage
from .errors import InfeasibleDesign
from .spec import LoadedSpec
from .spec.requirements import Requirements
from .trace import Assumption, Ledger
from .verify.checks import make_check, overall_status

NEG = "neg."
# Designators of the negative rail (the positive rail keeps the single-rail ones).
REF_MAP = {"C1": "C2", "R1": "R2", "DZ1": "DZ2", "U1": "U2", "Q1": "Q2", "HS1": "HS3",
           "HS2": "HS4", "R2": "R4", "R3": "R5", "D1": "D3", "R9": "R10", "C2": "C5",
           "C3": "C6"}
# Designators of the positive rail that a single rail would share with the negative rail's
# reservoir C2: the regulator's input and output capacitors move up.
POS_REF_MAP = {"C2": "C3", "C3": "C4"}

SPLIT_ASSUMPTION = Assumption(
    "assume.split",
    "Each rail is simulated as a center-tap full-wave rectifier of its half winding. The two "
    "rails charge in the same half-cycles through the shared primary; the extra primary drop "
    "this causes is not coupled between the rails in the model (the winding resistance of each "
    "half comes from the transformer's regulation).",
    "docgen model; common practice",
)


def _rail_spec(spec: Requirements, index: int, transformer=None) -> Requirements:
    rect = spec.rectifier.model_copy(update={"topology": "center-tap"})
    update = {"rectifier": rect, "output": [spec.output[index]]}
    if transformer is not None:
        update["transformer"] = transformer
    return spec.model_copy(update=update)


def _shared_transformer(spec: Requirements, a: dict, b: dict, library):
    """A transformer both rails can share: the larger half voltage, the combined current.
    ``a`` and ``b``: the values of each rail sized on its own."""
    t = spec.transformer
    band = spec.margins.warn_band
    v = max(a["transformer.v_rated"].value, b["transformer.v_rated"].value)
    i_tot = math.hypot(a["engine.transformer_current"].value,
                       b["engine.transformer_current"].value)
    # VA needed at the highest ambient (derated); a standard step is divided by the default
    # derating, a library part's own derating applies in the selection
    va_need = max(v * i_tot / (1 - band), a["transformer.va_allowed"].value,
                  b["transformer.va_allowed"].value)
    if library is not None:
        from .parts.select import select_transformer

        sel = select_transformer(library.transformers, secondary_voltage=v / 2, va=va_need,
                                 center_tapped=True, primary_voltage=spec.mains.nominal,
                                 ambient_c=spec.environment.ambient_max)
        if sel.part is None:
            raise InfeasibleDesign(f"no transformer in the parts library can feed both rails: "
                                   f"{sel.reason}")
        return t.model_copy(update={"part": sel.part.id})
    from .parts import ambient

    k = ambient.ambient_factor(spec.environment.ambient_max, ambient.DEFAULT_RATED_AMBIENT,
                               ambient.CLASS_TEMPERATURE[ambient.DEFAULT_CLASS])
    try:
        va = standards.next_at_or_above(va_need / k, standards.TRANSFORMER_VA)
    except standards.NoStandardValue:
        raise InfeasibleDesign(f"both rails together need {va_need:.0f} VA, above the largest "
                               "standard transformer") from None
    return t.model_copy(update={"secondary": v, "va": va,
                                "regulation": standards.typical_regulation(va)})


def _prefixed(tv, stage_prefix: str = "neg:"):
    return dataclasses.replace(tv, id=NEG + tv.id, inputs=tuple(NEG + i for i in tv.inputs),
                               stage=stage_prefix + tv.stage)


def _check_neg(c: Check) -> Check:
    return dataclasses.replace(c, id=NEG + c.id, title="(- rail) " + c.title,
                               value_id=NEG + c.value_id, limit_id=NEG + c.limit_id,
                               ref=REF_MAP.get(c.ref, c.ref))


def run_split(loaded: LoadedSpec, library, samples: int | None, run_rails, rails_values
              ) -> Design:
    """Both rails of a split supply, sized and verified by ``run_rails`` (the single-rail
    pipeline, passed in so that this module does not import it; the final engine run of both
    rails is one call). Unless the file fixes the
    transformer, ``rails_values`` first sizes each rail on its own (corners only: no Monte Carlo,
    no switch-on run, no document) to choose the transformer both share; the two rails' corner
    runs are one engine call in each sizing pass."""
    spec = loaded.requirements
    ipos = next(i for i, o in enumerate(spec.output) if o.polarity == "positive")
    ineg = 1 - ipos
    fixed = bool(spec.transformer.part) or spec.transformer.secondary is not None
    if fixed:
        shared = spec.transformer
    else:
        alone = rails_values(loaded, [_rail_spec(spec, ipos), _rail_spec(spec, ineg)], library)
        shared = _shared_transformer(spec, *alone, library)
    # A transformer docgen chose for both rails is passed to each rail as a sized one, never
    # as if the file had named it.
    note = "" if fixed else ("chosen for both rails: the larger half-winding voltage, the "
                             "combined current")
    a, b = run_rails(loaded, [_rail_spec(spec, ipos, shared), _rail_spec(spec, ineg, shared)],
                     library, samples, shared=note)
    return _merge(loaded, spec, a, b, library)


def _worst_corner(d: Design) -> str:
    return next(c.corner for c in d.checks if c.id == "check.transformer_current")


def _fuse_seed(a: Design, b: Design) -> dict:
    """Values the shared fuse is sized from: every value of the positive rail except its own
    fuse sizing, and the negative rail's fuse inputs (prefixed)."""
    from .stages.protection import SPLIT_INPUTS

    seed = {k: v for k, v in a.values.items()
            if not k.startswith("fuse.") or k in SPLIT_INPUTS}
    seed.update({NEG + k: _prefixed(v) for k, v in b.values.items() if k in SPLIT_INPUTS})
    return seed


def _drop_rail_fuse(values: dict) -> dict:
    from .stages.protection import SPLIT_INPUTS

    return {k: v for k, v in values.items() if not k.startswith("fuse.") or k in SPLIT_INPUTS}


def _merge(loaded: LoadedSpec, spec: Requirements, a: Design, b: Design, library=None
           ) -> Design:
    from .parts.bom_lines import fuse_line
    from .stages.context import SizingContext
    from .stages.protection import size_split_fuse
    from .verify.evaluate import fuse_surge_check, fuse_voltage_check

    L = Ledger(values=_fuse_seed(a, b))
    seeded = set(L.values)
    L.stage = "split"
    L.given("split.i_pos", r"I_{+}", a.values["engine.transformer_current"].value, "A",
            "Half-winding RMS current from the positive rail (engine)",
            source=f"positive rail, worst corner: {_worst_corner(a)}")
    L.given("split.i_neg", r"I_{-}", b.values["engine.transformer_current"].value, "A",
            "Half-winding RMS current from the negative rail (engine)",
            source=f"negative rail, worst corner: {_worst_corner(b)}")
    L.calc("split.i_sec_rms", eq.RSS, r"I_{half,rms}", "A",
           "Half-winding RMS current, both rails", {"a": "split.i_pos", "b": "split.i_neg"},
           lambda a, b: math.hypot(a, b))
    L.given("split.i_rated", r"I_{rated}", a.values["transformer.i_allowed"].value, "A",
            "Rated half-winding current of the shared transformer, derated for the ambient",
            source="transformer rating (VA / whole winding voltage) times the ambient derating")
    combined = make_check(L, "check.transformer_current", "Half-winding RMS current (both "
                          "rails) <= rated current derated for the ambient",
                          "split.i_sec_rms", "split.i_rated", "max",
                          "each rail at its worst corner", spec.margins.warn_band,
                          ref="T1")
    # One fuse in the shared primary, sized from both rails.
    ctx = SizingContext(spec=spec, spec_path=str(loaded.path), library=library)
    L.stage = "protection"
    size_split_fuse(ctx, L)
    w = spec.margins.warn_band
    fuse_checks = [make_check(L, "check.fuse_operating", "Fuse rating >= k_F x operating primary "
                              "current (both rails)", "fuse.i_pri_margin", "fuse.rating", "max",
                              "nominal mains, full load on both rails", w, ref="F1",
                              requirement="protection.fuse_factor"),
                   fuse_surge_check(L, w), *fuse_voltage_check(L, w)]
    values = _drop_rail_fuse(a.values)
    values.update({k: v for k, v in L.values.items() if k not in seeded})
    values.update({NEG + k: _prefixed(v) for k, v in _drop_rail_fuse(b.values).items()})
    rail_only = ("check.transformer_current", "check.fuse_operating", "check.fuse_surge",
                 "check.fuse_voltage")
    checks = [dataclasses.replace(c, title="(+ rail) " + c.title) for c in a.checks
              if c.id not in rail_only]
    checks.append(combined)
    checks += fuse_checks
    checks += [_check_neg(c) for c in b.checks if c.id not in rail_only]
    stages = [s for s in a.stages]
    stages.insert(1, Stage("split", "Shared transformer of the split supply",
                           "Both rails draw from the same center-tapped winding: each half "
                           "carries the positive rail's charging pulses in one half-cycle and "
                           "the negative rail's in the other, so their RMS currents add in "
                           "quadrature."))
    # The negative rail's stages follow in full, so every input a calculation links to has
    # its place in the document.
    stages += [Stage("neg:" + s.id, "Negative rail: " + s.title, s.intro) for s in b.stages]
    parts = [fuse_line(ctx, L) if p.ref == "F1" else
             dataclasses.replace(p, ref=POS_REF_MAP.get(p.ref, p.ref),
                                 description=p.description + " (positive rail)")
             if p.ref != "T1" else p for p in a.parts]
    parts += [dataclasses.replace(p, ref=REF_MAP.get(p.ref, p.ref),
                                  description=p.description + " (negative rail)",
                                  value_ids=tuple(NEG + i for i in p.value_ids))
              for p in b.parts if p.ref not in ("T1", "F1")]
    # Cautions of both rails once each; the rating cautions are written again from the merged
    # checks, so each part (U1 and U2 alike) gets its own under its own designator.
    from .cautions import rating_cautions

    seen: set[str] = set()
    cautions = []
    for c in a.cautions + b.cautions:
        if c.id not in seen and not c.id.startswith("caution.near_rating."):
            seen.add(c.id)
            cautions.append(c)
    cautions += rating_cautions(checks)
    assumptions = list(a.assumptions) + [SPLIT_ASSUMPTION] + [
        dataclasses.replace(x, id=NEG + x.id, text="Negative rail: " + x.text)
        for x in b.assumptions if x.id.startswith("assume.raised.")
        or (x.id == "assume.diode_model" and x not in a.assumptions)]
    waveforms = dict(a.waveforms)
    waveforms.update({"neg_" + k: v for k, v in b.waveforms.items()})
    corners = [{**r, "name": "+ rail: " + r["name"]} for r in a.corners]
    corners += [{**r, "name": "- rail: " + r["name"]} for r in b.corners]
    monte_carlo = dict(a.monte_carlo)
    if b.monte_carlo:
        monte_carlo["negative_rail"] = b.monte_carlo
    merged = {
        "spec_path": str(loaded.path),
        "spec_text": a.spec_text,  # both rails read the same file
        "spec_sha256": a.spec_sha256,
        "requirements": spec,
        "stages": stages,
        "values": values,
        "equations": {**a.equations, **b.equations, **L.equations},
        "checks": checks,
        "parts": parts,
        "assumptions": assumptions,
        "cautions": cautions,
        "status": overall_status(checks),
        "infeasible_reason": "",
        "waveforms": waveforms,
        "corners": corners,
        "monte_carlo": monte_carlo,
        "samples": a.samples,  # the histograms show the positive rail; the negative rail's
                               # Monte Carlo summary is in monte_carlo["negative_rail"]
        "library": a.library,
        "tool_version": a.tool_version,
        "search_tradeoff": None,  # the search handles single-rail supplies only
    }
    return Design(**{name: merged[name] for name in MERGED_FIELDS})


# Every field of Design, each merged explicitly above; a test fails when a field is added to
# Design and not here.
MERGED_FIELDS = ("spec_path", "spec_text", "spec_sha256", "requirements", "stages", "values",
                 "equations", "checks", "parts", "assumptions", "cautions", "status",
                 "infeasible_reason", "waveforms", "corners", "monte_carlo", "samples",
                 "library", "tool_version", "search_tradeoff")
