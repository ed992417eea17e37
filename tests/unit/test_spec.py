"""Requirements files: loading, defaults, and the error report for bad files (loader and CLI).

Every bad file is written by the test into tmp_path. Each error must be a SpecError whose text
names the file, the TOML path of the field and what was expected, so a user can fix the file
without reading code; several problems in one file come back together.

Default values are checked against their stated sources:
* mains 230 V 50 Hz, +/-10 %: IEC 60038:2009 Table 1 and the +/-10 % supply range
  ([IEC60038], confirmed on a secondary copy).
* minimum zener current 5 x I_ZK: Sedra & Smith zener exercise (W2 [SEDRA-SMITH]; numbers confirmed
  on secondary pages, attribution from memory).
* electrolytic tolerance 20 % (IEC 60063 E6 tolerance, [IEC60063]), derating factors and the
  1.8 bridge RMS ratio: common practice, no source ([CP-SELECTION-TABLES], [CP-CAP-VOLTAGE],
  [CP-ZENER]).
"""

from __future__ import annotations

import hashlib
from pathlib import Path

import pytest

from docgen.cli import main
from docgen.errors import SpecError
from docgen.spec import load_requirements

MINIMAL = """\
schema = 1

[project]
title = "Test rail"
document_id = "T-1"

[[output]]
name = "rail"
voltage = "9.1 V"
load_max = "40 mA"
ripple_max = "50 mV"
"""


def write(tmp_path: Path, text: str | bytes, name: str = "spec.toml") -> Path:
    path = tmp_path / name
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8")
    return path


def load_error(path: Path) -> SpecError:
    with pytest.raises(SpecError) as info:
        load_requirements(path)
    return info.value


# ------------------------------------------------------------------------------ valid files
def test_minimal_file_loads_with_documented_defaults(tmp_path):
    path = write(tmp_path, MINIMAL)
    loaded = load_requirements(path)
    req = loaded.requirements
    assert loaded.path == path
    assert loaded.text == MINIMAL
    assert loaded.sha256 == hashlib.sha256(MINIMAL.encode("utf-8")).hexdigest()
    # Given values, converted to SI.
    out = req.output[0]
    assert out.voltage == pytest.approx(9.1)
    assert out.load_max == pytest.approx(40e-3)
    assert out.ripple_max == pytest.approx(50e-3)
    # IEC 60038:2009 Table 1: 230 V, 50 Hz; supply range +/-10 % ([IEC60038]).
    assert req.mains.nominal == 230.0
    assert req.mains.frequency == 50.0
    assert req.mains.tolerance_low == pytest.approx(0.10)
    assert req.mains.tolerance_high == pytest.approx(0.10)
    # Sedra & Smith zener exercise keeps I_Z >= 5 x I_ZK with I_ZK = 1 mA (W2 [SEDRA-SMITH]).
    assert out.zener.min_current_factor == 5.0
    assert out.zener.knee_current == pytest.approx(1e-3)
    # IEC 60063: E6 parts are +/-20 % ([IEC60063]), the usual electrolytic tolerance.
    assert req.reservoir.tolerance == pytest.approx(0.20)
    # Common practice, no source: derate capacitor voltage to 80 % ([CP-CAP-VOLTAGE]) and zener
    # power to 50 % ([CP-ZENER]); the secondary RMS factor is left to the topology default
    # (bridge 1.8, [CP-SELECTION-TABLES]), applied by the pipeline.
    assert req.margins.capacitor_voltage_derating == pytest.approx(0.80)
    assert req.margins.zener_power_derating == pytest.approx(0.50)
    assert req.margins.secondary_rms_factor is None
    # Unsized parts stay open.
    assert req.transformer.secondary is None and req.reservoir.capacitance is None
    assert out.series_resistor is None and out.zener.voltage is None


def test_model_fields_set_tells_given_from_defaulted(tmp_path):
    text = MINIMAL + '\n[mains]\nnominal = "120 V"\nfrequency = "60 Hz"\n'
    req = load_requirements(write(tmp_path, text)).requirements
    assert req.mains.model_fields_set == {"nominal", "frequency"}
    assert "tolerance_low" not in req.mains.model_fields_set
    assert req.environment.model_fields_set == set()  # whole section defaulted
    assert req.margins.model_fields_set == set()
    assert {"name", "voltage", "load_max", "ripple_max"} == req.output[0].model_fields_set
    assert req.output[0].zener.model_fields_set == set()


def test_demo_spec_loads():
    demo = Path(__file__).resolve().parents[2] / "specs" / "hydroponic-sensor-hub.toml"
    req = load_requirements(demo).requirements
    assert req.output[0].voltage == pytest.approx(9.1)
    assert req.environment.ambient_max == 45.0


# ------------------------------------------------------------------------------ field errors
def assert_names(err: SpecError, path: Path, *parts: str) -> str:
    text = str(err)
    assert str(path) in text
    for part in parts:
        assert part in text, f"{part!r} missing from {text!r}"
    return text


