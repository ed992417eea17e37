"""The wheel ships every package: pyproject's package list against the source tree."""

from __future__ import annotations

import sys
from pathlib import Path

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

ROOT = Path(__file__).resolve().parents[2]


def _source_packages() -> set[str]:
    found = set()
    for init in (ROOT / "docgen").rglob("__init__.py"):
        rel = init.parent.relative_to(ROOT)
        found.add(".".join(rel.parts))
    return found


def test_every_package_under_docgen_is_listed():
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    listed = set(config["tool"]["setuptools"]["packages"])
    missing = _source_packages() - listed
    assert not missing, f"add to [tool.setuptools] packages in pyproject.toml: {sorted(missing)}"
    stale = {p for p in listed - _source_packages() if p != "docgen.templates"}
    assert not stale, f"listed but not in the tree: {sorted(stale)}"


def test_templates_package_maps_to_the_templates_folder():
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    assert config["tool"]["setuptools"]["package-dir"]["docgen.templates"] == "templates"
    assert (ROOT / "templates" / "__init__.py").is_file()


def test_both_command_names_start_the_same_program():
    """The short name clashes with an unrelated distribution; the long one is ours alone."""
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    scripts = config["project"]["scripts"]
    assert scripts["docgen"] == "docgen.cli:main"
    assert scripts["linear-supply-docgen"] == scripts["docgen"]
    assert config["project"]["name"] == "linear-supply-docgen"
