"""Batch and incremental builds: parallel workers, stamps, up-to-date skips, --force, summaries.

The specs are variations of the demo spec (invented demo data) written into a temporary folder.
Builds run without the PDF. Paths are relative to the temporary folder (the tests chdir into
it), so a built tree copied to another folder is still up to date there.
"""

from __future__ import annotations

import io
import json
import re
import shutil
from pathlib import Path

import pytest

from docgen.cli import main
from docgen.jobs import incremental
from docgen.jobs.batch import Progress
from docgen.jobs.incremental import STAMP_NAME, Outcome

from ..conftest import DATA, DEMO

DEMO_TEXT = DEMO.read_text(encoding="utf-8")
LIBRARY = DEMO.parent / "parts" / "demo-parts.toml"


def _variant(load: str) -> str:
    assert DEMO_TEXT.count('load_max = "40 mA"') == 1
    return DEMO_TEXT.replace('load_max = "40 mA"', f'load_max = "{load}"')


def _without_parts_table(text: str) -> str:
    """The spec text with its [parts] table (if any) removed."""
    return re.sub(r"(?ms)^\[parts\]\n.*?(?=^\[|\Z)", "", text)


def _with_parts_folder(folder: Path) -> None:
    """Copy the demo's parts folder beside specs written from the demo text."""
    source = DEMO.parent / "parts"
    if source.is_dir() and not (folder / "parts").exists():
        shutil.copytree(source, folder / "parts")


def _mtimes(root: Path) -> dict[str, int]:
    return {str(p.relative_to(root)): p.stat().st_mtime_ns for p in root.rglob("*") if p.is_file()}


def _summary_rows(out: str) -> dict[str, list[str]]:
    """spec -> [status, failing, time, build] from the summary table."""
    rows = {}
    for line in out.splitlines():
        m = re.match(r"(specs/\S+)\s+(\S+)\s+(.+?)\s+(\S+ s|-)\s+(built|up to date|error)$", line)
        if m:
            rows[m.group(1)] = [m.group(2), m.group(3), m.group(4), m.group(5)]
    return rows


@pytest.fixture(scope="module")
def built_tree(tmp_path_factory):
    """specs/{a,b}.toml built once into out/ with two worker processes."""
    root = tmp_path_factory.mktemp("batch")
    (root / "specs").mkdir()
    _with_parts_folder(root / "specs")
    (root / "specs" / "a.toml").write_text(_variant("40 mA"), encoding="utf-8")
    (root / "specs" / "b.toml").write_text(_variant("25 mA"), encoding="utf-8")
    mp = pytest.MonkeyPatch()
    mp.chdir(root)
    try:
        import contextlib

        out, err = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = main(["build", "specs", "-o", "out", "--no-pdf", "-j", "2"])
    finally:
        mp.undo()
    return root, code, out.getvalue(), err.getvalue()


@pytest.fixture
def tree(built_tree, tmp_path, monkeypatch):
    """A private copy of the built tree (same bytes, same relative paths), as the cwd."""
    root = tmp_path / "w"
    shutil.copytree(built_tree[0], root)
    monkeypatch.chdir(root)
    return root


def test_cold_batch_builds_every_spec_in_parallel_and_stamps_it(built_tree):
    root, code, out, err = built_tree
    assert code in (0, 1)
    rows = _summary_rows(out)
    assert set(rows) == {"specs/a.toml", "specs/b.toml"}
    assert all(r[3] == "built" for r in rows.values())
    assert "2 specs: 2 built, 0 up to date, 0 errors" in out
    # one progress line per spec on stderr, counted
    assert len(re.findall(r"^\[[12]/2\] specs/[ab]\.toml: built in ", err, re.M)) == 2
    for stem in ("a", "b"):
        stamp = json.loads((root / "out" / stem / STAMP_NAME).read_text())
        assert stamp["state"] == "built" and re.fullmatch(r"[0-9a-f]{64}", stamp["key"])
        assert stamp["inputs"]["spec"]["path"] == f"specs/{stem}.toml"
        assert stamp["inputs"]["options"] == {"pdf": False}
        assert "report.html" in stamp["outputs"] and "results.json" in stamp["outputs"]
        results = json.loads((root / "out" / stem / "results.json").read_text())
        assert stamp["result"]["status"] == results["status"]
        for name, info in stamp["outputs"].items():
            assert (root / "out" / stem / name).stat().st_size == info["size"]


