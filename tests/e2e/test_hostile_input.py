"""Regression cases of issue 17: each reproducer of a crash, bypass or stale file, kept as a test.

Every case states the expected verdict: exit 2 with one short message naming the file and the
field for bad input, exit 1 only for an infeasible design (with its numbers), and no traceback.
"""

from __future__ import annotations

import fcntl
import os
import subprocess
import sys
from pathlib import Path

import pytest

from docgen.cli import main

from ..conftest import DEMO, DEMO_STANDALONE, ROOT
from .test_robustness import _replace

BASE = DEMO_STANDALONE.replace("samples = 400", "samples = 0")  # no Monte Carlo: faster


def _check(tmp_path: Path, text: str, capsys, name: str = "spec.toml") -> tuple[int, str, str]:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    code = main(["check", str(path)])
    out, err = capsys.readouterr()
    assert "Traceback" not in out + err
    return code, out, err


def _bad(tmp_path, text, capsys, *fragments: str) -> str:
    """Exit 2, one message naming the file and each of ``fragments``, short and printable."""
    code, out, err = _check(tmp_path, text, capsys)
    assert code == 2, out + err
    assert err.startswith("docgen: error: ") and "spec.toml" in err
    for fragment in fragments:
        assert fragment in err, (fragment, err[:500])
    assert len(err) < 4000 and "\x1b" not in err
    return err


# --------------------------------------------------------------------------- numbers and shape

def test_integer_too_wide_for_a_float_is_refused_naming_the_field(tmp_path, capsys):
    _bad(tmp_path, _replace(BASE, "output", "load_max", str(10**400)), capsys,
         "output[0].load_max", "ordinary size", "401 digits")


def test_integer_too_wide_in_the_parts_library_is_refused(tmp_path):
    from docgen.errors import SpecError
    from docgen.parts.library import parse_library

    text = ('schema = 1\n[library]\nname = "t"\nsource = "test"\n[[fuse]]\nid = "F"\n'
            f'current = {10**400}\n')
    with pytest.raises(SpecError, match="ordinary size"):
        parse_library(text, "lib.toml")


def test_integer_literal_over_4300_digits_is_refused(tmp_path, capsys):
    _bad(tmp_path, _replace(BASE, "output", "load_max", "1" * 4301), capsys, "integer literal")


@pytest.mark.parametrize("value", ["[" * 2000 + "]" * 2000, "{a=" * 1500 + "1" + "}" * 1500])
def test_deep_nesting_is_refused_in_one_short_line(tmp_path, capsys, value):
    err = _bad(tmp_path, BASE + f"x = {value}\n", capsys, "nested more than 32 deep")
    assert err.count("\n") == 1


def test_very_long_dotted_key_is_refused_before_the_parser(tmp_path, capsys, monkeypatch):
    # the TOML parser's cost grows with the square of a dotted key's parts (47 s for 20,000);
    # the shape check must refuse it without handing it to the parser at all
    import docgen.textfile as textfile

    def no_parser(text):
        raise AssertionError("the parser was reached")

    monkeypatch.setattr(textfile.tomllib, "loads", no_parser)
    _bad(tmp_path, BASE + ".".join(["a"] * 20000) + " = 1\n", capsys, "dotted key of more than")
    _bad(tmp_path, BASE + '"a".' * 100 + "b = 1\n", capsys, "dotted key of more than")


def test_unicode_digits_are_not_numbers(tmp_path, capsys):
    _bad(tmp_path, _replace(BASE, "output", "load_max", '"\u0664\u0660 mA"'), capsys,
         "output[0].load_max", "expected")


@pytest.mark.parametrize("value", ['"\\r40 mA"', '"40 mA\\n"', '"\\u001c40 mA"'])
def test_control_characters_around_a_number_are_refused(tmp_path, capsys, value):
    # found by bench/robustness.py: regular-expression whitespace took \r and \x1c as spaces
    _bad(tmp_path, _replace(BASE, "output", "load_max", value), capsys, "output[0].load_max")


def test_monte_carlo_samples_have_an_upper_bound(tmp_path, capsys):
    _bad(tmp_path, BASE.replace("samples = 0", "samples = 100000"), capsys,
         "analysis.samples", "at most 10000")


def test_utf8_byte_order_mark_gets_a_hint(tmp_path, capsys):
    _bad(tmp_path, "\ufeff" + BASE, capsys, "byte-order mark", "without BOM")


