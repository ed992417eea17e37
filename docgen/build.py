"""Build the outputs of one requirements file: results.json, plots, report.html, report.pdf."""

from __future__ import annotations

import re
from dataclasses import dataclass
from pathlib import Path

from .design import Design
from .errors import InfeasibleDesign
from .output import prepare_dir, write_atomic
from .pipeline import run
from .spec import load_requirements


@dataclass
class BuildResult:
    spec: Path
    out_dir: Path
    status: str
    files: list[Path]
    design: Design | None
    reason: str = ""


def safe_stem(path: Path) -> str:
    """Output folder name from the spec file name; cannot climb out of the output folder."""
    stem = re.sub(r"[^A-Za-z0-9._-]+", "-", path.stem).strip(".-")
    return stem or "spec"


def design_for(spec_path: Path) -> Design:
    return run(load_requirements(spec_path))


def build_one(spec_path: Path, out_root: Path, *, pdf: bool = True) -> BuildResult:
    loaded = load_requirements(spec_path)
    out_dir = out_root / safe_stem(spec_path)
    try:
        design = run(loaded)
    except InfeasibleDesign as exc:
        prepare_dir(out_dir)
        import json

        payload = {"status": "infeasible", "infeasible_reason": str(exc),
                   "spec_path": str(spec_path), "spec_sha256": loaded.sha256}
        target = out_dir / "results.json"
        write_atomic(target, json.dumps(payload, sort_keys=True, indent=1) + "\n")
        return BuildResult(spec_path, out_dir, "infeasible", [target], None, str(exc))

    from .plots import capacitor_voltage_plot, figure_svg
    from .render.html import render_html
    from .render.results_json import results_json

    prepare_dir(out_dir)
    wave = design.waveforms["low_line_full_load"]
    fig = capacitor_voltage_plot(
        wave, "Low line, full load, C at its low tolerance",
        valley=design.values["reservoir.valley_low"].value,
        v_z=design.values["zener.v_max"].value)
    plots = {"capacitor_voltage": figure_svg(fig)}

    files: list[Path] = []
    results = results_json(design)
    html = render_html(design, plots)
    for name, svg in plots.items():
        prepare_dir(out_dir / "plots")
        target = out_dir / "plots" / f"{name}.svg"
        write_atomic(target, svg)
        files.append(target)
    for name, data in (("results.json", results), ("report.html", html)):
        write_atomic(out_dir / name, data)
        files.append(out_dir / name)
    if pdf:
        from .render.pdf import render_pdf

        pdf_bytes = render_pdf(
            html,
            {spec_path.name: design.spec_text.encode("utf-8"),
             "results.json": results.encode("utf-8")},
            title=design.requirements.project.title,
        )
        write_atomic(out_dir / "report.pdf", pdf_bytes)
        files.append(out_dir / "report.pdf")
    return BuildResult(spec_path, out_dir, design.status, files, design)