def test_second_build_with_nothing_changed_rebuilds_nothing(tree, capsys):
    before = _mtimes(tree / "out")
    code = main(["build", "specs", "-o", "out", "--no-pdf"])
    out, err = capsys.readouterr()
    assert code in (0, 1)
    assert "2 specs: 0 built, 2 up to date, 0 errors" in out
    assert all(r[3] == "up to date" for r in _summary_rows(out).values())
    assert err.count("up to date") == 2
    assert _mtimes(tree / "out") == before  # no output and no stamp was rewritten


def test_single_spec_build_uses_the_same_stamp(tree, capsys):
    before = _mtimes(tree / "out")
    assert main(["build", "specs/a.toml", "-o", "out", "--no-pdf"]) in (0, 1)
    assert "(up to date; --force rebuilds)" in capsys.readouterr().out
    assert _mtimes(tree / "out") == before


def test_editing_one_spec_rebuilds_only_that_spec(tree, capsys):
    (tree / "specs" / "b.toml").write_text(_variant("30 mA"), encoding="utf-8")
    stamp_a = (tree / "out" / "a" / STAMP_NAME).stat().st_mtime_ns
    assert main(["build", "specs", "-o", "out", "--no-pdf", "-j", "1"]) in (0, 1)
    out, err = capsys.readouterr()
    rows = _summary_rows(out)
    assert rows["specs/a.toml"][3] == "up to date" and rows["specs/b.toml"][3] == "built"
    assert "specs/b.toml: built in" in err and "requirements file changed" in err
    assert (tree / "out" / "a" / STAMP_NAME).stat().st_mtime_ns == stamp_a
    results = json.loads((tree / "out" / "b" / "results.json").read_text())
    assert results["values"]["output.i_max"]["value"] == pytest.approx(0.030)


def test_force_rebuilds_everything(tree, capsys):
    before = _mtimes(tree / "out")
    assert main(["build", "specs", "-o", "out", "--no-pdf", "--force", "-j", "1"]) in (0, 1)
    out, err = capsys.readouterr()
    assert "2 specs: 2 built, 0 up to date" in out
    assert err.count("(forced)") == 2
    after = _mtimes(tree / "out")
    for stem in ("a", "b"):
        key = f"{stem}/{STAMP_NAME}"
        assert after[key] > before[key]


def test_missing_output_or_other_options_rebuild(tree, capsys, monkeypatch):
    (tree / "out" / "a" / "report.html").unlink()
    skipped, why = incremental.check_up_to_date(Path("specs/a.toml"), Path("out"), pdf=False)
    assert skipped is None and why == ["output missing: report.html"]
    skipped, why = incremental.check_up_to_date(Path("specs/b.toml"), Path("out"), pdf=True)
    assert skipped is None and why == ["options changed"]
    # a change in docgen's own source or templates makes every spec stale
    changed = dict(incremental.tool_inputs(), templates="0" * 64)
    monkeypatch.setattr(incremental, "tool_inputs", lambda: changed)
    skipped, why = incremental.check_up_to_date(Path("specs/b.toml"), Path("out"), pdf=False)
    assert skipped is None and why == ["templates changed"]


def test_a_build_that_stopped_half_way_is_not_trusted(tree):
    stamp = tree / "out" / "a" / STAMP_NAME
    data = json.loads(stamp.read_text())
    incremental.invalidate_stamp(tree / "out" / "a")
    assert stamp.exists()
    marked = json.loads(stamp.read_text())
    assert marked["state"] == "building" and marked["key"] is None
    assert marked["inputs"] == data["inputs"]
    skipped, why = incremental.check_up_to_date(Path("specs/a.toml"), Path("out"), pdf=False)
    assert skipped is None and why == ["the previous build did not finish"]


