"""Run the whole job for one requirements file: size -> verify at the corners -> check -> Design.

Sizing uses the hand formulas of the stages. The waveform engine then simulates every corner
(and the Monte Carlo samples); where a sized part falls short at some corner, a floor is raised
for that part, the reason recorded, and the design is sized again (at most MAX_PASSES times).
Fixed parts are never changed: their shortfall stays a failing check. This module only
orchestrates: the stages, the regulator kinds (docgen.regulators), the topologies
(docgen.topology) and the verification (docgen.verify) do the work.
"""

from __future__ import annotations

from collections.abc import Callable
from functools import partial
from typing import Any

from . import __version__
from .assumptions import design_assumptions, requirement_assumptions
from .cautions import STANDING, triggered_cautions
from .design import Design, Stage
from .errors import InfeasibleDesign, SpecError
from .parts.bom_lines import bom_lines
from .parts.location import library_for
from .regulators import all_kinds, regulator
from .spec import LoadedSpec
from .spec.requirements import Requirements
from .stages import (
    holdup,
    insulation,
    mains,
    margins,
    model,
    protection,
    rectifier,
    reservoir,
    transformer,
)
from .stages.context import SizingContext
from .topology import topology
from .trace import Ledger, TraceError
from .undefined import undefined_text
from .verify.checks import overall_status
from .verify.corners import analyse_together, corner_rows
from .verify.evaluate import engine_checks, protection_checks
from .verify.montecarlo import histogram_samples, summarise
from .verify.refine import raise_floors

MAX_PASSES = 8
# Check ids in the order the document lists them.
ALL_CHECK_IDS = list(dict.fromkeys(c.id for k in all_kinds() for c in k.engine_checks))


def _stages(reg) -> tuple[tuple[str, Callable[[SizingContext, Ledger], None]], ...]:
    """The sizing stages in order: (stage id, function)."""
    return (
        ("margins", margins.record_margins),
        ("mains", mains.size_mains),
        ("regulator_needs", reg.needs),
        ("transformer", transformer.size_transformer),
        ("reservoir", reservoir.size_reservoir),
        ("regulator", reg.size),
        ("model", model.model_circuit),
        ("rectifier", rectifier.size_rectifier),
        ("reservoir", reservoir.stored_energy_and_allowance),
        ("reservoir", holdup.estimate_holdup),
        ("insulation", insulation.record_insulation),
    )


def _stage_text(reg, n_corners: int) -> list[Stage]:
    return [
        Stage("margins", margins.TITLE, margins.INTRO),
        Stage("mains", mains.TITLE, mains.INTRO),
        Stage("regulator_needs", reg.needs_title, reg.needs_intro),
        Stage("transformer", transformer.TITLE, transformer.INTRO),
        Stage("reservoir", reservoir.TITLE, reservoir.INTRO),
        Stage("regulator", reg.title, reg.intro),
        Stage("model", model.TITLE, model.INTRO),
        Stage("rectifier", rectifier.TITLE, rectifier.INTRO),
        Stage("protection", protection.TITLE, protection.INTRO),
        Stage("insulation", insulation.TITLE, insulation.INTRO),
        Stage("corners", "Worst-case corners (waveform engine)",
              f"Each value below is the worst over the {n_corners} corners named in the "
              "worst-case section, from the waveform engine; the corner is given beside it."),
    ]


def _size(ctx: SizingContext, reg, L: Ledger | None = None) -> Ledger:
    L = Ledger() if L is None else L
    for stage_id, fn in _stages(reg):
        L.stage = stage_id
        fn(ctx, L)
    return L


def _guarded(fn: Callable[[], Any]) -> Any:
    try:
        return fn()
    except (TraceError, ArithmeticError, ValueError) as exc:
        if isinstance(exc, SpecError):
            raise
        # Requirements that pass validation can still be physically contradictory in a way
        # that surfaces as a non-finite or undefined value; never report such numbers.
        raise InfeasibleDesign(undefined_text(exc)) from None


def size_pass(ctx: SizingContext, reg) -> Ledger:
    """One sizing pass with the floors ``ctx`` holds (public for the design-space search, which
    sizes many candidates and verifies them together: docgen.explore). An InfeasibleDesign it
    raises names the sizing stage that found it (``stage``)."""
    ctx.picks.clear()
    ctx.conflicts.clear()
    L = Ledger()
    try:
        return _guarded(partial(_size, ctx, reg, L))
    except InfeasibleDesign as exc:
        exc.stage = L.stage  # the stage that found it: the search reuses the verdict
        raise


def run(loaded: LoadedSpec, *, samples: int | None = None) -> Design:
    """Size, verify, check and collect everything for one loaded requirements file.

    ``samples`` overrides the Monte Carlo sample count of the file (0 turns it off).
    Raises InfeasibleDesign when no design of the chosen kind meets the requirements.
    """
    library = library_for(loaded)  # confined to the project: docgen.parts.location
    if loaded.requirements.rectifier.topology == "split":
        from .rails import run_split

        return run_split(loaded, library, samples, run_rails, rails_values)
    return run_rail(loaded, loaded.requirements, library, samples)


