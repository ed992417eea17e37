"""The review package: a short body (sign-off, revision history, one stress table, decisions,
open points) before the appendices; --body-only leaves the appendices out of the PDF."""

from __future__ import annotations

import dataclasses
import html as html_lib
import re
import shutil
import subprocess
from pathlib import Path

import pytest

from docgen.jobs.build import build_one
from docgen.cli import main
from docgen.render.derivation import chains
from docgen.render.html import render_html
from docgen.render.review import open_points, stress_table
from docgen.render.signoff import git_commits, revision_history
from docgen.render.sources import PUBLICATIONS, Citations

from ..conftest import DEMO, DEMO_STANDALONE, ROOT

SPLIT = ROOT / "specs" / "audio-preamp-split-15v.toml"


def _with_document(design, **fields):
    """The demo design with [document] fields as a file would give them (no re-sizing: the
    fields are presentation only)."""
    spec = design.requirements
    doc = spec.document.model_validate({**spec.document.model_dump(), **fields})
    return dataclasses.replace(design, requirements=spec.model_copy(update={"document": doc}))


def _signoff_cells(html: str) -> list[list[str]]:
    table = html.split('id="signoff"', 1)[1].split("</table>", 1)[0]
    return [re.findall(r'<td class="sign-line">([^<]*)</td>', row)
            for row in table.split("<tr>")[2:]]


def test_signoff_names_and_dates_come_from_the_file(demo_build):
    design = _with_document(demo_build.design, status="for review", prepared_by="A. Preparer",
                            prepared_date="2026-11-01", checked_by="B. Checker",
                            approved_date="2026-11-20")
    html = render_html(design, {})
    rows = _signoff_cells(html)
    assert rows == [["A. Preparer", "2026-11-01", ""], ["B. Checker", "", ""],
                    ["", "2026-11-20", ""]]
    assert "<th>Document status</th><td>for review</td>" in html


def test_signoff_lines_are_blank_when_the_file_names_nobody(demo_build):
    rows = _signoff_cells(render_html(demo_build.design, {}))
    assert rows == [["", "", ""]] * 3  # lines to sign on, no invented names


def test_revision_history_from_the_file(demo_build):
    design = _with_document(demo_build.design, revisions=[
        {"revision": "A", "date": "2026-10-01", "author": "Demo team", "text": "first issue"},
        {"revision": "B", "date": "2026-11-30", "text": "larger reservoir"}])
    html = render_html(design, {})
    section = html.split('id="revisions"', 1)[1].split("</section>", 1)[0]
    assert "first issue" in section and "larger reservoir" in section
    assert section.index("first issue") < section.index("larger reservoir")


def _git(cwd: Path, *args: str) -> None:
    subprocess.run(["git", "-c", "user.name=Test Author", "-c", "user.email=t@example.invalid",
                    *args], cwd=cwd, check=True, capture_output=True)


@pytest.mark.skipif(shutil.which("git") is None, reason="git is not installed")
def test_git_history_lists_the_commits_that_touched_the_spec(tmp_path):
    spec = tmp_path / "supply.toml"
    other = tmp_path / "other.txt"
    _git(tmp_path, "init", "-q")
    spec.write_text(DEMO_STANDALONE)
    _git(tmp_path, "add", "supply.toml")
    _git(tmp_path, "commit", "-q", "-m", "first requirements")
    other.write_text("unrelated")
    _git(tmp_path, "add", "other.txt")
    _git(tmp_path, "commit", "-q", "-m", "unrelated change")
    spec.write_text(DEMO_STANDALONE.replace('revision = "B"', 'revision = "C"'))
    _git(tmp_path, "commit", "-q", "-am", "raise the revision")
    commits = git_commits(spec)
    assert [c["text"] for c in commits] == ["raise the revision", "first requirements"]
    assert all(c["author"] == "Test Author" and re.fullmatch(r"\d{4}-\d\d-\d\d", c["date"])
               for c in commits)
    from docgen.spec import load_requirements

    spec_model = load_requirements(spec).requirements
    assert revision_history(spec_model, spec)["commits"] == commits
    off = spec_model.model_copy(update={"document": spec_model.document.model_copy(
        update={"git_history": False})})
    assert revision_history(off, spec)["commits"] == []


def test_git_history_is_empty_outside_a_repository_or_without_git(tmp_path, monkeypatch):
    spec = tmp_path / "supply.toml"
    spec.write_text(DEMO_STANDALONE)
    monkeypatch.setenv("GIT_CEILING_DIRECTORIES", str(tmp_path.parent))
    assert git_commits(spec) == []  # no repository
    monkeypatch.setenv("PATH", str(tmp_path / "no-such-bin"))
    assert git_commits(spec) == []  # no git at all: no failure


