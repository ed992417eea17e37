"""A value written in the requirements file is never replaced silently by a library part's."""

from __future__ import annotations

from docgen.pipeline import run
from docgen.spec import load_requirements

from ...conftest import ROOT

DEMO = ROOT / "specs" / "hydroponic-sensor-hub.toml"


def _with_zener(tmp_path, lines: str):
    text = DEMO.read_text().replace('library = "parts/demo-parts.toml"',
                                    f'library = "{(ROOT / "specs" / "parts").as_posix()}'
                                    '/demo-parts.toml"')
    spec = ROOT / "specs" / f"_test_{tmp_path.name}.toml"
    spec.write_text(text + "\n[output.zener]\n" + lines + "\n")
    try:
        return run(load_requirements(spec))
    finally:
        spec.unlink()


def test_a_figure_the_part_states_otherwise_is_shown_as_a_conflict(tmp_path):
    design = _with_zener(tmp_path, 'dynamic_resistance = "6 ohm"')
    notes = [a for a in design.assumptions if a.id == "assume.conflict.output.zener."
             "dynamic_resistance"]
    assert len(notes) == 1 and "6 Ω" in notes[0].text
    part = next(p for p in design.parts if p.ref == "DZ1")
    assert part.part_id in notes[0].text  # names the part whose figure is used


def test_a_power_rating_in_the_file_is_a_minimum_for_the_library_part(tmp_path):
    design = _with_zener(tmp_path, 'power = "5 W"')
    # the demo design alone needs only a 0.5 W part; the file asks for 5 W
    assert design.values["zener.p_rating"].value >= 5.0