def test_wrong_unit(tmp_path):
    path = write(tmp_path, MINIMAL.replace('load_max = "40 mA"', 'load_max = "20 V"'))
    err = load_error(path)
    assert [i.location for i in err.issues] == ["output[0].load_max"]
    assert_names(err, path, "output[0].load_max", "'V'", "current", '"40 mA"')


def test_wrong_unit_in_nested_and_optional_fields(tmp_path):
    text = (MINIMAL + '\n[output.zener]\nvoltage = "5 A"\n'
            + '\n[transformer]\nsecondary = "12 A"\nva = "5 VA"\n')
    path = write(tmp_path, text)
    err = load_error(path)
    assert {i.location for i in err.issues} == {"output[0].zener.voltage", "transformer.secondary"}
    assert_names(err, path, "output[0].zener.voltage", "transformer.secondary", '"230 V"')


def test_negative_current(tmp_path):
    path = write(tmp_path, MINIMAL.replace('load_max = "40 mA"', 'load_max = "-40 mA"'))
    err = load_error(path)
    assert_names(err, path, "output[0].load_max", "greater than zero", "-40 mA")


def test_negative_minimum_load(tmp_path):
    path = write(tmp_path, MINIMAL + 'load_min = "-4 mA"\n')
    err = load_error(path)
    assert_names(err, path, "output[0].load_min", "negative")


def test_missing_section(tmp_path):
    path = write(tmp_path, MINIMAL.split("[[output]]")[0])
    err = load_error(path)
    assert [i.location for i in err.issues] == ["output"]
    assert_names(err, path, "output", "required but missing")


def test_missing_project_section(tmp_path):
    text = MINIMAL.replace('[project]\ntitle = "Test rail"\ndocument_id = "T-1"\n', "")
    path = write(tmp_path, text)
    assert_names(load_error(path), path, "project", "required but missing")


def test_missing_required_field(tmp_path):
    path = write(tmp_path, MINIMAL.replace('ripple_max = "50 mV"\n', ""))
    assert_names(load_error(path), path, "output[0].ripple_max", "required but missing")


@pytest.mark.parametrize(
    "text, where, suggestion",
    [
        (MINIMAL + '\n[mians]\nnominal = "230 V"\n', "mians", "'mains'"),
        (MINIMAL.replace('title = "Test rail"', 'title = "T"\ntitel = "x"'), "project.titel",
         "'title'"),
        (MINIMAL + '\n[output.zener]\nknee_curent = "1 mA"\n', "output[0].zener.knee_curent",
         "'knee_current'"),
        (MINIMAL + '\n[margins]\nwarn_bnad = "5 %"\n', "margins.warn_bnad", "'warn_band'"),
    ],
)
def test_unknown_key_with_did_you_mean(tmp_path, text, where, suggestion):
    path = write(tmp_path, text)
    err = load_error(path)
    assert where in [i.location for i in err.issues]
    assert_names(err, path, where, "unknown key", f"did you mean {suggestion}")


def test_misspelt_required_key_reports_both_problems(tmp_path):
    path = write(tmp_path, MINIMAL.replace("load_max =", "lod_max ="))
    err = load_error(path)
    assert {i.location for i in err.issues} == {"output[0].load_max", "output[0].lod_max"}
    assert_names(err, path, "did you mean 'load_max'", "required but missing")


def test_unknown_key_without_a_close_match_lists_the_known_keys(tmp_path):
    path = write(tmp_path, MINIMAL + '\n[mains]\nxyzzy = 3\n')
    assert_names(load_error(path), path, "mains.xyzzy", "nominal", "frequency")


def test_load_min_above_load_max(tmp_path):
    path = write(tmp_path, MINIMAL + 'load_min = "50 mA"\n')
    err = load_error(path)
    assert_names(err, path, "output[0]", "load_min", "load_max", "0.05 A", "0.04 A")


def test_load_min_above_load_max_names_the_field_path(tmp_path):
    path = write(tmp_path, MINIMAL + 'load_min = "50 mA"\n')
    err = load_error(path)
    assert [i.location for i in err.issues] in (["output[0].load_min"], ["output[0].load_max"])


def test_several_problems_are_reported_together(tmp_path):
    text = (MINIMAL.replace('voltage = "9.1 V"', 'voltage = "9.1 A"')
            .replace('load_max = "40 mA"', 'load_max = "-40 mA"')
            + '\n[mains]\nfrequency = "50 V"\n')
    path = write(tmp_path, text)
    err = load_error(path)
    assert {i.location for i in err.issues} == {
        "mains.frequency", "output[0].voltage", "output[0].load_max"}
    text = assert_names(err, path, "3 problems", '"50 Hz"', '"230 V"', "greater than zero")
    assert len(text.splitlines()) == 1 + 3  # a header line, then one line per problem


