"""Design -> one self-contained HTML file (Jinja templates, formulas and plots as data URIs)."""

from __future__ import annotations

import base64
import re
import secrets
from functools import lru_cache
from importlib import resources
from typing import Any

from jinja2 import pass_context

from ..design import Design
from ..trace import TracedValue
from ..verify.stresses import pairs as initial_vs_verified
from . import filters
from .bom import bom_rows
from .derivation import chains, trace_matrix
from .mathsvg import formula_data_uri
from .netlist import netlist
from .results_json import insulation_facts
from .review import check_table, decisions, is_split, open_points, rail_names, stress_table
from .signoff import revision_history, signoff_rows
from .sources import Citations, basis_word
from .summary import summary_notes


@lru_cache(maxsize=1)
def environment():
    import jinja2

    env = jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(resources.files("docgen.templates"))),
        autoescape=True,  # every text from a file is escaped
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
    )
    env.filters.update(math=_math_tag, qty=filters.qty, pct=filters.pct, status_word=filters.status_word,
                       anchor=filters.anchor, unit_text=filters.unit_text,
                       formula_text=filters.formula_text)
    return env


# The same report is rendered for two media. "screen" (report.html): formulas as MathML, which
# is text (selectable, searchable, a few hundred bytes, drawn in the page's own colour so it
# stays readable in dark mode). "print" (the PDF): WeasyPrint has no MathML, so formulas are
# typeset SVG pictures (docgen.render.mathsvg) with the formula as readable alternative text.
MEDIA = ("screen", "print")


@lru_cache(maxsize=4096)
def _mathml(latex: str) -> str | None:
    try:
        from latex2mathml.converter import convert
    except ImportError:  # pragma: no cover - a dependency; the pictures still work
        return None
    try:
        return convert(latex)
    except Exception:  # a construct the converter does not know: fall back to the picture
        return None


@pass_context
def _math_tag(ctx, latex: str):
    from markupsafe import Markup, escape

    text = filters.formula_text(latex)
    if ctx.get("medium") == "screen":
        mathml = _mathml(latex)
        if mathml is not None:
            return Markup(mathml.replace("<math ", f'<math alttext="{escape(text)}" ', 1))
    slots = ctx.get("formula_slots")
    if slots is not None:
        # Typeset after rendering, in one batch, only the formulas the document shows.
        slots["latex"].append(latex)
        return Markup(f"{slots['mark']}{len(slots['latex']) - 1}@")
    return _picture_tag(latex)


def _picture_tag(latex: str) -> str:
    from markupsafe import escape

    uri, w, h = formula_data_uri(latex)
    return (f'<img class="math" src="{uri}" style="width: {w:.1f}pt; height: {h:.1f}pt" '
            f'alt="{escape(filters.formula_text(latex))}">')


def _svg_uri(svg: str) -> str:
    return "data:image/svg+xml;base64," + base64.b64encode(svg.encode("utf-8")).decode("ascii")


def _requirement_ancestors(design: Design, value_id: str, seen: set[str]) -> tuple[set, set]:
    """Given-value ids and equation ids that a value depends on."""
    givens: set[str] = set()
    eqs: set[str] = set()
    stack = [value_id]
    while stack:
        vid = stack.pop()
        if vid in seen:
            continue
        seen.add(vid)
        v = design.values[vid]
        if v.equation in ("given", "default"):
            givens.add(vid)
        else:
            eqs.add(v.equation)
            stack.extend(v.inputs)
    return givens, eqs


def traceability(design: Design) -> list[dict[str, Any]]:
    rows: dict[str, dict[str, Any]] = {}
    for check in design.checks:
        for vid in (check.value_id, check.limit_id):
            givens, eqs = _requirement_ancestors(design, vid, set())
            for g in givens:
                row = rows.setdefault(g, {"value": design.values[g], "equations": set(),
                                          "checks": set()})
                row["equations"] |= eqs
                row["checks"].add(check.id)
    ordered = [rows[k] for k in design.values if k in rows]
    for row in ordered:
        row["equations"] = sorted(row["equations"])
        row["checks"] = sorted(row["checks"])
    return ordered