def test_zero_winding_resistance_is_refused_by_the_schema(tmp_path, capsys):
    text = BASE.replace("[rectifier]", "[transformer]\nwinding_resistance = 0\n\n[rectifier]")
    _bad(tmp_path, text, capsys, "transformer.winding_resistance", "greater than zero")


# ----------------------------------------------------------------------- infeasible, not a crash

@pytest.mark.parametrize("extra", ['discharge_time = "0.1 s"', 'safe_voltage = "1e-9 V"'])
def test_bleeder_with_odd_values_is_infeasible_with_its_numbers(tmp_path, capsys, extra):
    code, out, err = _check(tmp_path, BASE + f"\n[protection]\nbleeder = true\n{extra}\n",
                            capsys)
    assert code == 1, out + err
    assert "INFEASIBLE" in out and "bleeder.p_rating" in out and " W" in out


def test_mains_of_an_eighth_of_a_volt_is_infeasible_not_a_crash(tmp_path, capsys):
    # found by chance by the random property test on a fresh machine (issue 17)
    code, out, err = _check(tmp_path, _replace(BASE, "mains", "nominal", "0.125"), capsys)
    assert code == 1, out + err
    assert "INFEASIBLE" in out and "fuse" in out


def test_undefined_values_are_reported_without_python_wording():
    from docgen.equations import SCALE
    from docgen.trace import Ledger, UndefinedValue
    from docgen.undefined import undefined_text

    L = Ledger()
    L.given("a.v", "v", 2.0, "V", "A voltage")
    L.given("a.k", "k", 0.0, "", "A factor")
    with pytest.raises(UndefinedValue) as info:
        L.calc("a.x", SCALE, "x", "V", "A quotient", {"v": "a.v", "k": "a.k"},
               lambda v, k: v / k)
    text = undefined_text(info.value)
    assert "division by zero" in text and "a.v = 2 V" in text and "A quotient (a.x)" in text
    assert "float division" not in undefined_text(ZeroDivisionError("float division by zero"))


# --------------------------------------------------------------------------- files of any kind

@pytest.mark.parametrize("command", ["check", "build"])
def test_dev_zero_and_a_fifo_are_refused_without_reading(tmp_path, command):
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    for target in ("/dev/zero", str(fifo)):
        args = [command, target] + (["-o", str(tmp_path / "out")] if command == "build" else [])
        proc = subprocess.run([sys.executable, "-m", "docgen.cli", *args], capture_output=True,
                              text=True, timeout=60)
        assert proc.returncode == 2, proc.stderr
        assert "not a regular file" in proc.stderr and "Traceback" not in proc.stderr


def test_diff_report_target_that_is_a_fifo_is_refused(tmp_path, capsys):
    fifo = tmp_path / "report.html"
    os.mkfifo(fifo)
    spec = tmp_path / "s.toml"
    spec.write_text(BASE)
    assert main(["diff", str(spec), str(spec), "-o", str(fifo)]) == 2
    assert "not a regular file" in capsys.readouterr().err


def test_bounded_read_stops_even_when_the_size_is_unknown(tmp_path):
    from docgen.errors import SpecError
    from docgen.textfile import read_bounded

    big = tmp_path / "big.toml"
    big.write_bytes(b"#" * 5000)
    with pytest.raises(SpecError, match="at most 1000"):
        read_bounded(big, 1000)
    assert read_bounded(big, 5000) == b"#" * 5000