def test_bad_spec_in_a_batch_is_reported_and_the_rest_still_count(tree, capsys):
    shutil.copy(DATA / "bad-unit.toml", tree / "specs" / "bad.toml")
    assert main(["build", "specs", "-o", "out", "--no-pdf"]) == 2
    out, err = capsys.readouterr()
    assert "Traceback" not in out + err
    rows = _summary_rows(out)
    assert rows["specs/bad.toml"][0] == "ERROR" and rows["specs/bad.toml"][3] == "error"
    assert rows["specs/a.toml"][3] == "up to date"
    assert re.search(r"specs/bad\.toml: ERROR: specs/bad\.toml: output\[0\]\.load_max: ", err)
    assert "exit status 2" in out


def test_two_specs_with_one_output_folder_are_refused(tmp_path, capsys):
    for sub in ("x", "y"):
        (tmp_path / sub).mkdir()
        (tmp_path / sub / "same.toml").write_text(DEMO_TEXT, encoding="utf-8")
    code = main(["build", str(tmp_path / "x" / "same.toml"), str(tmp_path / "y" / "same.toml"),
                 "-o", str(tmp_path / "out"), "--no-pdf"])
    assert code == 2
    assert "same folder" in capsys.readouterr().err
    assert not (tmp_path / "out").exists()


def test_progress_draws_a_bar_only_on_a_terminal():
    class Tty(io.StringIO):
        def isatty(self) -> bool:
            return True

    outcome = Outcome(spec="specs/a.toml", out_dir="out/a", action="up to date", status="pass")
    plain, tty = io.StringIO(), Tty()
    for stream in (plain, tty):
        progress = Progress(4, stream)
        progress(outcome)
        progress(outcome)
        progress.close()
    assert plain.getvalue() == ("[1/4] specs/a.toml: up to date, PASS\n"
                                "[2/4] specs/a.toml: up to date, PASS\n")
    assert "[###############...............] 2/4" in tty.getvalue()
    assert tty.getvalue().endswith("\r\x1b[K")


# --------------------------------------------------------------------------- parts library

def test_changing_a_parts_library_rebuilds_only_the_specs_that_use_it(tmp_path, monkeypatch,
                                                                      capsys):
    specs = tmp_path / "specs"
    (specs / "parts").mkdir(parents=True)
    shutil.copy(LIBRARY, specs / "parts" / "lib.toml")
    base = _without_parts_table(DEMO_TEXT)
    (specs / "plain.toml").write_text(base, encoding="utf-8")
    (specs / "uses-lib.toml").write_text(
        base + '\n[parts]\nlibrary = "parts/lib.toml"\n', encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    argv = ["build", "specs", "-o", "out", "--no-pdf", "-j", "1"]
    assert main(argv) in (0, 1)
    capsys.readouterr()
    stamp = json.loads((tmp_path / "out" / "uses-lib" / STAMP_NAME).read_text())
    assert [f["role"] for f in stamp["inputs"]["files"]] == ["parts library"]
    assert stamp["inputs"]["files"][0]["path"] == "specs/parts/lib.toml"

    # touching the file without changing its bytes changes nothing (the stamp hashes content)
    lib = specs / "parts" / "lib.toml"
    lib.touch()
    assert main(argv) in (0, 1)
    assert "0 built, 2 up to date" in capsys.readouterr().out

    with open(lib, "a", encoding="utf-8") as fh:
        fh.write("\n# reviewed again (demo edit)\n")
    plain_stamp = (tmp_path / "out" / "plain" / STAMP_NAME).stat().st_mtime_ns
    assert main(argv) in (0, 1)
    out, err = capsys.readouterr()
    rows = _summary_rows(out)
    assert rows["specs/uses-lib.toml"][3] == "built"
    assert rows["specs/plain.toml"][3] == "up to date"
    assert "parts library changed (specs/parts/lib.toml)" in err
    assert (tmp_path / "out" / "plain" / STAMP_NAME).stat().st_mtime_ns == plain_stamp