FIGURES = {
    "schematic": ("schematic", "Circuit drawn from the design: designators, values and library "
                  "part ids as chosen."),
    "waveforms_trough": ("waveforms", "Trough corner: {corner}. Secondary voltage and current, "
                         "capacitor voltage, one diode's current pulses, output voltage."),
    "waveforms_nominal": ("waveforms", "Nominal corner: {corner}."),
    "waveforms_trough_neg": ("waveforms", "Negative rail at its trough corner ({corner}), shown "
                             "as magnitudes."),
    "search_tradeoff": ("decisions", "Design-space search: every verified candidate's part cost "
                        "against its worst-case heat; the Pareto front, the greedy design and "
                        "the chosen one are marked."),
    "monte_carlo": ("monte-carlo", "Monte Carlo distributions; dashed lines are the limits."),
}
# The waveform each figure shows (its corner names the caption's).
FIGURE_WAVES = {"waveforms_trough": "trough", "waveforms_nominal": "nominal",
                "waveforms_trough_neg": "neg_trough"}
# Columns of the corner table: engine metric, symbol, unit; a column is shown only when the
# kind has the figure at some corner (no empty zener columns for a series regulator).
CORNER_COLUMNS = (
    ("v_c_min", r"V_{C,min}", "V"), ("v_out_min", r"V_{out,min}", "V"),
    ("v_out_max", r"V_{out,max}", "V"), ("v_out_pp", r"V_{r,out}", "V"),
    ("i_z_min", r"I_{Z,min}", "A"), ("p_zener", r"P_Z", "W"), ("p_r_series", r"P_R", "W"),
    ("i_sec_rms", r"I_{sec,rms}", "A"), ("i_c_rms", r"I_{C,rms}", "A"),
)


def _caption(design: Design, name: str, text: str) -> str:
    wave = design.waveforms.get(FIGURE_WAVES.get(name, ""), {})
    return text.format(corner=wave.get("corner", "")) if "{corner}" in text else text


def corner_columns(design: Design) -> list[dict[str, str]]:
    return [{"key": k, "symbol": sym, "unit": unit} for k, sym, unit in CORNER_COLUMNS
            if any(r.get(k) is not None for r in design.corners)]


MC_QUANTITIES = {
    "v_out_mean": ("Output voltage (mean)", "V"),
    "v_out_pp": ("Output ripple", "V"),
    "i_z_min": ("Zener current at the trough", "A"),
    "p_zener": ("Zener dissipation", "W"),
    "p_r_series": ("Series-resistor dissipation", "W"),
    "i_sec_rms": ("Secondary RMS current", "A"),
    "i_c_rms": ("Capacitor ripple current", "A"),
    "v_c_min": ("Capacitor trough voltage", "V"),
}


def _citations(design: Design) -> tuple[Citations, dict[str, Any]]:
    """References numbered by first use: the body's cautions and assumptions, then the
    derivations and the equation catalogue of the appendices."""
    cite = Citations()
    cited = {
        "cautions": {c.id: cite.cite(c.source) for c in design.cautions},
        "assumptions": {a.id: cite.cite(a.source) for a in design.assumptions},
    }
    cited["chains"] = chains(design, cite)
    cited["equations"] = {e.id: {"refs": cite.cite(e.source), "basis": basis_word(e.source)}
                          for e in design.equations.values()}
    return cite, cited


