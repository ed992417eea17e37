"""`docgen explore` and `docgen build --design best` on the small invented library of
tests/data/explore (DEMO DATA): exit codes, the files written, the generated statements."""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest

from docgen.cli import main

DATA = Path(__file__).resolve().parents[1] / "data" / "explore"


def _copy(tmp_path: Path) -> Path:
    for name in ("explore-demo.toml", "explore-parts.toml"):
        shutil.copy(DATA / name, tmp_path / name)
    return tmp_path / "explore-demo.toml"


def test_explore_writes_table_and_plot(tmp_path, capsys):
    spec = _copy(tmp_path)
    out = tmp_path / "out"
    assert main(["explore", str(spec), "-o", str(out), "--all"]) == 0
    text = capsys.readouterr().out
    assert "24 candidates" in text  # 3 transformers x 1 rectifier x 4 capacitors x 2 regulators
    assert "6 were ruled out by hand bounds" in text  # the 16 V capacitor, with each transformer
    assert "lowest total part cost" in text
    assert "Stage-by-stage sizing gives no working design here" in text
    assert "Monte Carlo yield" in text and "of 200 samples (seed 7)" in text
    svg = (out / "explore-demo-explore" / "tradeoff.svg").read_text()
    assert svg.startswith("<?xml") and "chosen design" in svg


def test_explore_budget_message(tmp_path, capsys):
    spec = _copy(tmp_path)
    assert main(["explore", str(spec), "-o", str(tmp_path / "out"), "--budget", "2"]) in (0, 1)
    text = capsys.readouterr().out
    assert "candidate budget reached: 2 verified" in text


def test_explore_without_library_is_an_input_error(tmp_path, capsys):
    spec = tmp_path / "no-lib.toml"
    spec.write_text((DATA / "explore-demo.toml").read_text().split("[parts]")[0])
    assert main(["explore", str(spec), "-o", str(tmp_path / "out")]) == 2
    err = capsys.readouterr().err
    assert "parts.library" in err and "Traceback" not in err


def test_build_design_best_states_the_search(tmp_path, capsys):
    spec = _copy(tmp_path)
    out = tmp_path / "out"
    assert main(["build", "--design", "best", "--no-pdf", str(spec), "-o", str(out)]) == 0
    results = json.loads((out / "explore-demo" / "results.json").read_text())
    search = [a for a in results["assumptions"] if a["id"] == "assume.search"]
    assert len(search) == 1
    assert "chosen by a search of the approved-parts library" in search[0]["text"]
    assert "24 candidates" in search[0]["text"]
    html = (out / "explore-demo" / "report.html").read_text()
    assert "chosen by the design-space search" in html
    # the trade-off figure of the search, with the chosen design marked, is in the decisions
    decisions = html[html.index('<section id="decisions">'):]
    decisions = decisions[:decisions.index("</section>")]
    assert "Design-space search: every verified candidate" in decisions
    plot = (out / "explore-demo" / "plots" / "search_tradeoff.svg").read_text()
    assert "<!-- chosen design (search best) -->" in plot  # matplotlib keeps legend text as comments
    # the fixed discrete diodes of the bridge count four in the BOM, as a library pick does
    bom = (out / "explore-demo" / "bom.csv").read_text(encoding="utf-8-sig")
    assert '"4 x Rectifier diode, 1 A, 400 V, axial (demo)"' in bom


DEMO_WITH_LIBRARY = sorted(p for p in (DATA.parents[2] / "specs").glob("*.toml")
                           if "[parts]" in p.read_text(encoding="utf-8"))


@pytest.mark.parametrize("spec", DEMO_WITH_LIBRARY, ids=lambda p: p.stem)
def test_demo_search_at_least_as_cheap_as_greedy(spec):
    from docgen.explore.search import search
    from docgen.spec import load_requirements

    result = search(load_requirements(spec))
    assert result.greedy is not None and result.greedy.feasible
    assert result.best.cost <= result.greedy.cost + 1e-12
    assert result.best.feasible and not result.budget_reached
