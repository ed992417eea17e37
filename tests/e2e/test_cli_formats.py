"""The command line for scripts and CI: JSON output, quiet and verbose, '-', help and completion."""

from __future__ import annotations

import io
import json
import shutil
import subprocess
import sys

import pytest

from docgen.cli import main
from docgen.cli.parser import build_parser
from docgen.progress import StageReporter, reporting, stage
from docgen.starter import REGULATORS, starter

from ..conftest import DATA, ROOT

ALL_PASS = DATA / "all-pass.toml"
FAILING = DATA / "undersized-capacitor.toml"
BAD = DATA / "bad-unit.toml"


def _conforms(doc: dict, which: str) -> None:
    """The printed JSON matches its published schema (docs/schema/cli-*.schema.json)."""
    jsonschema = pytest.importorskip("jsonschema")
    from docgen.schema import SCHEMAS

    jsonschema.Draft7Validator(SCHEMAS[which]()).validate(doc)


def _infeasible(tmp_path):
    spec = tmp_path / "infeasible.toml"
    text = (ROOT / "specs" / "bench-psu-12v-follower.toml").read_text(encoding="utf-8")
    spec.write_text(text.replace("h_fe_min = 40", "h_fe_min = 3"), encoding="utf-8")
    return spec


def test_check_json_gives_every_verdict_and_the_exit_code(tmp_path, capsys):
    spec = _infeasible(tmp_path)
    code = main(["check", "--format", "json", str(ALL_PASS), str(FAILING), str(spec), str(BAD)])
    out, err = capsys.readouterr()
    doc = json.loads(out)
    assert code == 2 and doc["exit_code"] == 2
    assert doc["format"] == "docgen-check" and doc["format_version"] == 1
    by_spec = {s["spec"]: s for s in doc["specs"]}
    assert [s["spec"] for s in doc["specs"]] == [str(ALL_PASS), str(FAILING), str(spec), str(BAD)]
    assert by_spec[str(ALL_PASS)]["status"] == "pass"
    failing = by_spec[str(FAILING)]
    assert failing["status"] == "fail" and failing["counts"]["fail"] >= 1
    worst = [c for c in failing["checks"] if c["status"] == "fail"]
    assert worst and all(isinstance(c["margin"], float) and c["margin"] < 0 for c in worst)
    assert all(c["unit"] is not None and isinstance(c["value"], float) for c in failing["checks"])
    infeasible = by_spec[str(spec)]
    assert infeasible["status"] == "infeasible"
    assert "zener.p_rating" in infeasible["reason"] and "to fix it" in infeasible["reason"]
    assert by_spec[str(BAD)]["status"] == "error"
    assert "output[0].load_max" in by_spec[str(BAD)]["reason"]
    assert "output[0].load_max" in err  # the message still reaches a person
    _conforms(doc, "check")


def test_check_json_alone_passes_a_ci_gate(capsys):
    assert main(["check", "--format", "json", str(ALL_PASS)]) == 0
    assert json.loads(capsys.readouterr().out)["exit_code"] == 0
    assert main(["check", "--format", "json", "--strict", str(FAILING)]) == 1


def test_json_on_an_error_before_any_spec(tmp_path, capsys):
    assert main(["check", "--format", "json", str(tmp_path)]) == 2
    doc = json.loads(capsys.readouterr().out)
    assert doc["exit_code"] == 2 and "no .toml" in doc["error"]
    _conforms(doc, "check")


def test_quiet_prints_nothing_and_keeps_the_exit_code(capsys):
    assert main(["check", "-q", str(FAILING)]) == 1
    out, err = capsys.readouterr()
    assert out == "" and err == ""


def test_verbose_check_lists_passing_checks_and_stage_times(capsys):
    assert main(["check", "-v", str(ALL_PASS)]) == 0
    out, err = capsys.readouterr()
    assert "PASS check." in out
    assert "sizing, corners and Monte Carlo" in err and " s\n" in err
    assert "\x1b[" not in err  # not a terminal: no live progress line


def test_stage_progress_is_live_only_on_a_terminal():
    class Tty(io.StringIO):
        def isatty(self) -> bool:
            return True

    tty, plain = Tty(), io.StringIO()
    for stream in (tty, plain):
        with reporting(StageReporter(stream, timings=False, label="a.toml")):
            with stage("plots"):
                pass
    assert "a.toml: [1] plots ..." in tty.getvalue() and tty.getvalue().endswith("\r\x1b[K")
    assert plain.getvalue() == ""
    timed = io.StringIO()
    with reporting(StageReporter(timed, timings=True)):
        with stage("plots"):
            pass
    assert timed.getvalue().startswith("  plots ") and "total of the stages" in timed.getvalue()