def context(design: Design, plots: dict[str, str], body_only: bool = False) -> dict[str, Any]:
    spec = design.requirements
    values: list[TracedValue] = list(design.values.values())
    by_stage: dict[str, list[dict[str, Any]]] = {}
    verified = initial_vs_verified(design.values)
    for v in values:
        item = {
            "verified": verified.get(v.id),
            "v": v,
            "anchor": filters.anchor(v.id),
            "computed": bool(v.latex),
            "inputs": [{"id": i, "anchor": filters.anchor(i), "title": design.values[i].title}
                       for i in v.inputs],
            "equation": design.equations.get(v.equation),
        }
        by_stage.setdefault(v.stage, []).append(item)
    stages = [
        {"stage": s, "entries": by_stage.get(s.id, [])} for s in design.stages
    ]
    inputs = [v for v in values if v.equation in ("given", "default")]
    checks_sorted = sorted(design.checks,
                           key=lambda c: ({"fail": 0, "warn": 1, "pass": 2}[c.status], c.margin))
    sources = sorted({e.source for e in design.equations.values()})
    key_ids = ["transformer.v_rated", "transformer.va", "reservoir.c", "reservoir.v_rating",
               "zener.r", "zener.p_rating", "engine.output_ripple", "engine.transistor_power",
               "engine.regulator_power", "engine.zener_power", "engine.resistor_power",
               "engine.transformer_current", "engine.va_nominal", "engine.efficiency",
               "reservoir.life"]
    cite, cited = _citations(design)
    trace_rows = traceability(design)
    return {
        "body_only": body_only,
        "split": is_split(design),
        "rails": rail_names(design),
        "document": spec.document,
        "signoff": signoff_rows(spec),
        "history": revision_history(spec, design.spec_path),
        "stress_rows": stress_table(design),
        "check_rows": check_table(design),
        "decisions": decisions(design),
        "open_points": open_points(design),
        "chains": cited["chains"],
        "cited": cited,
        "references": cite.entries(),
        "trace_matrix": trace_matrix(design, trace_rows),
        "d": design,
        "spec": spec,
        "project": spec.project,
        "counts": design.counts(),
        "stages": stages,
        "inputs": inputs,
        "checks": design.checks,
        "checks_sorted": checks_sorted,
        "attention": [c for c in checks_sorted if c.status != "pass"],
        "key_values": [design.values[k] for k in key_ids if k in design.values],
        "summary_notes": summary_notes(design),
        "initial_pairs": verified,
        "parts": design.parts,
        "cautions": design.cautions,
        "assumptions": design.assumptions,
        "sources": sources,
        "equations": sorted(design.equations.values(), key=lambda e: e.id),
        "trace_rows": trace_rows,
        "figures": [
            {"src": _svg_uri(plots[name]), "caption": _caption(design, name, caption),
             "section": section}
            for name, (section, caption) in FIGURES.items() if name in plots
        ],
        "corner_columns": corner_columns(design),
        "bom_rows": bom_rows(design),
        "netlist": netlist(design),
        "corners": design.corners,
        "mc": design.monte_carlo,
        "mc_rows": [
            {"title": title, "unit": unit, "stats": design.monte_carlo["quantities"][key]}
            for key, (title, unit) in MC_QUANTITIES.items()
            if key in design.monte_carlo.get("quantities", {})
        ],
        "values": design.values,
        "insulation": insulation_facts(design),
    }


def render_html(design: Design, plots: dict[str, str], medium: str = "screen",
                body_only: bool = False) -> str:
    """The report as one HTML file: ``screen`` for report.html, ``print`` for the PDF.
    ``body_only`` leaves the appendices out (the PDF of ``--body-only``)."""
    if medium not in MEDIA:
        raise ValueError(f"unknown medium {medium!r}; expected one of {MEDIA}")
    if medium == "print":
        plots = {name: pdf_svg(svg) for name, svg in plots.items()}
    css = environment().loader.get_source(environment(), "report.css")[0]
    # The template leaves a numbered mark where a formula picture goes; the pictures the
    # document shows are then typeset in one batch (cached ones come from memory or disk, the
    # rest in parallel processes) and put in place. The mark carries a random token, so no text
    # of the design can be taken for one.
    slots = {"mark": f"@formula-{secrets.token_hex(8)}-", "latex": []}
    page = environment().get_template("report.html.j2").render(
        css=css, medium=medium, formula_slots=slots,
        **context(design, plots, body_only=body_only))
    if not slots["latex"]:
        return page
    from .mathsvg import prefetch

    prefetch(slots["latex"])
    tags = [_picture_tag(latex) for latex in slots["latex"]]
    return re.sub(re.escape(slots["mark"]) + r"(\d+)@", lambda m: tags[int(m.group(1))], page)


def pdf_svg(svg: str) -> str:
    """A figure for the PDF: its text in the fonts the PDF embeds (docgen.render.pdf), so the
    drawing does not depend on the fonts of the machine either."""
    from .pdf import MONO, SANS

    return (svg.replace('font-family="DejaVu Sans Mono"', f'font-family="{MONO}"')
               .replace('font-family="DejaVu Sans"', f'font-family="{SANS}"'))
