"""The drawn schematic: every topology x regulator renders, labels stay text, output is stable."""

from __future__ import annotations

import itertools
import os
import re
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from docgen.render.schematic import (
    REGULATORS,
    TOPOLOGIES,
    OutputDrawing,
    SchematicDrawing,
    schematic_svg,
)

ROOT = Path(__file__).resolve().parents[2]
SVG = "{http://www.w3.org/2000/svg}"

LABELS = {
    "zener": {"C1": "3300 uF 35 V", "R1": "75 ohm 2 W", "D1": "9.1 V 3 W"},
    "follower": {"C1": "2200 uF 25 V", "R1": "1.2 kohm 0.25 W", "D1": "13 V 0.5 W",
                 "Q1": "NPN 2 A 60 V", "C2": "100 uF 25 V"},
    "three-terminal": {"C1": "4700 uF 35 V", "C2": "330 nF", "C3": "100 nF",
                       "U1": "12 V fixed 1 A"},
    "adjustable": {"C1": "4700 uF 35 V", "C2": "100 nF", "C3": "10 uF 25 V",
                   "U1": "1.25 V reference", "R1": "240 ohm", "R2": "2.0 kohm"},
    "none": {"C1": "1000 uF 25 V"},
    "series": {"C1": "1000 uF 25 V", "R1": "20 ohm 0.5 W"},
}


def _renumber(labels: dict[str, str], offset: int) -> dict[str, str]:
    """The same parts with other designators (C1 -> C5 ...), for the second rail."""
    return {f"{k[0]}{int(k[1:]) + offset}": v for k, v in labels.items()}


def _drawing(topology: str, regulator: str) -> SchematicDrawing:
    if topology == "split":
        outputs = (
            OutputDrawing("+15 V", regulator, "+", LABELS[regulator], "15 V, 100 mA"),
            OutputDrawing("-15 V", regulator, "-", _renumber(LABELS[regulator], 4),
                          "-15 V, 100 mA"),
        )
    else:
        outputs = (OutputDrawing("sensor rail", regulator, "+", LABELS[regulator],
                                 "9.1 V, 40 mA"),)
    rectifier = {"bridge": "BR1 100 V 0.5 A", "split": "BR1 100 V 0.5 A",
                 "center-tap": "D7, D8 1N-class 1 A", "half-wave": "D7 1N-class 1 A"}[topology]
    return SchematicDrawing(topology, "230 V 50 Hz", "F1 160 mA T", "T1 12 V 3 VA", rectifier,
                            "R9 4.7 kohm", outputs)


def _norm(s: str) -> str:
    return " ".join(s.split())


def _text_blocks(root: ET.Element) -> list[str]:
    """Each <text> element's lines joined by spaces (a label is one element)."""
    return [_norm(" ".join(t.itertext())) for t in root.iter(f"{SVG}text")]


def _label_xy(root: ET.Element, first_line: str) -> tuple[float, float]:
    """SVG x, y (y downwards) of the first line of the label block starting with `first_line`."""
    for t in root.iter(f"{SVG}text"):
        spans = list(t.iter(f"{SVG}tspan"))
        if spans and spans[0].text == first_line:
            return float(spans[0].get("x")), float(spans[0].get("y"))
    raise AssertionError(f"no label starting with {first_line!r}")


def _label_y(root: ET.Element, first_line: str) -> float:
    return _label_xy(root, first_line)[1]


def _expected_texts(d: SchematicDrawing) -> list[str]:
    texts = [f"mains {d.mains_text}", d.fuse, d.transformer, d.rectifier, d.bleeder]
    for o in d.outputs:
        texts.append(f"{o.name} {o.v_out_text}")
        texts += [f"{k} {v}" for k, v in o.labels.items()]
    return [_norm(t) for t in texts if t]


@pytest.mark.parametrize("topology,regulator", list(itertools.product(TOPOLOGIES, REGULATORS)))
def test_every_combination_draws_with_every_label_as_text(topology, regulator):
    d = _drawing(topology, regulator)
    svg = schematic_svg(d)
    root = ET.fromstring(svg)
    assert root.tag == f"{SVG}svg"
    assert re.fullmatch(r"[\d.]+cm", root.get("width"))
    vx, vy, vw, vh = (float(v) for v in root.get("viewBox").split())
    assert vw > 0 and vh > 0
    # the symbols and wires are there, not just text
    assert len(list(root.iter(f"{SVG}path"))) >= 25
    blocks = _text_blocks(root)
    desc = root.find(f"{SVG}desc").text.splitlines()
    for text in _expected_texts(d):
        assert any(text in b for b in blocks), f"{text!r} not drawn; drawn: {blocks}"
        assert any(text in line for line in desc), f"{text!r} not in <desc>"
    # every label line starts inside the picture
    for span in root.iter(f"{SVG}tspan"):
        if span.get("x") is not None and span.get("y") is not None:
            assert vx <= float(span.get("x")) <= vx + vw
            assert vy <= float(span.get("y")) <= vy + vh
    assert "0 V" in blocks