def test_open_points_hold_every_warning_and_every_not_covered(demo_build):
    design = demo_build.design
    points = open_points(design)
    flagged = {p["check"].id for p in points if p["kind"] == "check"}
    assert flagged == {c.id for c in design.checks if c.status != "pass"}
    assert flagged, "the demo has warnings; the list must show them"
    texts = " ".join(p.get("text", "") for p in points)
    for a in design.assumptions:
        if "not covered" in a.text.lower() or a.id.startswith("assume.not_covered"):
            tail = a.text[a.text.lower().find("not covered"):] if "not covered" in \
                a.text.lower() else a.text
            assert tail in texts, a.id
    html = (demo_build.out_dir / "report.html").read_text(encoding="utf-8")
    section = html.split('id="open-points"', 1)[1].split("</section>", 1)[0]
    for cid in flagged:
        assert cid in section
    assert section.count("&#9744;") == len(points) or section.count("\u2610") == len(points)


def test_stress_table_covers_every_rated_part_once(demo_build):
    design = demo_build.design
    rows = stress_table(design)
    shown = [cell["check"].id for r in rows for cell in r["cells"] if cell]
    assert sorted(shown) == sorted(c.id for c in design.checks if c.ref)
    assert {r["refs"][0] for r in rows} == {c.ref for c in design.checks if c.ref}
    cap = next(r for r in rows if r["id"] == "check.cap_voltage")["cells"][0]
    # the allowed value is the rating times its derating factor
    assert cap["rating"] * cap["factor"] == pytest.approx(cap["check"].limit)


def test_derivations_drop_identities_and_engine_input_lists(demo_build):
    design = demo_build.design
    steps = [s for ch in chains(design, Citations()) for s in ch["steps"]]
    ids = {s["id"] for s in steps}
    assert not any(design.values[i].equation == "identity" for i in ids)
    engine = [s for s in steps if s["engine"]]
    assert engine and all(s["formula"] == "" and s["cells"][0]["values"] == "" for s in engine)
    html = (demo_build.out_dir / "report.html").read_text(encoding="utf-8")
    appendix = html.split('id="calculations"', 1)[1].split('id="waveforms"', 1)[0]
    assert "C_{req} = C_{calc}" not in appendix and "inputs:" not in appendix


def test_references_are_publications_each_cited_where_used(demo_build):
    html = (demo_build.out_dir / "report.html").read_text(encoding="utf-8")
    refs = html.split('id="references"', 1)[1].split("</section>", 1)[0]
    entries = re.findall(r'<li id="ref-(\d+)">([^<]+)', refs)
    assert entries
    known = {text for _, text, _ in PUBLICATIONS}
    for n, text in entries:
        assert html_lib.unescape(text).strip() in known
        assert "definition" not in text.lower() and "ohm's law" not in text.lower()
        cited_before = html.split('id="references"', 1)[0]
        assert f'href="#ref-{n}"' in cited_before, f"reference {n} is never cited"


def test_body_only_pdf_is_shorter_and_the_html_keeps_everything(demo_build, tmp_path):
    pypdf = pytest.importorskip("pypdf")
    full = len(pypdf.PdfReader(demo_build.out_dir / "report.pdf").pages)
    assert main(["build", str(DEMO), "-o", str(tmp_path), "--body-only"]) in (0, 1)
    out = tmp_path / DEMO.stem
    body = len(pypdf.PdfReader(out / "report.pdf").pages)
    assert body < full and body <= 12
    text = "\n".join(p.extract_text() for p in pypdf.PdfReader(out / "report.pdf").pages)
    assert "Open points" in text and "Appendix A" not in text
    html = (out / "report.html").read_text(encoding="utf-8")
    for section in ("calculations", "waveforms", "worst-case", "traceability", "references"):
        assert f'id="{section}"' in html


def test_split_supply_shows_both_rails_in_one_row(tmp_path):
    design = build_one(SPLIT, tmp_path, pdf=False).design
    rows = stress_table(design)
    both = [r for r in rows if all(r["cells"])]
    assert both, "no stress row carries both rails"
    for r in both:
        pos, neg = (c["check"] for c in r["cells"])
        assert neg.id == "neg." + pos.id
    html = (tmp_path / SPLIT.stem / "report.html").read_text(encoding="utf-8")
    # the negative rail is not a second copy of the sections
    assert html.count("<h2>Checks</h2>") == 1 and "Negative rail: " not in html.split(
        'id="calculations"', 1)[1].split('id="waveforms"', 1)[0]
