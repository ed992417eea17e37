"""report.html for people and assistive technology: MathML formulas with readable text,
landmarks, captioned tables in scroll regions, a colour scheme, the schematic's netlist; the
PDF's HTML keeps the typeset pictures."""

from __future__ import annotations

import re
import shutil
import subprocess
from html.parser import HTMLParser

import pytest

from docgen.render.filters import formula_text
from docgen.render.html import render_html
from docgen.render.netlist import netlist

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")


class _Tags(HTMLParser):
    """Start tags with their attributes and the stack of open tags above each."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list[tuple[str, dict]] = []
        self.seen: list[tuple[str, dict, list[tuple[str, dict]]]] = []

    def handle_starttag(self, tag, attrs):
        entry = (tag, dict(attrs))
        self.seen.append((tag, entry[1], list(self.stack)))
        if tag not in ("img", "meta", "br", "mspace", "link", "input"):
            self.stack.append(entry)

    def handle_startendtag(self, tag, attrs):
        self.seen.append((tag, dict(attrs), list(self.stack)))

    def handle_endtag(self, tag):
        for i in range(len(self.stack) - 1, -1, -1):
            if self.stack[i][0] == tag:
                del self.stack[i:]
                break


@pytest.fixture(scope="module")
def screen_html(demo_build) -> str:
    return (demo_build.out_dir / "report.html").read_text(encoding="utf-8")


@pytest.fixture(scope="module")
def tags(screen_html) -> _Tags:
    parser = _Tags()
    parser.feed(screen_html)
    return parser


def test_formulas_are_mathml_with_readable_text(screen_html, tags):
    maths = [a for t, a, _ in tags.seen if t == "math"]
    assert len(maths) > 100
    assert 'class="math"' not in screen_html, "a formula fell back to a picture"
    for attrs in maths:
        alt = attrs.get("alttext", "")
        assert alt and "\\" not in alt and "{" not in alt, alt
    assert len(screen_html.encode("utf-8")) < 1_500_000  # the pictures made it 3 MB


def test_pdf_html_keeps_pictures_with_readable_alt_text(demo_build):
    html = render_html(demo_build.design, {}, medium="print")
    alts = re.findall(r'<img class="math" src="data:image/svg\+xml;base64,[^"]+" style="[^"]+" '
                      r'alt="([^"]*)"', html)
    assert len(alts) > 100 and "<math" not in html
    assert all(a and "\\" not in a for a in alts)


def test_landmarks_and_colour_scheme(tags, screen_html):
    names = [t for t, _, _ in tags.seen]
    assert names.count("main") == 1 and names.count("nav") >= 1
    assert any(t == "header" and a.get("class") == "cover" for t, a, _ in tags.seen)
    assert re.search(r"color-scheme:\s*light dark", screen_html)
    assert "prefers-color-scheme: dark" in screen_html


def test_every_table_has_a_caption_and_scrolls_in_a_labelled_region(tags, screen_html):
    tables = [(a, above) for t, a, above in tags.seen if t == "table"]
    assert len(tables) >= 10
    for _attrs, above in tables:
        region = above[-1]
        assert region[0] == "div" and region[1].get("class") == "scroll"
        assert region[1].get("role") == "region" and region[1].get("tabindex") == "0"
        label = region[1]["aria-labelledby"]
        assert re.search(rf'<caption id="{label}">[^<]+</caption>', screen_html)
    assert screen_html.count("<caption") == len(tables)


def test_schematic_points_at_its_netlist(demo_build, screen_html):
    assert re.search(r'<img src="data:image/svg\+xml;base64,[^"]+" alt="[^"]+" '
                     r'aria-describedby="netlist">', screen_html)
    table = screen_html.split('id="netlist"', 1)[1].split("</table>", 1)[0]
    for part in demo_build.design.parts:
        assert f"<td>{part.ref}</td>" in table
    rows = {c.ref: c.pins for c in netlist(demo_build.design)}
    assert rows["C1"] == "+: V_C; -: 0 V" and rows["R1"] == "V_C to OUT"
    assert rows["DZ1"] == "cathode: OUT; anode: 0 V"


@pytest.mark.parametrize(("latex", "text"), [
    (r"V_{lo} = V_{nom} \cdot (1 - t_{lo})", "V_lo = V_nom · (1 − t_lo)"),
    (r"R = \frac{12\,\mathrm{V} - 9\,\mathrm{V}}{45\,\mathrm{mA}} = 66.67\,\mathrm{\Omega}",
     "R = (12 V − 9 V) / 45 mA = 66.67 Ω"),
    (r"I = \sqrt{\left(930\,\mathrm{mA}\right)^2 + x^{2}}", "I = √((930 mA)^2 + x^2)"),
    (r"T_{j} = 45\,\mathrm{^\circ C} + \theta_{JA} \cdot P", "T_j = 45 °C + θ_JA · P"),
])
def test_formula_text(latex, text):
    assert formula_text(latex) == text


@pytest.mark.skipif(CHROMIUM is None, reason="headless Chromium is not installed")
def test_no_sideways_scroll_at_400_px(screen_html, tmp_path):
    """The page laid out 400 px wide (in a frame: headless windows are wider) is no wider."""
    probe = ("<script>window.addEventListener('load', function () { parent.postMessage("
             "'W=' + document.documentElement.scrollWidth + ' C=' + "
             "document.documentElement.clientWidth, '*'); });</script></body>")
    (tmp_path / "inner.html").write_text(screen_html.replace("</body>", probe), encoding="utf-8")
    (tmp_path / "outer.html").write_text(
        '<html><body><iframe src="inner.html" width="400" height="600"></iframe><pre id="r">'
        '</pre><script>window.addEventListener("message", function (e) { '
        'document.getElementById("r").textContent = e.data; });</script></body></html>',
        encoding="utf-8")
    done = subprocess.run(
        [CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         f"--user-data-dir={tmp_path / 'profile'}", "--virtual-time-budget=15000",
         "--dump-dom", (tmp_path / "outer.html").as_uri()],
        capture_output=True, text=True, timeout=180, check=True)
    found = re.search(r'<pre id="r">W=(\d+) C=(\d+)</pre>', done.stdout)
    assert found, "the page did not report its width"
    scroll_width, client_width = int(found.group(1)), int(found.group(2))
    assert client_width <= 400 and scroll_width <= client_width
