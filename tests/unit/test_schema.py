"""The published JSON Schemas: current, and in agreement with what docgen accepts and writes."""

from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

from docgen.cli import main
from docgen.schema import FILES, docs_dir, requirements_schema, results_schema, schema_text
from docgen.starter import REGULATORS, starter
from tests.conftest import DATA, ROOT

jsonschema = pytest.importorskip("jsonschema")

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

SPECS = sorted((ROOT / "specs").glob("*.toml"))


def _validator(schema):
    jsonschema.Draft7Validator.check_schema(schema)
    return jsonschema.Draft7Validator(schema)


def _errors(schema, document) -> list[str]:
    return [f"{'/'.join(map(str, e.absolute_path))}: {e.message}"
            for e in _validator(schema).iter_errors(document)]


@pytest.mark.parametrize("which", list(FILES))
def test_published_schema_is_current(which):
    path = docs_dir() / f"{FILES[which]}.schema.json"
    assert path.read_text(encoding="utf-8") == schema_text(which), (
        "docs/schema is stale: run python -m docgen.schema")


@pytest.mark.parametrize("spec", SPECS + [DATA / "all-pass.toml",
                                          DATA / "undersized-capacitor.toml"],
                         ids=lambda p: p.name)
def test_every_valid_spec_validates(spec):
    document = tomllib.loads(spec.read_text(encoding="utf-8"))
    assert _errors(requirements_schema(), document) == []


@pytest.mark.parametrize("kind", REGULATORS)
def test_every_starter_validates(kind):
    assert _errors(requirements_schema(), tomllib.loads(starter(kind))) == []


def test_schema_refuses_what_docgen_refuses():
    schema = requirements_schema()
    bad_unit = tomllib.loads((DATA / "bad-unit.toml").read_text(encoding="utf-8"))
    assert any(e.startswith("output/0/load_max") for e in _errors(schema, bad_unit))
    base = tomllib.loads(starter("zener"))
    for change, where in (({"mains": {"nominal": "230 A"}}, "mains/nominal"),
                          ({"mains": {"nominul": "230 V"}}, "mains"),
                          ({"rectifier": {"topology": "doubler"}}, "rectifier/topology"),
                          ({"schema": 2}, "schema")):
        doc = {**base, **change}
        assert any(e.startswith(where) for e in _errors(schema, doc)), change


def test_quantities_take_a_number_or_text_with_units():
    schema = requirements_schema()
    base = tomllib.loads(starter("three-terminal"))
    for nominal in (230, 230.0, "230 V", "230V", " 0.23 kV ", "230000 mV"):
        assert _errors(schema, {**base, "mains": {"nominal": nominal}}) == [], nominal
    out = dict(base["output"][0])
    out["linear"] = {**out["linear"], "theta_jc": "5 K/W", "ripple_rejection": "62 dB",
                     "tolerance": "4 %"}
    assert _errors(schema, {**base, "output": [out]}) == []
    out["linear"]["ripple_rejection"] = "62 dBm"
    assert _errors(schema, {**base, "output": [out]})


def test_schema_has_no_references_or_nulls_for_editors():
    text = schema_text("requirements")
    assert "$ref" not in text and '"null"' not in text
    nominal = requirements_schema()["properties"]["mains"]["properties"]["nominal"]
    assert "Unit: V." in nominal["description"]


def test_results_json_validates(tmp_path):
    from docgen.jobs.build import build_one

    result = build_one(DATA / "all-pass.toml", tmp_path, pdf=False)
    data = json.loads((result.out_dir / "results.json").read_text(encoding="utf-8"))
    assert _errors(results_schema(), data) == []
    broken = {**data, "status": "great"}
    assert _errors(results_schema(), broken)
    del data["checks"]
    assert any("checks" in e for e in _errors(results_schema(), data))


def test_infeasible_results_json_validates(tmp_path):
    from docgen.jobs.build import build_one

    spec = tmp_path / "infeasible.toml"
    text = (ROOT / "specs" / "bench-psu-12v-follower.toml").read_text(encoding="utf-8")
    spec.write_text(text.replace("h_fe_min = 40", "h_fe_min = 3"), encoding="utf-8")
    result = build_one(spec, tmp_path / "out", pdf=False)
    assert result.status == "infeasible"
    data = json.loads((result.out_dir / "results.json").read_text(encoding="utf-8"))
    assert _errors(results_schema(), data) == []


def test_schema_command_prints_the_published_files(capsys):
    for which, name in FILES.items():
        assert main(["schema", which]) == 0
        printed = capsys.readouterr().out
        assert printed == (docs_dir() / f"{name}.schema.json").read_text(encoding="utf-8")
        assert json.loads(printed)["$schema"].startswith("http://json-schema.org/draft-07")


def test_readme_tells_editors_where_the_schema_is():
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    assert "#:schema" in readme and "docs/schema/requirements.schema.json" in readme
    assert Path(ROOT / "docs" / "schema" / "requirements.schema.json").is_file()
