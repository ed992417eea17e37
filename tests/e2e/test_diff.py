"""docgen diff: requirement, value, part, check and caution changes between two versions of a spec.

The specs are written into tmp_path from the demo spec (invented demo data) with one field
changed, so each test knows exactly which requirement moved.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest

from docgen.cli import main
from docgen.errors import SpecError, SpecIssue
from docgen.jobs.diff_changes import compare
from docgen.jobs.diff_sides import load_side

from ..conftest import DEMO

DEMO_TEXT = DEMO.read_text(encoding="utf-8")


def _with_parts_folder(folder: Path) -> None:
    """Copy the demo's parts folder next to specs written from the demo text, so a relative
    `[parts] library` reference in it resolves as it does beside the demo."""
    source = DEMO.parent / "parts"
    if source.is_dir() and not (folder / "parts").exists():
        shutil.copytree(source, folder / "parts")


def _spec(tmp_path, name: str, text: str):
    _with_parts_folder(tmp_path)
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def _replace(text: str, old: str, new: str) -> str:
    assert text.count(old) == 1, f"{old!r} must occur once in the demo spec"
    return text.replace(old, new)


def _without_parts_table(text: str) -> str:
    """The spec text with its [parts] table (if any) removed."""
    return re.sub(r"(?ms)^\[parts\]\n.*?(?=^\[|\Z)", "", text)


def _with_fixed_capacitor(text: str) -> str:
    """The demo with its reservoir capacitor fixed, so the ripple requirement cannot resize it."""
    return text + '\n[reservoir]\ncapacitance = "3300 uF"\nvoltage_rating = "35 V"\n'


def test_a_file_against_itself_has_no_changes(capsys):
    assert main(["diff", str(DEMO), str(DEMO)]) == 0
    out, err = capsys.readouterr()
    assert "no changes to requirements, values, parts, checks or cautions" in out
    assert err == ""


def test_same_quantity_written_differently_is_no_change(tmp_path, capsys):
    old = _spec(tmp_path, "old.toml", DEMO_TEXT)
    new = _spec(tmp_path, "new.toml", "# a comment\n" + _replace(
        DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "0.04 A"'))
    assert main(["diff", str(old), str(new)]) == 0
    assert "no changes" in capsys.readouterr().out


def test_higher_load_current_changes_capacitor_transformer_and_checks(tmp_path, capsys):
    old = _spec(tmp_path, "old.toml", DEMO_TEXT)
    new = _spec(tmp_path, "new.toml",
                _replace(DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "60 mA"'))
    assert main(["diff", str(old), str(new)]) == 1
    out = capsys.readouterr().out
    assert re.search(r"output\[0\]\.load_max\s+40 mA -> 60 mA", out)

    report = compare(load_side(old), load_side(new))
    assert [c.path for c in report.requirements] == ["output[0].load_max"]
    values = {v.id: v for v in report.values}
    # More current for the same ripple needs more capacitance: C = I / (2 f dV) for a full-wave
    # rectifier (common practice), so the required capacitance grows by the current ratio.
    c_req = values["reservoir.c_required"]
    assert c_req.percent is not None and c_req.percent > 0
    assert "reservoir.c_required" in out and "transformer.va_needed" in out
    # The transformer's VA need grows in proportion to the current it delivers.
    assert values["transformer.va_needed"].percent > 0
    # 50 % more load: the capacitor or the transformer of the bill of materials must grow
    # (which one depends on the steps of the parts library)
    refs = {p.ref for p in report.parts} & {"C1", "T1"}
    assert refs
    for ref in refs:
        assert re.search(rf"^  {ref} \((capacitor|transformer)\)", out, re.M)
    # the checks that depend on the load current moved
    moved = {c.id for c in report.checks}
    assert {"check.zener_power", "check.transformer_current"} <= moved
    assert "check.transformer_current" in out


def test_threshold_hides_small_value_moves(tmp_path):
    old = _spec(tmp_path, "old.toml", DEMO_TEXT)
    new = _spec(tmp_path, "new.toml",
                _replace(DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "60 mA"'))
    a, b = load_side(old), load_side(new)
    fine = compare(a, b, 1e-9)
    coarse = compare(a, b, 0.2)
    assert len(coarse.values) < len(fine.values)
    for v in coarse.values:
        # |b - a| > 0.2 max(|a|, |b|) implies |b - a| / |a| > 20 %
        assert v.percent is None or abs(v.percent) > 20
    assert {v.id for v in coarse.values} <= {v.id for v in fine.values}
    # the threshold filters values and margins, never the requirement changes themselves
    assert [c.path for c in coarse.requirements] == ["output[0].load_max"]
    assert [c.path for c in compare(a, load_side(_spec(tmp_path, "tiny.toml", _replace(
        DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "40.001 mA"'))), 0.5).requirements] == [
        "output[0].load_max"]


def test_tighter_ripple_limit_flips_the_ripple_check(tmp_path, capsys):
    base = _with_fixed_capacitor(DEMO_TEXT)
    old = _spec(tmp_path, "old.toml", base)
    old_side = load_side(old)
    ripple = next(c for c in old_side.design.checks if c.id == "check.output_ripple")
    assert ripple.status != "fail"
    # half the ripple this fixed capacitor gives: the check must now fail
    tight = f'ripple_max = "{ripple.value * 1e3 / 2:.3f} mV"'
    new = _spec(tmp_path, "new.toml", _replace(base, 'ripple_max = "50 mV"', tight))
    report = compare(old_side, load_side(new))
    flipped = {c.id: c for c in report.flipped}
    assert "check.output_ripple" in flipped
    row = flipped["check.output_ripple"]
    assert row.old_status == ripple.status and row.new_status == "fail"
    assert row.old_margin > 0 > row.new_margin
    assert report.new.status == "fail"

    assert main(["diff", str(old), str(new)]) == 1
    out = capsys.readouterr().out
    assert "checks that changed status: " in out
    assert re.search(r"check\.output_ripple .* -> FAIL -\d", out)
    assert "status: WARN -> FAIL" in out or f"status: {old_side.status.upper()} -> FAIL" in out


def test_infeasible_side_is_reported_as_such(tmp_path, capsys):
    # A 6 V secondary peaks near 8.5 V, below the 9.1 V zener: no resistor can regulate.
    old = _spec(tmp_path, "old.toml", DEMO_TEXT)
    new = _spec(tmp_path, "new.toml",
                DEMO_TEXT + '\n[transformer]\nsecondary = "6 V"\nva = "10 VA"\n')
    assert main(["diff", str(old), str(new)]) == 1
    out = capsys.readouterr().out
    assert "-> INFEASIBLE (" in out
    assert "the new design is infeasible" in out
    assert "transformer.secondary" in out


def test_project_fields_are_listed_but_do_not_count(tmp_path, capsys):
    old = _spec(tmp_path, "old.toml", DEMO_TEXT)
    new = _spec(tmp_path, "new.toml", _replace(DEMO_TEXT, 'revision = "B"', 'revision = "C"'))
    assert main(["diff", str(old), str(new)]) == 0
    out = capsys.readouterr().out
    assert re.search(r"project\.revision\s+B -> C", out)


def test_html_report_is_self_contained_escaped_and_never_overwrites_other_files(tmp_path, capsys):
    old = _spec(tmp_path, "old.toml", DEMO_TEXT)
    new = _spec(tmp_path, "new.toml", _replace(
        _replace(DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "60 mA"'),
        'revision = "B"', 'revision = "<b>C</b>"'))
    target = tmp_path / "changes.html"
    assert main(["diff", str(old), str(new), "-o", str(target)]) == 1
    html = target.read_text(encoding="utf-8")
    assert not re.search(r"""(src|href)=["'](https?:|//|file:)""", html)
    assert "<link" not in html and "<script" not in html
    assert "&lt;b&gt;C&lt;/b&gt;" in html and "<b>C</b>" not in html
    assert "output[0].load_max" in html and "reservoir.c_required" in html and "C1" in html
    # an earlier change report is replaced ...
    assert main(["diff", str(old), str(old), "-o", str(target)]) == 0
    assert "No changes" in target.read_text(encoding="utf-8")
    # ... but no other file, and never an input
    notes = _spec(tmp_path, "notes.html", "<p>my notes</p>")
    capsys.readouterr()
    assert main(["diff", str(old), str(new), "-o", str(notes)]) == 2
    assert notes.read_text(encoding="utf-8") == "<p>my notes</p>"
    assert main(["diff", str(old), str(new), "-o", str(new)]) == 2
    err = capsys.readouterr().err
    assert "not a docgen change report" in err and "Traceback" not in err


