"""The figures of a document: the schematic drawn from the design's parts, the waveforms and
the Monte Carlo histograms, each as SVG text keyed by file stem."""

from __future__ import annotations

from ..design import Design
from ..rails import REF_MAP
from ..regulators import regulator


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
    neg_refs = set(REF_MAP.values()) - shared
    outputs = []
    for out in spec.output:
        negative = out.polarity == "negative"
        refs = [r for r in parts if r not in shared and not r.startswith("HS")
                and ((r in neg_refs) == negative or topology != "split")]
        outputs.append(OutputDrawing(
            name=out.name, regulator=regulator(out.regulator).drawing,
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
            f"The trough corner: {design.waveforms['trough']['corner']}",
            {**limits, "trough": v["reservoir.valley_low"].value}))
    if "nominal" in design.waveforms:
        plots["waveforms_nominal"] = figure_svg(waveform_plot(
            design.waveforms["nominal"], f"Nominal corner: {design.waveforms['nominal']['corner']}",
            limits))
    if "neg_trough" in design.waveforms:
        plots["waveforms_trough_neg"] = figure_svg(waveform_plot(
            design.waveforms["neg_trough"],
            f"Negative rail, trough corner (magnitudes): {design.waveforms['neg_trough']['corner']}",
            {"v_out_hi": v["neg.output.v_upper_limit"].value,
             "v_out_lo": v["neg.output.v_lower_limit"].value}))
    if design.search_tradeoff:
        from .explore_plot import tradeoff_svg

        data = dict(design.search_tradeoff)
        plots["search_tradeoff"] = tradeoff_svg(data.pop("points"), data.pop("front"),
                                                data.pop("greedy"), data.pop("chosen"), **data)
    if design.samples:
        plots["monte_carlo"] = figure_svg(histogram_plot(design.samples,
                                                         histogram_panels(design)))
    return plots




# Histogram candidates: metric, title, unit (scale), the limit ids drawn and which side of them
# passes ("max": at or below, "min": at or above).
HISTOGRAMS = (
    {"metric": "v_out_max", "title": "Highest output voltage", "unit": "V",
     "limits": ["output.v_upper_limit"], "sense": "max"},
    {"metric": "v_out_pp", "title": "Output ripple", "unit": "mV", "scale": 1e3,
     "limits": ["output.ripple_max"], "sense": "max"},
    {"metric": "p_zener", "title": "Zener dissipation", "unit": "W",
     "limits": ["zener.p_allowed"], "sense": "max"},
    {"metric": "i_z_min", "title": "Zener current at the trough", "unit": "mA",
     "scale": 1e3, "limits": ["zener.i_min"], "sense": "min"},
    {"metric": "t_j", "title": "Junction temperature", "unit": "degC",
     "limits": ["margins.t_j_design"], "sense": "max"},
    {"metric": "v_c_min", "title": "Capacitor trough", "unit": "V",
     "limits": ["regulator.v_in_min_needed"], "sense": "min"},
    {"metric": "i_sec_rms", "title": "Secondary RMS current", "unit": "mA",
     "scale": 1e3, "limits": [], "sense": "max"},
)


def histogram_panels(design: Design) -> list[dict]:
    """The Monte Carlo panels this design shows (at most four), limits as numbers."""
    v = design.values
    panels = []
    for c in HISTOGRAMS:
        if c["metric"] in design.samples and all(i in v for i in c["limits"]):
            panels.append({**c, "limit_ids": list(c["limits"]),
                           "limits": [v[i].value for i in c["limits"]]})
    return panels[:4]
