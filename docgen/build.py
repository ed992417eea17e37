"""Build the outputs of one requirements file: results.json, plots, report.html, report.pdf."""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from .design import Design
from .errors import InfeasibleDesign
from .output import (
    output_lock,
    prepare_dir,
    remove_leftovers,
    remove_stale,
    safe_stem,
    write_atomic,
)
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
    removed: list[str] = field(default_factory=list)  # stale outputs of an earlier build


def design_for(spec_path: Path) -> Design:
    return run(load_requirements(spec_path))


DRAWN_AS = {"zener": "zener", "follower": "follower", "three-terminal": "three-terminal",
            "adjustable": "adjustable", "none": "none"}


def schematic_for(design: Design) -> str:
    """The circuit as drawn from the design's parts and values (SVG)."""
    from .schematic import OutputDrawing, SchematicDrawing, schematic_svg

    parts = {p.ref: p for p in design.parts}
    spec = design.requirements
    mains = spec.mains
    topology = spec.rectifier.topology

    def label(ref: str) -> str:
        p = parts[ref]
        return f"{p.value_text}" + (f" ({p.part_id})" if p.part_id else "")

    shared = {"T1", "F1", "R9", "R10", "BR1", "D1", "D3"}
    neg_refs = {"C2", "R2", "DZ2", "U2", "Q2", "R4", "R5"}
    outputs = []
    for out in spec.output:
        negative = out.polarity == "negative"
        refs = [r for r in parts if r not in shared and not r.startswith("HS")
                and ((r in neg_refs) == negative or topology != "split")]
        outputs.append(OutputDrawing(
            name=out.name, regulator=DRAWN_AS[out.regulator],
            polarity="-" if negative else "+", labels={r: label(r) for r in refs},
            v_out_text=f"{'-' if negative else ''}{out.voltage:g} V, "
                       f"{out.load_max * 1e3:g} mA"))
    if topology == "split":
        rect = f"D1-D4 {label('D1')}"
    elif topology == "bridge":
        rect = f"BR1 {label('BR1')}"
    else:
        rect = f"D1 {label('D1')}"
    drawing = SchematicDrawing(
        topology=topology,
        mains_text=f"{mains.nominal:g} V {mains.frequency:g} Hz",
        transformer=f"T1 {label('T1')}",
        fuse=f"F1 {label('F1')}" if "F1" in parts else "",
        bleeder=f"R9 {label('R9')}" if "R9" in parts else "",
        rectifier=rect,
        outputs=tuple(outputs),
    )
    return schematic_svg(drawing)


def draw_plots(design: Design) -> dict[str, str]:
    """Every figure of the report as SVG text, keyed by file stem."""
    from .plots import figure_svg, histogram_plot, waveform_plot

    v = design.values
    limits = {"v_out_hi": v["output.v_upper_limit"].value,
              "v_out_lo": v["output.v_lower_limit"].value}
    plots = {"schematic": schematic_for(design)}
    if "trough" in design.waveforms:
        plots["waveforms_trough"] = figure_svg(waveform_plot(
            design.waveforms["trough"],
            "Low line, full load, C at -tol, V_Z high, R +tol (the trough corner)",
            {**limits, "trough": v["reservoir.valley_low"].value}))
    if "nominal" in design.waveforms:
        plots["waveforms_nominal"] = figure_svg(waveform_plot(
            design.waveforms["nominal"], "Nominal mains, full load", limits))
    if "neg_trough" in design.waveforms:
        plots["waveforms_trough_neg"] = figure_svg(waveform_plot(
            design.waveforms["neg_trough"], "Negative rail: the trough corner (magnitudes)",
            {"v_out_hi": v["neg.output.v_upper_limit"].value,
             "v_out_lo": v["neg.output.v_lower_limit"].value}))
    if design.samples:
        candidates = [
            {"metric": "v_out_max", "title": "Highest output voltage", "unit": "V",
             "limits": ["output.v_upper_limit"]},
            {"metric": "v_out_pp", "title": "Output ripple", "unit": "mV", "scale": 1e3,
             "limits": ["output.ripple_max"]},
            {"metric": "p_zener", "title": "Zener dissipation", "unit": "W",
             "limits": ["zener.p_allowed"]},
            {"metric": "i_z_min", "title": "Zener current at the trough", "unit": "mA",
             "scale": 1e3, "limits": ["zener.i_min"]},
            {"metric": "t_j", "title": "Junction temperature", "unit": "degC",
             "limits": ["margins.t_j_design"]},
            {"metric": "v_c_min", "title": "Capacitor trough", "unit": "V",
             "limits": ["regulator.v_in_min_needed"]},
            {"metric": "i_sec_rms", "title": "Secondary RMS current", "unit": "mA",
             "scale": 1e3, "limits": []},
        ]
        panels = []
        for c in candidates:
            if c["metric"] in design.samples and all(i in v for i in c["limits"]):
                panels.append({**c, "limits": [v[i].value for i in c["limits"]]})
        plots["monte_carlo"] = figure_svg(histogram_plot(design.samples, panels[:4]))
    return plots


def build_one(spec_path: Path, out_root: Path, *, pdf: bool = True) -> BuildResult:
    """Build one spec into OUT/<stem>/ while holding the folder's lock; afterwards the folder
    holds this build's outputs only (stale ones of an earlier build are removed and named)."""
    loaded = load_requirements(spec_path)
    out_dir = out_root / safe_stem(spec_path)
    with output_lock(out_dir):
        remove_leftovers(out_dir)
        previous = _previous_outputs(out_dir)
        result = _build_into(loaded, spec_path, out_dir, pdf)
        result.removed = remove_stale(out_dir, result.files, previous)
    return result


def _previous_outputs(out_dir: Path) -> list[str]:
    from .incremental import read_stamp

    stamp = read_stamp(out_dir) or {}
    outputs = stamp.get("outputs")
    return list(outputs) if isinstance(outputs, dict) else []


def _build_into(loaded, spec_path: Path, out_dir: Path, pdf: bool) -> BuildResult:
    try:
        design = run(loaded)
    except InfeasibleDesign as exc:
        import json

        payload = {"status": "infeasible", "infeasible_reason": str(exc),
                   "spec_path": str(spec_path), "spec_sha256": loaded.sha256}
        target = out_dir / "results.json"
        write_atomic(target, json.dumps(payload, sort_keys=True, indent=1) + "\n")
        return BuildResult(spec_path, out_dir, "infeasible", [target], None, str(exc))

    from .render.html import render_html
    from .render.results_json import results_json

    plots = draw_plots(design)
    files: list[Path] = []
    results = results_json(design)
    html = render_html(design, plots)
    for name, svg in plots.items():
        prepare_dir(out_dir / "plots")
        target = out_dir / "plots" / f"{name}.svg"
        write_atomic(target, svg)
        files.append(target)
    from .render.bom import bom_csv

    for name, data in (("results.json", results), ("bom.csv", bom_csv(design)),
                       ("report.html", html)):
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
