"""Build the outputs of one requirements file: results.json, plots, report.html, report.pdf."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

from ..design import Design
from ..errors import InfeasibleDesign
from ..pipeline import run
from ..progress import stage
from ..spec import LoadedSpec, load_requirements
from .output import (
    output_lock,
    prepare_dir,
    remove_leftovers,
    remove_stale,
    safe_stem,
    write_atomic,
)


@dataclass
class BuildResult:
    spec: Path
    out_dir: Path
    status: str
    files: list[Path]
    design: Design | None
    reason: str = ""
    removed: list[str] = field(default_factory=list)  # stale outputs of an earlier build


def design_for(spec_path: Path) -> Design:
    return run(load_requirements(spec_path))


def build_one(spec_path: Path, out_root: Path, *, pdf: bool | str = True,
              design: Callable[[LoadedSpec], Design] = run) -> BuildResult:
    """Build one spec into OUT/<stem>/ while holding the folder's lock; afterwards the folder
    holds this build's outputs only (stale ones of an earlier build are removed and named).
    ``pdf``: True for the whole document, "body" for the body without its appendices (the
    HTML always has everything), False for no PDF. ``design`` makes the Design (the pipeline;
    docgen.explore gives the search's best)."""
    with stage("reading the requirements"):
        loaded = load_requirements(spec_path)
    out_dir = out_root / safe_stem(spec_path)
    with output_lock(out_dir):
        remove_leftovers(out_dir)
        previous = _previous_outputs(out_dir)
        result = _build_into(loaded, spec_path, out_dir, pdf, design)
        result.removed = remove_stale(out_dir, result.files, previous)
    return result


def _previous_outputs(out_dir: Path) -> list[str]:
    from .incremental import read_stamp

    stamp = read_stamp(out_dir) or {}
    outputs = stamp.get("outputs")
    return list(outputs) if isinstance(outputs, dict) else []


def _build_into(loaded, spec_path: Path, out_dir: Path, pdf: bool | str,
                make: Callable[[LoadedSpec], Design] = run) -> BuildResult:
    try:
        with stage("sizing, corners and Monte Carlo"):
            design = make(loaded)
    except InfeasibleDesign as exc:
        import json

        payload = {"status": "infeasible", "infeasible_reason": str(exc),
                   "spec_path": str(spec_path), "spec_sha256": loaded.sha256}
        target = out_dir / "results.json"
        write_atomic(target, json.dumps(payload, sort_keys=True, indent=1) + "\n")
        return BuildResult(spec_path, out_dir, "infeasible", [target], None, str(exc))

    from ..render.figures import draw_plots
    from ..render.html import render_html
    from ..render.results_json import results_json

    with stage("plots and schematic"):
        plots = draw_plots(design)
    files: list[Path] = []
    with stage("results.json and HTML"):
        results = results_json(design)
        html = render_html(design, plots)
    for name, svg in plots.items():
        prepare_dir(out_dir / "plots")
        target = out_dir / "plots" / f"{name}.svg"
        write_atomic(target, svg)
        files.append(target)
    from ..render.bom import BOM_CSV, STRESS_CSV, bom_csv, stress_csv

    for name, data in (("results.json", results), (BOM_CSV, bom_csv(design)),
                       (STRESS_CSV, stress_csv(design)), ("report.html", html)):
        write_atomic(out_dir / name, data)
        files.append(out_dir / name)
    if pdf:
        from ..render.pdf import render_pdf

        with stage("PDF (WeasyPrint layout and drawing)"):
            pdf_bytes = render_pdf(
                render_html(design, plots, medium="print", body_only=pdf == "body"),
                {spec_path.name: design.spec_text.encode("utf-8"),
                 "results.json": results.encode("utf-8")},
                title=design.requirements.project.title,
            )
        write_atomic(out_dir / "report.pdf", pdf_bytes)
        files.append(out_dir / "report.pdf")
    return BuildResult(spec_path, out_dir, design.status, files, design)