@pytest.mark.parametrize(
    ("argv", "needle"),
    [(["diff", "ONE"], "diff takes two specs"),
     (["diff", "ONE", "ONE", "--rev", "HEAD"], "takes one SPEC")],
)
def test_wrong_number_of_specs_is_bad_input(argv, needle, capsys):
    argv = [str(DEMO) if a == "ONE" else a for a in argv]
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert needle in err and len(err.strip().splitlines()) == 1


def test_invalid_spec_names_file_and_field(tmp_path, capsys):
    bad = _spec(tmp_path, "bad.toml",
                _replace(DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "40 V"'))
    assert main(["diff", str(DEMO), str(bad)]) == 2
    err = capsys.readouterr().err
    assert "bad.toml" in err and "output[0].load_max" in err and "Traceback" not in err


# --------------------------------------------------------------------------- --rev

def _git(repo, *args: str) -> None:
    subprocess.run(
        ["git", "-c", "user.name=docgen test", "-c", "user.email=test@example.invalid",
         "-c", "commit.gpgsign=false", "-c", "init.defaultBranch=main", *args],
        cwd=repo, check=True, capture_output=True)


@pytest.fixture
def repo(tmp_path):
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    root = tmp_path / "repo"
    (root / "specs").mkdir(parents=True)
    _git(root, "init", "-q")
    spec = root / "specs" / "hub.toml"
    spec.write_text(DEMO_TEXT, encoding="utf-8")
    _with_parts_folder(root / "specs")
    _git(root, "add", "specs")
    _git(root, "commit", "-q", "-m", "demo spec")
    return spec


def test_rev_compares_with_the_committed_content(repo, capsys, monkeypatch):
    monkeypatch.chdir(repo.parent.parent)  # run from the repository root, path with a folder
    assert main(["diff", "specs/hub.toml", "--rev", "HEAD"]) == 0
    assert "no changes" in capsys.readouterr().out

    repo.write_text(_replace(DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "50 mA"'),
                    encoding="utf-8")
    before = subprocess.run(["git", "status", "--porcelain"], cwd=repo.parent,
                            capture_output=True, text=True, check=True).stdout
    assert main(["diff", "specs/hub.toml", "--rev", "HEAD"]) == 1
    out = capsys.readouterr().out
    assert "old: specs/hub.toml at HEAD" in out
    assert re.search(r"output\[0\]\.load_max\s+40 mA -> 50 mA", out)
    # nothing was checked out or staged
    after = subprocess.run(["git", "status", "--porcelain"], cwd=repo.parent,
                           capture_output=True, text=True, check=True).stdout
    assert before == after
    assert 'load_max = "50 mA"' in repo.read_text(encoding="utf-8")


def test_rev_errors_name_the_file_and_revision(repo, tmp_path, capsys):
    assert main(["diff", str(repo), "--rev", "no-such-rev"]) == 2
    err = capsys.readouterr().err
    assert str(repo) in err and "--rev no-such-rev" in err and "Traceback" not in err
    assert len(err.strip().splitlines()) == 1

    assert main(["diff", str(repo), "--rev=--output=x"]) == 2
    assert "expected a git revision" in capsys.readouterr().err

    outside = _spec(tmp_path, "outside.toml", DEMO_TEXT)
    assert main(["diff", str(outside), "--rev", "HEAD"]) == 2
    err = capsys.readouterr().err
    assert "outside.toml" in err and "git cannot read the file" in err


def test_rev_with_an_invalid_old_version_names_the_revision(repo, capsys):
    repo.write_text(_replace(DEMO_TEXT, 'load_max = "40 mA"', 'load_max = "40 V"'),
                    encoding="utf-8")
    _git(repo.parent.parent, "commit", "-q", "-am", "broken")
    repo.write_text(DEMO_TEXT, encoding="utf-8")
    assert main(["diff", str(repo), "--rev", "HEAD"]) == 2
    err = capsys.readouterr().err
    assert f"{repo} at HEAD" in err and "output[0].load_max" in err


def test_rev_reads_a_referenced_parts_library_at_the_same_revision(repo, monkeypatch):
    import docgen.jobs.diff_sides
    import docgen.spec

    root = repo.parent.parent
    (root / "parts").mkdir()
    (root / "specs" / "local.toml").write_text("# v1 local\n", encoding="utf-8")
    (root / "parts" / "shared.toml").write_text("# v1 shared\n", encoding="utf-8")
    repo.write_text(_without_parts_table(DEMO_TEXT)
                    + '\n[parts]\nlibrary = "../parts/shared.toml"\n', encoding="utf-8")
    _git(root, "add", "-A")
    _git(root, "commit", "-q", "-m", "spec with a library")
    (root / "parts" / "shared.toml").write_text("# v2 shared, not committed\n", encoding="utf-8")

    seen = {}

    def fake_loader(path):
        # the old spec sees the library as it was at the revision, at the same relative place
        seen["library"] = (Path(path).parent / "../parts/shared.toml").read_bytes()
        seen["spec"] = Path(path).read_text(encoding="utf-8")
        raise SpecError(str(path), [SpecIssue("", "stop here")])

    monkeypatch.setattr(docgen.spec, "load_requirements", fake_loader)
    with pytest.raises(SpecError) as info:
        docgen.jobs.diff_sides.load_rev_side(repo, "HEAD")
    assert info.value.path == f"{repo} at HEAD"
    assert seen["library"] == b"# v1 shared\n"
    assert 'library = "../parts/shared.toml"' in seen["spec"]
