"""The PDF embeds the fonts docgen ships (not the machine's), is tagged and is PDF/A-3b."""

from __future__ import annotations

import io
from pathlib import Path

import pytest

from docgen.render.pdf import font_dir, render_pdf

pypdf = pytest.importorskip("pypdf")
TTFont = pytest.importorskip("fontTools.ttLib").TTFont

# The page's own rules name the fonts as the report does (author rules, as in report.css).
HTML = """<!DOCTYPE html><html lang="en"><head><meta charset="utf-8"><title>t</title>
<style>html { font-family: "DejaVu Sans", sans-serif; }
pre { font-family: "DejaVu Sans Mono", monospace; }</style></head>
<body><h1>Heading</h1><p>Text with <b>bold</b> and <i>italic</i>, µF and Ω.</p>
<pre>mono text</pre><table><caption>A table</caption><tr><th>a</th><td>1</td></tr></table>
</body></html>"""


def _embedded_fonts(data: bytes) -> dict[str, float]:
    """Embedded font name -> the font program's revision (head table)."""
    reader = pypdf.PdfReader(io.BytesIO(data))
    out: dict[str, float] = {}
    for page in reader.pages:
        fonts = page["/Resources"].get_object().get("/Font", {})
        for ref in fonts.values():
            font = ref.get_object()
            if "/DescendantFonts" in font:
                font = font["/DescendantFonts"][0].get_object()
            descriptor = font["/FontDescriptor"].get_object()
            program = descriptor["/FontFile2"].get_object().get_data()
            out[str(descriptor["/FontName"])] = TTFont(io.BytesIO(program))["head"].fontRevision
    return out


def _shipped_revision(name: str) -> float:
    return TTFont(Path(font_dir()) / name)["head"].fontRevision


def _check_shipped(fonts: dict[str, float]) -> None:
    assert fonts, "no embedded fonts"
    for name, revision in fonts.items():
        base = name.split("+", 1)[-1]
        ttf = {"docgen-DejaVu-Sans": "DejaVuSans.ttf",
               "docgen-DejaVu-Sans-Bold": "DejaVuSans-Bold.ttf",
               "docgen-DejaVu-Sans-Italic": "DejaVuSans-Oblique.ttf",
               "docgen-DejaVu-Sans-Bold-Italic": "DejaVuSans-BoldOblique.ttf",
               "docgen-DejaVu-Sans-Mono": "DejaVuSansMono.ttf",
               "docgen-DejaVu-Sans-Mono-Bold": "DejaVuSansMono-Bold.ttf"}.get(base)
        assert ttf is not None, f"unexpected font {name} (not one docgen ships)"
        assert revision == pytest.approx(_shipped_revision(ttf)), (
            f"{name} has revision {revision}, not the shipped file's: the machine's font was used")


@pytest.fixture(scope="module")
def small_pdf() -> bytes:
    return render_pdf(HTML, {"spec.toml": b"schema = 1\n"}, title="t")


def test_small_document_uses_the_shipped_fonts(small_pdf):
    fonts = _embedded_fonts(small_pdf)
    _check_shipped(fonts)
    names = {n.split("+", 1)[-1] for n in fonts}
    assert {"docgen-DejaVu-Sans", "docgen-DejaVu-Sans-Bold", "docgen-DejaVu-Sans-Italic",
            "docgen-DejaVu-Sans-Mono"} <= names


def test_pdf_is_tagged_pdf_a_3b_with_attachments(small_pdf):
    reader = pypdf.PdfReader(io.BytesIO(small_pdf))
    root = reader.trailer["/Root"].get_object()
    assert "/StructTreeRoot" in root, "untagged PDF"
    assert root["/MarkInfo"].get_object()["/Marked"]
    xmp = root["/Metadata"].get_object().get_data().decode("utf-8")
    assert "pdfaid:part" in xmp and "3" in xmp.split("pdfaid:part", 1)[1][:8]
    assert "pdfaid:conformance" in xmp and "B" in xmp.split("pdfaid:conformance", 1)[1][:8]
    assert "/OutputIntents" in root
    assert set(reader.attachments) == {"spec.toml"}
    assert reader.attachments["spec.toml"] == [b"schema = 1\n"]


def test_same_input_gives_the_same_bytes(small_pdf):
    import time

    time.sleep(1.1)  # the clock has moved on: nothing in the file may follow it
    assert render_pdf(HTML, {"spec.toml": b"schema = 1\n"}, title="t") == small_pdf


def test_demo_report_uses_the_shipped_fonts(demo_build):
    _check_shipped(_embedded_fonts((demo_build.out_dir / "report.pdf").read_bytes()))