def test_check_reads_stdin_and_leaves_no_file(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setattr(sys, "stdin", io.TextIOWrapper(io.BytesIO(ALL_PASS.read_bytes())))
    assert main(["check", "-"]) == 0
    assert capsys.readouterr().out.startswith("<stdin>: PASS")
    assert list(tmp_path.iterdir()) == []
    monkeypatch.setattr(sys, "stdin", io.TextIOWrapper(io.BytesIO(BAD.read_bytes())))
    assert main(["check", "-"]) == 2
    assert "<stdin>: output[0].load_max" in capsys.readouterr().err
    assert list(tmp_path.iterdir()) == []


def test_new_dash_prints_and_writes_no_file(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    assert main(["new", "-", "--regulator", "follower"]) == 0
    assert capsys.readouterr().out == starter("follower")
    assert list(tmp_path.iterdir()) == []


@pytest.mark.parametrize("kind", REGULATORS)
def test_every_starter_loads_and_checks_for_its_kind(kind, tmp_path, capsys):
    from docgen.spec import load_requirements

    target = tmp_path / f"{kind}.toml"
    assert main(["new", "--regulator", kind, str(target)]) == 0
    loaded = load_requirements(target)
    assert [o.regulator for o in loaded.requirements.output] == [kind]
    assert main(["check", "--strict", str(target)]) in (0, 1)
    assert main(["check", str(target)]) == 0  # warnings at most


def test_build_json_and_batch_validates_first(tmp_path, capsys):
    specs = tmp_path / "specs"
    specs.mkdir()
    shutil.copy(ALL_PASS, specs / "a.toml")
    shutil.copy(BAD, specs / "z-bad.toml")
    code = main(["build", str(specs), "-o", str(tmp_path / "out"), "--no-pdf", "--format",
                 "json", "-j", "1"])
    out, err = capsys.readouterr()
    doc = json.loads(out)
    assert code == 2 and doc["exit_code"] == 2 and doc["format"] == "docgen-build"
    actions = {s["spec"].rsplit("/", 1)[-1]: s for s in doc["specs"]}
    assert actions["a.toml"]["action"] == "built" and actions["a.toml"]["status"] == "pass"
    assert actions["z-bad.toml"]["action"] == "error"
    # the bad file, last in order, is reported before the first build finished
    assert err.index("z-bad.toml: ERROR") < err.index("a.toml: built")
    assert (tmp_path / "out" / "a" / "bom.csv").is_file()
    assert not (tmp_path / "out" / "z-bad").exists()
    _conforms(doc, "build")


def test_diff_json(tmp_path, capsys):
    changed = tmp_path / "changed.toml"
    text = ALL_PASS.read_text()
    assert 'load_max = "15 mA"' in text
    changed.write_text(text.replace('load_max = "15 mA"', 'load_max = "18 mA"'),
                       encoding="utf-8")
    assert main(["diff", "--format", "json", str(ALL_PASS), str(ALL_PASS)]) == 0
    same = json.loads(capsys.readouterr().out)
    assert same["changed"] is False and same["values"] == [] and same["exit_code"] == 0
    _conforms(same, "diff")
    code = main(["diff", "--format", "json", str(ALL_PASS), str(changed)])
    doc = json.loads(capsys.readouterr().out)
    assert code == 1 and doc["exit_code"] == 1 and doc["changed"] is True
    assert [r["path"] for r in doc["requirements"]] == ["output[0].load_max"]
    assert doc["values"] and all(isinstance(v["percent"], (float, type(None)))
                                 for v in doc["values"])
    _conforms(doc, "diff")
    with pytest.raises(Exception, match="is not of type"):
        _conforms({**doc, "changed": "yes"}, "diff")  # the schema does check


@pytest.mark.parametrize("command", ["build", "check", "diff", "new", "schema", "completion"])
def test_each_command_help_gives_its_exit_codes(command, capsys):
    with pytest.raises(SystemExit) as stop:
        main([command, "--help"])
    assert stop.value.code == 0
    assert "exit status:" in capsys.readouterr().out


def _bash_complete(tmp_path, words: list[str]) -> list[str]:
    script = tmp_path / "docgen.bash"
    script.write_text(_script("bash"), encoding="utf-8")
    cword = len(words) - 1
    quoted = " ".join(f"'{w}'" for w in words)
    cmd = (f"source '{script}'; COMP_WORDS=({quoted}); COMP_CWORD={cword}; "
           "_docgen_complete; printf '%s\\n' \"${COMPREPLY[@]}\"")
    done = subprocess.run(["bash", "-c", cmd], capture_output=True, text=True, cwd=tmp_path,
                          check=True)
    return [w for w in done.stdout.splitlines() if w]


def _script(shell: str) -> str:
    from docgen.completion import script

    return script(build_parser(), shell)


@pytest.mark.skipif(shutil.which("bash") is None, reason="bash not installed")
def test_bash_completion_follows_the_parser(tmp_path):
    (tmp_path / "my-supply.toml").write_text("", encoding="utf-8")
    assert _bash_complete(tmp_path, ["docgen", "ch"]) == ["check"]
    assert set(_bash_complete(tmp_path, ["docgen", "check", "--"])) >= {
        "--format", "--quiet", "--verbose", "--strict", "--help"}
    assert _bash_complete(tmp_path, ["docgen", "build", "--format", ""]) == ["text", "json"]
    assert _bash_complete(tmp_path, ["docgen", "new", "--regulator", "ad"]) == ["adjustable"]
    assert _bash_complete(tmp_path, ["docgen", "schema", "re"]) == ["requirements", "results"]
    assert _bash_complete(tmp_path, ["docgen", "check", "my-"]) == ["my-supply.toml"]


def test_completion_covers_every_option_of_every_command():
    parser = build_parser()
    sub = next(a for a in parser._actions if a.__class__.__name__ == "_SubParsersAction")
    for shell in ("bash", "zsh"):
        text = _script(shell)
        for name, command in sub.choices.items():
            assert name in text
            for action in command._actions:
                for option in action.option_strings:
                    assert option in text, (shell, name, option)


@pytest.mark.skipif(shutil.which("zsh") is None, reason="zsh not installed")
def test_zsh_completion_parses(tmp_path):
    path = tmp_path / "_docgen"
    path.write_text(_script("zsh"), encoding="utf-8")
    subprocess.run(["zsh", "-n", str(path)], check=True)


def test_completion_command_prints_the_script(capsys):
    assert main(["completion", "bash"]) == 0
    assert capsys.readouterr().out == _script("bash")
