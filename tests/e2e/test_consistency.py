"""One figure per stress, said once: every demo spec and every test spec is built once (HTML and
results.json, no PDF) and the document is read back by the ids and classes the template puts on
its numbers, never by page layout.

- every number marked with a value id (summary, checks, bill-of-materials ratings, calculations,
  initial estimates and their verified figures) is the one results.json holds for that id,
  formatted by the project's formatter;
- no check, no key value of the summary and no rating of the bill of materials shows an initial
  estimate where a verified figure of the same stress exists;
- the summary's sentences show only numbers of the ids they name;
- every designator drawn in the schematic has a bill-of-materials line;
- no caption or corner name speaks of a corner axis the regulator kind does not have;
- the yield never exceeds the share of samples that a histogram shows within its limit.
"""

from __future__ import annotations

import json
import re
from functools import cache, lru_cache
from html.parser import HTMLParser
from pathlib import Path

import numpy as np
import pytest

from docgen.errors import SpecError
from docgen.pipeline import run
from docgen.regulators import regulator
from docgen.render.figures import draw_plots, histogram_panels
from docgen.render.html import render_html
from docgen.render.results_json import results_json
from docgen.spec import load_requirements
from docgen.units import format_quantity

ROOT = Path(__file__).resolve().parents[2]
SPECS = sorted((ROOT / "specs").glob("*.toml")) + sorted((ROOT / "tests" / "data").glob("*.toml"))
# Monte Carlo sample count for these builds: the properties hold for any count, and fewer
# samples keep the module quick (the golden test pins the full builds).
SAMPLES = 200


def _loadable(path: Path) -> bool:
    try:
        load_requirements(path)
    except SpecError:
        return False
    return True


BUILDABLE = [p for p in SPECS if _loadable(p)]


@cache
def built(path: Path):
    """(design, html, results) of one spec, built once for the whole module."""
    loaded = load_requirements(path)
    samples = min(loaded.requirements.analysis.samples, SAMPLES)
    design = run(loaded, samples=samples)
    plots = draw_plots(design)
    return design, render_html(design, plots), json.loads(results_json(design)), plots


class _Marked(HTMLParser):
    """Text of every element carrying one of the watched attributes (nested tags included)."""

    WATCH = ("data-vid", "data-vids", "data-hand", "data-ref")

    def __init__(self) -> None:
        super().__init__()
        self.open: list[tuple[str, dict, list[str]]] = []
        self.found: list[tuple[str, dict, str]] = []
        self.by_id: dict[str, str] = {}
        self._id_stack: list[tuple[str, str, list[str]]] = []

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if any(k in a for k in self.WATCH):
            self.open.append((tag, a, []))
        if "id" in a:
            self._id_stack.append((tag, a["id"], []))

    def handle_endtag(self, tag):
        if self.open and self.open[-1][0] == tag:
            t, a, parts = self.open.pop()
            self.found.append((t, a, " ".join("".join(parts).split())))
        if self._id_stack and self._id_stack[-1][0] == tag:
            _, i, parts = self._id_stack.pop()
            self.by_id[i] = " ".join("".join(parts).split())

    def handle_data(self, data):
        for _, _, parts in self.open:
            parts.append(data)
        for _, _, parts in self._id_stack:
            parts.append(data)


def _marked(html: str) -> _Marked:
    p = _Marked()
    p.feed(html)
    return p


def _shown(results: dict, vid: str) -> str:
    v = results["values"][vid]
    return format_quantity(v["value"], v["display_unit"])


@pytest.fixture(params=BUILDABLE, ids=lambda p: p.stem)
def doc(request):
    return built(request.param)


def test_every_marked_number_is_the_one_in_results_json(doc):
    design, html, results, _ = doc
    marked = [(a["data-vid"], text) for _, a, text in _marked(html).found if "data-vid" in a]
    assert len(marked) > 20  # summary, checks, BOM ratings and calculations are all marked
    for vid, text in marked:
        assert vid in results["values"], vid
        assert text == _shown(results, vid), (vid, text)


def test_verified_figure_and_difference_beside_each_initial_estimate(doc):
    design, html, results, _ = doc
    estimates = results["initial_estimates"]
    assert estimates, "every design has hand estimates of engine-verified stresses"
    diffs = {a["data-hand"]: text for _, a, text in _marked(html).found if "data-hand" in a}
    for hand, pair in estimates.items():
        assert results["values"][pair["verified_id"]]["value"] == pair["verified"]
        assert results["values"][hand]["value"] == pair["initial"]
        if pair["difference"] is not None:
            assert diffs[hand] == format_quantity(pair["difference"], "%", 3)
            expected = (pair["verified"] - pair["initial"]) / pair["initial"]
            assert pair["difference"] == pytest.approx(expected, rel=1e-12)
        assert "worst case" not in results["values"][hand]["title"]