def _settle(loaded: LoadedSpec, specs: list[Requirements], library, shared: str) -> list:
    """Size and verify at the corners until no floor is raised, for each rail of ``specs``:
    (ctx, ledger, corners, kind) per rail. The rails' corner runs of each pass go through the
    engine in one call."""
    steps = [_settle_steps(loaded, spec, library, shared) for spec in specs]
    done: list = [None] * len(steps)
    pending = {k: next(step) for k, step in enumerate(steps)}
    while pending:
        found = _guarded(partial(analyse_together, list(pending.values())))
        waiting, pending = pending, {}
        for k, cr in zip(waiting, found, strict=True):
            try:
                pending[k] = steps[k].send(cr)
            except StopIteration as end:
                done[k] = end.value
    return done


def _settle_steps(loaded: LoadedSpec, spec: Requirements, library, shared: str):
    """One rail's sizing passes; yields each pass's corner job, receives its CornerResult."""
    ctx = SizingContext(spec=spec, spec_path=str(loaded.path), library=library,
                        shared_transformer=shared)
    reg = regulator(spec.output[0].regulator)
    for _ in range(MAX_PASSES):
        ctx.picks.clear()
        ctx.conflicts.clear()
        L = _guarded(partial(_size, ctx, reg))
        cr = yield _job(spec, L, reg, samples=0, surge=False)
        if not raise_floors(ctx, L, cr, reg):
            break
    return ctx, L, cr, reg


def _job(spec: Requirements, L: Ledger, reg, *, samples: int, surge: bool = True) -> dict:
    """The arguments of verify.corners.analyse for one rail."""
    env = spec.environment
    return dict(L=L, topology=spec.rectifier.topology, seed=spec.analysis.seed,
                t_min=env.ambient_min, t_max=env.ambient_max, reg=reg, samples=samples,
                surge=surge)


def rails_values(loaded: LoadedSpec, specs: list[Requirements], library) -> list[dict]:
    """The settled sizing and worst-corner engine figures of each rail, without the Monte Carlo
    run, the switch-on surge or the document: what a split supply needs to choose the
    transformer both rails share."""
    out = []
    for ctx, L, cr, reg in _settle(loaded, specs, library, ""):
        engine_checks(ctx, L, cr, reg)
        out.append(dict(L.values))
    return out


def run_rail(loaded: LoadedSpec, spec: Requirements, library, samples: int | None, *,
             shared: str = "") -> Design:
    """One rail: a single output fed by its own rectifier and reservoir. ``shared`` says why
    the transformer in ``spec`` was chosen for both rails of a split supply (empty otherwise)."""
    return run_rails(loaded, [spec], library, samples, shared=shared)[0]


def run_rails(loaded: LoadedSpec, specs: list[Requirements], library, samples: int | None, *,
              shared: str = "") -> list[Design]:
    """Rails of one file (each a single output, see run_rail), each sized on its own; each
    engine run (every sizing pass's corners, the final corners and Monte Carlo samples) of all
    of them is one call."""
    settled = _settle(loaded, specs, library, shared)
    jobs = [_job(spec, L, reg, samples=spec.analysis.samples if samples is None else samples)
            for spec, (_, L, _, reg) in zip(specs, settled, strict=True)]
    # Final run with the Monte Carlo samples and the switch-on surge on the settled designs.
    results = _guarded(partial(analyse_together, jobs))
    return [_document(loaded, spec, ctx, L, cr, reg)
            for spec, (ctx, L, _, reg), cr in zip(specs, settled, results, strict=True)]


def _document(loaded: LoadedSpec, spec: Requirements, ctx: SizingContext, L: Ledger, cr,
              reg) -> Design:
    """Checks, cautions, parts and texts of one settled, verified rail."""
    checks = engine_checks(ctx, L, cr, reg)
    checks += _guarded(partial(protection_checks, ctx, L, cr))
    checks.sort(key=lambda c: ALL_CHECK_IDS.index(c.id) if c.id in ALL_CHECK_IDS else 100)
    topo = topology(spec.rectifier.topology)
    cautions = list(STANDING) + triggered_cautions(
        L["reservoir.v_max"], L["transformer.v_winding_high_nl"], L["reservoir.energy"], checks,
        topology=topo,
        dual_frequency=((spec.mains.frequency, spec.mains.also_frequency)
                        if spec.mains.also_frequency else None))
    cautions += reg.cautions(L)
    return Design(
        spec_path=str(loaded.path),
        spec_text=loaded.text,
        spec_sha256=loaded.sha256,
        requirements=spec,
        stages=_stage_text(reg, cr.n_corners),
        values=dict(L.values),
        equations=dict(L.equations),
        checks=checks,
        parts=bom_lines(ctx, L, reg),
        assumptions=design_assumptions(reg, cr.n_corners, ctx.floors.reasons, ctx.conflicts,
                                       L)
        + requirement_assumptions(spec, reg),
        cautions=cautions,
        status=overall_status(checks),
        tool_version=__version__,
        waveforms=cr.waveforms,
        corners=corner_rows(cr),
        monte_carlo=summarise(L, cr, reg.engine_checks, spec.analysis.seed),
        samples=histogram_samples(cr),
        library=(str(ctx.library.path), ctx.library.sha256) if ctx.library else None,
    )