def test_parts_library_has_a_size_limit(tmp_path):
    from docgen.errors import SpecError
    from docgen.parts.library import MAX_BYTES, load_library

    lib = tmp_path / "huge.toml"
    lib.write_bytes(b"schema = 1\n" + b"# padding\n" * (MAX_BYTES // 10 + 1))
    with pytest.raises(SpecError, match="at most"):
        load_library(lib)


# --------------------------------------------------------------------------- confinement

def test_outside_git_the_project_is_the_specs_own_folder(tmp_path, capsys):
    from docgen.parts.location import project_root

    folder = tmp_path / "specs"
    folder.mkdir()
    assert project_root(folder) == folder.resolve()
    (tmp_path / "outside.toml").write_text('schema = 1\nsecret_key_name = 1\n')
    for ref in ("../outside.toml", str(tmp_path / "outside.toml"), "a\\u0000b"):
        spec = folder / "spec.toml"
        spec.write_text(BASE + f'\n[parts]\nlibrary = "{ref}"\n')
        for command in (["check"], ["build", "-o", str(tmp_path / "out"), "--no-pdf"]):
            assert main([command[0], str(spec), *command[1:]]) == 2
            err = capsys.readouterr().err
            assert "parts.library" in err and "secret_key_name" not in err
    assert not (tmp_path / "out" / "spec").exists()  # refused input leaves no output folder


def _git(cwd: Path, *args: str) -> None:
    subprocess.run(["git", "-c", "user.name=t", "-c", "user.email=t@t", *args], cwd=cwd,
                   check=True, capture_output=True)


@pytest.mark.skipif(subprocess.run(["git", "--version"], capture_output=True).returncode != 0,
                    reason="git not installed")
def test_diff_rev_confines_the_revision_side_library(tmp_path, capsys):
    repo = tmp_path / "repo"
    repo.mkdir()
    _git(repo, "init", "-q")
    secret = tmp_path / "secret.toml"
    secret.write_text("schema = 1\nprivate_key_name = 1\n")
    spec = repo / "spec.toml"
    spec.write_text(BASE + '\n[parts]\nlibrary = "../secret.toml"\n')
    _git(repo, "add", "spec.toml")
    _git(repo, "commit", "-q", "-m", "x")
    spec.write_text(BASE)
    assert main(["diff", str(spec), "--rev", "HEAD"]) == 2
    out, err = capsys.readouterr()
    assert "parts.library" in err and "outside the project" in err
    assert "private_key_name" not in out + err and "docgen-diff-" not in out + err


# --------------------------------------------------------------------------- output folders

INFEASIBLE = '\n[protection]\nbleeder = true\ndischarge_time = "0.1 s"\n'


def test_infeasible_rebuild_removes_the_previous_report_and_says_so(tmp_path, capsys):
    spec = tmp_path / "s.toml"
    out = tmp_path / "out"
    spec.write_text(BASE)
    assert main(["build", str(spec), "-o", str(out), "--no-pdf"]) in (0, 1)
    folder = out / "s"
    assert (folder / "report.html").is_file() and (folder / "plots").is_dir()
    (folder / "my-notes.txt").write_text("the user's own file")
    (folder / "report.pdf").write_bytes(b"%PDF old")  # as if from an earlier PDF build
    capsys.readouterr()
    spec.write_text(BASE + INFEASIBLE)
    assert main(["build", str(spec), "-o", str(out), "--no-pdf"]) == 1
    said = capsys.readouterr().out
    assert "INFEASIBLE" in said and "removed stale outputs" in said and "report.pdf" in said
    left = sorted(p.name for p in folder.iterdir())
    assert left == [".docgen-stamp.json", ".docgen.lock", "my-notes.txt", "results.json"]
    assert (folder / "my-notes.txt").read_text() == "the user's own file"
    assert spec.read_text() == BASE + INFEASIBLE  # the requirements file is never written


def test_a_second_build_into_a_locked_folder_is_refused(tmp_path, capsys):
    out = tmp_path / "out"
    folder = out / DEMO.stem
    folder.mkdir(parents=True)
    holder = subprocess.Popen(
        [sys.executable, "-c", "import fcntl, os, sys, time\n"
         f"fd = os.open({str(folder / '.docgen.lock')!r}, os.O_RDWR | os.O_CREAT)\n"
         "fcntl.flock(fd, fcntl.LOCK_EX)\nprint('locked', flush=True)\ntime.sleep(60)\n"],
        stdout=subprocess.PIPE, text=True)
    try:
        assert holder.stdout.readline().strip() == "locked"
        assert main(["build", str(DEMO), "-o", str(out), "--no-pdf"]) == 2
        assert "another docgen build" in capsys.readouterr().err
    finally:
        holder.kill()
        holder.wait()
        holder.stdout.close()
    # the kernel dropped the lock with its holder: the folder can be locked again
    fd = os.open(folder / ".docgen.lock", os.O_RDWR)
    fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
    os.close(fd)


def test_up_to_date_is_judged_by_content_and_leftover_temp_files_are_removed(tmp_path, capsys):
    from docgen.jobs.incremental import build_incremental

    spec = tmp_path / "s.toml"
    spec.write_text(BASE)
    out = tmp_path / "out"
    first = build_incremental(spec, out, pdf=False)
    assert first.action == "built"
    html = out / "s" / "report.html"
    data = html.read_bytes()
    html.write_bytes(data[:-8] + b"<!--x-->")  # same size, other content
    leftover = out / "s" / ".report.html.ab12cd_9.tmp"  # as a SIGKILLed writer leaves it
    leftover.write_text("partial")
    mine = out / "s" / "mine.tmp"
    mine.write_text("not docgen's")
    again = build_incremental(spec, out, pdf=False)
    assert again.action == "built" and "output changed: report.html" in again.why
    assert html.read_bytes() == data
    assert not leftover.exists() and mine.read_text() == "not docgen's"
    assert build_incremental(spec, out, pdf=False).action == "up to date"


def test_bom_cells_cannot_run_as_spreadsheet_formulas(tmp_path):
    import csv
    import io

    from docgen.jobs.build import build_one
    from docgen.render.bom import _cell, neutralise

    assert neutralise("=HYPERLINK(1)") == "'=HYPERLINK(1)"
    assert neutralise("@SUM(A1)") == "'@SUM(A1)"
    assert neutralise("+1+2") == "'+1+2"
    assert neutralise("-1+2") == "'-1+2"
    assert _cell(-12.5) == "-12.5"  # a negative margin is written as a number, not text
    lib = (ROOT / "specs" / "parts" / "demo-parts.toml").read_text()
    lib = lib.replace('id = "', 'id = "=X')
    (tmp_path / "parts.toml").write_text(lib)
    spec = tmp_path / "s.toml"
    spec.write_text(BASE + '\n[parts]\nlibrary = "parts.toml"\n')
    result = build_one(spec, tmp_path / "out", pdf=False)
    rows = list(csv.reader(io.StringIO((result.out_dir / "bom.csv").read_text())))
    cells = [c for row in rows for c in row]
    assert any(c.startswith("'=X") for c in cells)
    assert not any(c.startswith(("=", "+", "@")) for c in cells)


# --------------------------------------------------------------------------- error output

def test_terminal_escapes_in_keys_are_shown_escaped(tmp_path, capsys):
    err = _bad(tmp_path, BASE + '\n["\\u001b[31mred\\u202e"]\nx = 1\n', capsys, "unknown key")
    assert "\\x1b[31mred" in err and "\u202e" not in err


def test_huge_value_and_many_unknown_keys_are_clipped(tmp_path, capsys):
    err = _bad(tmp_path, _replace(BASE, "output", "load_max", '"' + "x" * 100_000 + '"'), capsys,
               "100000 characters")
    assert len(err) < 400 and err.count("'") % 2 == 0  # the quotes stay paired
    many = BASE.replace("[mains]", "[mains]\n" + "".join(f"k{i} = 1\n" for i in range(20000)))
    err = _bad(tmp_path, many, capsys, "20000 problems", "and 19980 more problems")
    assert err.count("\n") == 22


def test_tiny_numbers_are_printed_short(tmp_path, capsys):
    err = _bad(tmp_path, _replace(BASE, "output", "load_max", "1e-308"), capsys, "1e-308")
    assert len(err) < 200
    from docgen.units import format_quantity

    assert format_quantity(1e-308, "A") == "1e-308 A"
    assert format_quantity(0.047, "A") == "47 mA"  # everyday values unchanged


# ------------------------------------------------------- found by bench/robustness.py this round
def test_a_supply_with_no_nominal_steady_state_is_infeasible_not_a_traceback(tmp_path, capsys):
    """A winding resistance of 839 kohm leaves the engine no steady state at the nominal corner:
    the efficiency would be NaN; the design is reported infeasible (exit 1) and says why."""
    assert "\n[transformer]" not in BASE
    code, out, err = _check(tmp_path, BASE + '\n[transformer]\nwinding_resistance = 839021.8\n',
                            capsys)
    assert code == 1, out + err
    assert "INFEASIBLE" in out + err and "nominal corner" in out + err


def test_a_vanishing_output_voltage_is_infeasible_not_a_traceback(tmp_path, capsys):
    """1e-308 V: no E24 zener candidate used to survive rounding to six decimals."""
    text = BASE.replace('voltage = "9.1 V"', "voltage = 1e-308", 1)
    assert text != BASE
    code, out, err = _check(tmp_path, text, capsys)
    assert code in (1, 2), out + err