def test_checks_summary_and_bom_show_the_verified_figure(doc):
    design, html, results, _ = doc
    estimates = set(results["initial_estimates"])
    for c in results["checks"]:
        assert c["value_id"] not in estimates, c["id"]
        assert c["value"] == results["values"][c["value_id"]]["value"], c["id"]
    start = html.index('<section id="summary">')
    summary = _marked(html[start:html.index("</section>", start)])
    key_ids = {a["data-vid"] for _, a, _ in summary.found if "data-vid" in a}
    assert key_ids and not key_ids & estimates


def test_summary_sentences_show_only_the_numbers_they_name(doc):
    design, html, results, _ = doc
    notes = [(a["data-vids"].split(), text) for _, a, text in _marked(html).found
             if "data-vids" in a]
    if results["summary"]["largest_stress"]:
        assert notes, "the summary names the largest stress"
    for ids, text in notes:
        rest = text
        for vid in ids:
            shown = _shown(results, vid)
            assert shown in rest, (vid, shown, text)
            rest = rest.replace(shown, " ")
        rest = re.sub(r"\b[A-Z]{1,3}\d+\b", " ", rest)  # designators
        assert not re.search(r"\d", rest), text
    for heat in results["summary"]["heat"]:
        bare = results["values"][heat["bare_id"]]["value"]
        limit = results["values"][heat["max_id"]]["value"]
        text = next(t for ids, t in notes if heat["bare_id"] in ids)
        assert ("would fail long before" in text) == (bare > limit)
        assert ("heat sink of at most" in text) == (heat["sink_id"] is not None)


def _drawn_refs(svg: str) -> set[str]:
    desc = re.search(r"<desc>(.*?)</desc>", svg, re.S).group(1)
    refs: set[str] = set()
    for line in desc.splitlines():
        m = re.match(r"([A-Z]{1,3})(\d+)(?:-([A-Z]{1,3})(\d+))?\b", line.strip())
        if not m:
            continue
        if m.group(3):
            refs |= {f"{m.group(1)}{n}" for n in range(int(m.group(2)), int(m.group(4)) + 1)}
        else:
            refs.add(m.group(1) + m.group(2))
    return refs


def _bom_refs(results: dict) -> set[str]:
    """Designators the BOM covers: a line of N parts ("2 rectifier diodes", "4 x ...") covers
    its designator and the N - 1 that follow."""
    out: set[str] = set()
    for p in results["bom"]:
        m = re.match(r"([A-Z]+)(\d+)$", p["ref"])
        n = re.match(r"(\d+) ", p["description"])
        count = int(n.group(1)) if n else 1
        out |= {f"{m.group(1)}{int(m.group(2)) + i}" for i in range(count)}
    return out


def test_every_drawn_designator_has_a_bom_line(doc):
    design, html, results, plots = doc
    drawn = _drawn_refs(plots["schematic"])
    assert {"T1", "F1"} <= drawn
    assert drawn <= _bom_refs(results), drawn - _bom_refs(results)
    marked = {a["data-ref"] for _, a, _ in _marked(html).found if "data-ref" in a}
    assert marked == {p["ref"] for p in results["bom"]}


# Words a caption or corner name uses for each corner axis of a regulator kind.
AXIS_WORDS = {"zener voltage": ("zener high", "zener low", "V_Z"),
              "series resistor": ("resistor high", "resistor low", " R +", " R -"),
              "base resistor": (" R +", " R -"),
              "dropping resistor": (" R +", " R -"),
              "output setpoint": ("V_out low", "V_out high", "setpoint")}


def test_no_caption_names_an_axis_the_kind_lacks(doc):
    design, html, results, _ = doc
    axes = set()
    for out in design.requirements.output:
        axes |= set(regulator(out.regulator).corner_axis_names)
    allowed = {w for a in axes for w in AXIS_WORDS.get(a, ())}
    captions = re.findall(r"<(?:figcaption|caption)[^>]*>(.*?)</(?:figcaption|caption)>", html,
                          re.S)
    texts = captions + [c["name"] for c in results["corners"]]
    texts += [c["corner"] for c in results["checks"]]
    for a, words in AXIS_WORDS.items():
        for w in set(words) - allowed:
            bad = [t for t in texts if w in t]
            assert not bad, (a, w, bad[:3])
    if not any("zener" in a for a in axes):
        head = re.search(r'<table class="corners small">.*?</thead>', html, re.S).group(0)
        assert "Z,min" not in head and "P_Z" not in head and "Z</mi>" not in head


def test_yield_agrees_with_the_histograms(doc):
    design, html, results, _ = doc
    mc = results["monte_carlo"]
    if not mc:
        pytest.skip("Monte Carlo turned off in this spec")
    ids = _marked(html).by_id
    assert ids["mc-yield"] == format_quantity(mc["yield"], "%", 3)
    for panel in histogram_panels(design):
        data = np.asarray(design.samples[panel["metric"]], dtype=float)
        data = data[np.isfinite(data)]
        for limit in panel["limits"]:
            ok = data <= limit if panel["sense"] == "max" else data >= limit
            share = float(np.mean(ok)) if len(data) else 1.0
            assert mc["yield"] <= share + 1e-12, (panel["metric"], limit, share, mc["yield"])