def test_same_description_gives_identical_bytes():
    d = _drawing("split", "follower")
    assert schematic_svg(d) == schematic_svg(d)
    assert schematic_svg(d) == schematic_svg(_drawing("split", "follower"))


def test_identical_bytes_in_a_fresh_interpreter_whatever_was_imported_before():
    # another hash seed, and a second render after WeasyPrint has registered its XML
    # namespace prefixes (process-wide ElementTree state)
    code = ("import sys; from tests.unit.test_schematic import _drawing;"
            "from docgen.render.schematic import schematic_svg;"
            "d = _drawing('center-tap', 'adjustable'); a = schematic_svg(d);"
            "import weasyprint.pdf.metadata; b = schematic_svg(d);"
            "sys.stdout.write(a if a == b else 'differs after importing weasyprint')")
    env = dict(os.environ, PYTHONHASHSEED="12345")
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, env=env, check=True,
                         capture_output=True, text=True).stdout
    assert out == schematic_svg(_drawing("center-tap", "adjustable"))


def test_split_draws_positive_above_and_negative_below_the_0v_line():
    d = _drawing("split", "three-terminal")
    root = ET.fromstring(schematic_svg(d))
    blocks = _text_blocks(root)
    assert "+15 V 15 V, 100 mA" in blocks
    assert "-15 V -15 V, 100 mA" in blocks
    zero = _label_y(root, "0 V")
    assert _label_y(root, "+15 V") < zero < _label_y(root, "-15 V")
    # each rail has its own reservoir and regulator, on its own side of the 0 V line
    assert _label_y(root, "C1") < zero < _label_y(root, "C5")
    assert _label_y(root, "U1") < zero < _label_y(root, "U5")
    # two output terminals and the 0 V terminal (open circles)
    opens = [c for c in root.iter(f"{SVG}circle") if "fill:white" in (c.get("style") or "")
             or c.get("fill") == "white"]
    assert len(opens) >= 2 + 3       # mains L and N, +15 V, -15 V, 0 V


def test_negative_single_rail_is_drawn_below_the_0v_line():
    d = SchematicDrawing("half-wave", "230 V 50 Hz", "", "T1 9 V 1 VA", "D1 1N-class", "", (
        OutputDrawing("bias", "zener", "-", {"C1": "470 uF 25 V", "R1": "150 ohm",
                                             "D2": "5.1 V"}, "-5.1 V"),))
    root = ET.fromstring(schematic_svg(d))
    zero = _label_y(root, "0 V")
    assert _label_y(root, "bias") > zero
    assert _label_y(root, "D2") > zero


def test_parts_the_labels_do_not_name_get_free_designators():
    # three-terminal needs input and output capacitors; only the reservoir is named, and
    # C2 is taken by the bleeder text, so the new ones must be C3 and C4
    d = SchematicDrawing("bridge", "230 V 50 Hz", bleeder="C2 odd but taken", outputs=(
        OutputDrawing("5 V", "three-terminal", "+", {"C1": "1000 uF 16 V", "U1": "5 V"}, "5 V"),))
    blocks = _text_blocks(ET.fromstring(schematic_svg(d)))
    assert "C3" in blocks and "C4" in blocks
    assert sum(b.startswith("C2") for b in blocks) == 1


def test_labels_without_a_role_are_listed_not_dropped():
    d = SchematicDrawing("bridge", "230 V 50 Hz", outputs=(
        OutputDrawing("logic", "zener", "+", {"C1": "1000 uF 16 V", "R1": "47 ohm",
                                              "D1": "5.6 V", "L1": "10 uH ferrite",
                                              "R2": "spare 1 kohm"}, "5.6 V"),))
    blocks = _text_blocks(ET.fromstring(schematic_svg(d)))
    note = [b for b in blocks if b.startswith("also:")]
    assert note == ["also: L1 10 uH ferrite R2 spare 1 kohm"]


def test_small_capacitors_are_drawn_without_polarity_mark():
    def plus_marks(c2: str) -> int:
        labels = dict(LABELS["three-terminal"], C2=c2)
        d = SchematicDrawing("bridge", "230 V 50 Hz", outputs=(
            OutputDrawing("12 V", "three-terminal", "+", labels, "12 V"),))
        return _text_blocks(ET.fromstring(schematic_svg(d))).count("+")

    assert plus_marks("100 uF 25 V") == plus_marks("100 nF") + 1