def test_literal_choice_names_what_was_given(tmp_path):
    path = write(tmp_path, MINIMAL + '\n[rectifier]\ntopology = "halfwave"\n')
    assert_names(load_error(path), path, "rectifier.topology", "'bridge'", "'halfwave'")


def test_bool_for_a_quantity(tmp_path):
    path = write(tmp_path, MINIMAL.replace('voltage = "9.1 V"', "voltage = true"))
    assert_names(load_error(path), path, "output[0].voltage", "true/false")


@pytest.mark.parametrize("literal", ["inf", "nan", "-inf"])
def test_non_finite_toml_float(tmp_path, literal):
    # TOML 1.0 allows inf and nan float literals; a quantity must be finite.
    path = write(tmp_path, MINIMAL.replace('voltage = "9.1 V"', f"voltage = {literal}"))
    assert_names(load_error(path), path, "output[0].voltage", "finite")


# ------------------------------------------------------------------------------ file errors
def test_non_utf8_bytes(tmp_path):
    # "°" encoded as Latin-1 (0xB0) is not valid UTF-8 (RFC 3629: 0xB0 is a continuation byte).
    data = MINIMAL.encode("utf-8") + "# 45 \u00b0C\n".encode("latin-1")
    path = write(tmp_path, data)
    err = load_error(path)
    offset = data.index(bytes([0xB0]))
    assert_names(err, path, "UTF-8", f"byte {offset}", "TOML")


@pytest.mark.parametrize(
    "data", [b"\x00\x01\x02\x03binary", b"\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR"])
def test_binary_file(tmp_path, data):
    path = write(tmp_path, data, "image.toml")
    err = load_error(path)
    text = assert_names(err, path, "expected a TOML text file")
    assert "binary" in text or "UTF-8" in text


def test_empty_file(tmp_path):
    path = write(tmp_path, "")
    assert_names(load_error(path), path, "schema", "required but missing", "schema = 1")


def test_invalid_toml_gives_the_line(tmp_path):
    path = write(tmp_path, MINIMAL + "broken = \n")
    line = len(MINIMAL.splitlines()) + 1
    assert_names(load_error(path), path, "not valid TOML", f"line {line}")


def test_missing_schema(tmp_path):
    path = write(tmp_path, MINIMAL.replace("schema = 1\n", ""))
    err = load_error(path)
    assert [i.location for i in err.issues] == ["schema"]
    assert_names(err, path, "schema", "required but missing", "schema = 1")


@pytest.mark.parametrize("value", ["2", "0", '"1"'])
def test_wrong_schema_version(tmp_path, value):
    path = write(tmp_path, MINIMAL.replace("schema = 1", f"schema = {value}"))
    err = load_error(path)
    assert [i.location for i in err.issues] == ["schema"]
    assert_names(err, path, "schema", "unsupported version", "expected 1")


def test_schema_true_is_not_version_1(tmp_path):
    path = write(tmp_path, MINIMAL.replace("schema = 1", "schema = true"))
    err = load_error(path)
    assert_names(err, path, "schema")


def test_file_not_found(tmp_path):
    path = tmp_path / "nowhere.toml"
    assert_names(load_error(path), path, "file not found")


def test_folder_instead_of_file(tmp_path):
    assert_names(load_error(tmp_path), tmp_path, "folder")


# ------------------------------------------------------------------------------ CLI
def run_check(capsys, path: Path) -> tuple[int, str, str]:
    code = main(["check", str(path)])
    captured = capsys.readouterr()
    return code, captured.out, captured.err


@pytest.mark.parametrize(
    "content, expected_problems",
    [
        (MINIMAL.replace('load_max = "40 mA"', 'load_max = "20 V"'), 1),
        (MINIMAL.replace("schema = 1\n", ""), 1),
        (b"\x00\x01binary", 1),
        ("", 1),
        (MINIMAL + "broken = \n", 1),
        (MINIMAL.replace('voltage = "9.1 V"', 'voltage = "9.1 A"')
         .replace('load_max = "40 mA"', 'load_max = "-40 mA"')
         + '\n[mains]\nfrequency = "50 V"\n', 3),
    ],
)
def test_cli_reports_bad_files_with_exit_2_and_no_traceback(tmp_path, capsys, content,
                                                             expected_problems):
    path = write(tmp_path, content)
    code, out, err = run_check(capsys, path)
    assert code == 2
    assert "Traceback" not in out + err
    lines = err.strip().splitlines()
    assert lines[0].startswith("docgen: error: ")
    assert str(path) in lines[0]
    # one line for a single problem; a header plus one line per problem otherwise
    assert len(lines) == (1 if expected_problems == 1 else 1 + expected_problems)


def test_cli_missing_file_exit_2(tmp_path, capsys):
    code, out, err = run_check(capsys, tmp_path / "nowhere.toml")
    assert code == 2
    assert "file not found" in err and "Traceback" not in out + err
