"""End to end: the demo spec builds into a PDF, HTML and results.json that say what they should."""

from __future__ import annotations

import json
import re

import pytest

from docgen.cli import main

from ..conftest import DATA, DEMO


def test_demo_outputs_exist(demo_build):
    names = {p.name for p in demo_build.files}
    assert {"report.html", "report.pdf", "results.json", "waveforms_trough.svg",
                      "waveforms_nominal.svg", "monte_carlo.svg"} <= names
    assert demo_build.status in ("pass", "warn")


def test_pdf_opens_with_pages_equations_checks_and_attachments(demo_build):
    pypdf = pytest.importorskip("pypdf")
    reader = pypdf.PdfReader(demo_build.out_dir / "report.pdf")
    assert len(reader.pages) >= 10
    text = "\n".join(page.extract_text() for page in reader.pages)
    design = demo_build.design
    for eq_id in design.equations:
        assert eq_id in text, f"equation id {eq_id} missing from the PDF text"
    for check in design.checks:
        assert check.id in text, f"check id {check.id} missing from the PDF text"
    assert "page 2 of" in text
    assert set(reader.attachments) == {DEMO.name, "results.json"}
    assert reader.outline, "the PDF has no bookmarks"


def test_results_json_is_complete_and_consistent(demo_build):
    data = json.loads((demo_build.out_dir / "results.json").read_text())
    assert data["status"] == demo_build.status
    assert re.fullmatch(r"[0-9a-f]{64}", data["spec_sha256"])
    for vid, v in data["values"].items():
        assert v["equation"] in data["equations"] or v["equation"] in ("given", "default"), vid
        for i in v["inputs"]:
            assert i in data["values"], f"{vid} cites unknown input {i}"
    for c in data["checks"]:
        assert c["status"] in ("pass", "warn", "fail")
        assert c["value_id"] in data["values"] and c["limit_id"] in data["values"]
        # the margin's sign agrees with the status
        assert (c["margin"] < 0) == (c["status"] == "fail")
    assert [p["ref"] for p in data["bom"]] == ["T1", "BR1", "C1", "R1", "DZ1", "F1"]


def test_html_is_self_contained_and_links_resolve(demo_build):
    html = (demo_build.out_dir / "report.html").read_text()
    assert not re.search(r"""(src|href)=["'](https?:|//|file:)""", html)
    ids = set(re.findall(r'id="([^"]+)"', html))
    for target in re.findall(r'href="#([^"]+)"', html):
        assert target in ids, f"broken link #{target}"
    assert "local codes" in html.lower() or "local wiring rules" in html.lower()


def test_outputs_are_byte_identical_across_builds(demo_build, tmp_path):
    from docgen.jobs.build import build_one

    again = build_one(DEMO, tmp_path, pdf=False)
    for name in ("results.json", "report.html", "plots/waveforms_trough.svg", "plots/monte_carlo.svg"):
        assert (again.out_dir / name).read_bytes() == (demo_build.out_dir / name).read_bytes(), name


@pytest.mark.parametrize(
    ("spec", "code"),
    [("all-pass.toml", 0), ("undersized-capacitor.toml", 1), ("bad-unit.toml", 2)],
)
def test_check_exit_codes(spec, code, capsys):
    assert main(["check", str(DATA / spec)]) == code
    out, err = capsys.readouterr()
    assert "Traceback" not in out + err
    if code == 2:
        assert "bad-unit.toml" in err and "output[0].load_max" in err and "current" in err
    if code == 1:
        assert "FAIL check.cap_voltage" in out


def test_build_never_touches_the_spec(tmp_path):
    before = DEMO.read_bytes()
    assert main(["build", str(DEMO), "-o", str(tmp_path), "--no-pdf"]) in (0, 1)
    assert DEMO.read_bytes() == before


def test_new_writes_a_starter_that_checks_and_refuses_to_overwrite(tmp_path, capsys):
    target = tmp_path / "starter.toml"
    assert main(["new", str(target)]) == 0
    assert main(["check", str(target)]) in (0, 1)
    assert main(["new", str(target)]) == 2
    assert "never overwrites" in capsys.readouterr().err


def test_field_reference_is_current():
    from pathlib import Path

    from docgen.fields import field_reference_markdown

    doc = Path(__file__).resolve().parents[2] / "docs" / "requirements.md"
    assert doc.read_text() == field_reference_markdown(), (
        "docs/requirements.md is stale: run python -m docgen.fields > docs/requirements.md")