def test_markup_characters_in_texts_stay_text():
    d = SchematicDrawing("bridge", "230 V & 50 Hz", "F1 <1 A>", "T1 $x$ a_b^c", "BR1 x", "", (
        OutputDrawing('out "A" & <B>', "zener", "+", {"C1": "1 µF", "R1": "10 Ω", "D1": "5 V"},
                      "5 V"),))
    svg = schematic_svg(d)
    blocks = _text_blocks(ET.fromstring(svg))
    assert "mains 230 V & 50 Hz" in blocks
    assert "F1 <1 A>" in blocks
    assert "T1 $x$ a_b^c" in blocks
    assert 'out "A" & <B> 5 V' in blocks
    assert "R1 10 Ω" in blocks


def test_multiple_outputs_on_one_rail_each_get_a_terminal():
    d = SchematicDrawing("bridge", "230 V 50 Hz", outputs=(
        OutputDrawing("logic", "three-terminal", "+", {"C1": "4700 uF 35 V", "U1": "5 V"}),
        OutputDrawing("relay", "zener", "+", {"R2": "100 ohm", "D2": "12 V"}),
        OutputDrawing("raw", "none", "+", {}, "about 20 V"),
    ))
    root = ET.fromstring(schematic_svg(d))
    blocks = _text_blocks(root)
    for name in ("logic", "relay", "raw about 20 V"):
        assert name in blocks
    # the outputs follow one another to the right
    xs = [_label_xy(root, name)[0] for name in ("logic", "relay", "raw")]
    assert xs == sorted(xs)


@pytest.mark.parametrize("kwargs,message", [
    ({"topology": "full-wave"}, "topology"),
    ({"outputs": (OutputDrawing("a", "zener", "+"), OutputDrawing("b", "zener", "-"))},
     "same polarity"),
    ({"topology": "split", "outputs": (OutputDrawing("a", "zener", "+"),)}, "'-'"),
])
def test_descriptions_that_cannot_be_drawn_are_refused(kwargs, message):
    args = {"topology": "bridge", "mains_text": "230 V 50 Hz", **kwargs}
    with pytest.raises(ValueError, match=message):
        SchematicDrawing(**args)


def test_unknown_regulator_or_polarity_is_refused():
    with pytest.raises(ValueError, match="regulator"):
        OutputDrawing("a", "buck")
    with pytest.raises(ValueError, match="polarity"):
        OutputDrawing("a", "zener", "±")


def test_description_is_immutable():
    labels = {"C1": "1000 uF"}
    o = OutputDrawing("a", "none", "+", labels)
    labels["C1"] = "changed"
    assert o.labels["C1"] == "1000 uF"
    with pytest.raises(TypeError):
        o.labels["C1"] = "x"  # type: ignore[index]


def test_natural_width_fits_16_cm():
    for topology, regulator in itertools.product(TOPOLOGIES, REGULATORS):
        root = ET.fromstring(schematic_svg(_drawing(topology, regulator)))
        assert float(root.get("width").removesuffix("cm")) <= 16.0


def test_importing_the_module_does_not_import_drawing_libraries():
    code = ("import sys, docgen.render.schematic;"
            "sys.exit(bool({'schemdraw', 'matplotlib'} & set(sys.modules)))")
    subprocess.run([sys.executable, "-c", code], cwd=ROOT, check=True)


def test_labels_survive_into_the_pdf_as_text(tmp_path):
    """The report embeds the SVG as an image; WeasyPrint must keep the labels as text."""
    import base64

    pypdf = pytest.importorskip("pypdf")
    from weasyprint import HTML

    svg = schematic_svg(_drawing("bridge", "zener"))
    uri = "data:image/svg+xml;base64," + base64.b64encode(svg.encode()).decode()
    pdf = tmp_path / "s.pdf"
    HTML(string=f'<img src="{uri}" style="max-width:100%">').write_pdf(pdf)
    text = _norm(pypdf.PdfReader(pdf).pages[0].extract_text())
    for needle in ("3300 uF", "75 ohm 2 W", "sensor rail", "9.1 V, 40 mA", "BR1", "mains"):
        assert needle in text


def test_a_zener_designated_dz_takes_the_zener_role():
    # BOM designators for zeners are DZ1, DZ2: the drawing must label that part, not invent a
    # bare D1 and list DZ1 as an extra
    out = OutputDrawing("rail", "zener", "+", {"C1": "2200 uF 50 V", "R1": "150 ohm 5 W",
                                                "DZ1": "9.1 V 5 W"}, "9.1 V, 40 mA")
    svg = schematic_svg(SchematicDrawing("bridge", "230 V 50 Hz", "F1 50 mA T", "T1 15 V 6 VA",
                                         "BR1 1 kV 2 A", outputs=(out,)))
    desc = svg.split("<desc>")[1].split("</desc>")[0].splitlines()
    assert "DZ1 9.1 V 5 W" in desc
    assert "D1" not in [line.split()[0] for line in desc if line]
