"""Read a requirements file: bytes -> TOML -> validated models, with every problem reported at once."""

from __future__ import annotations

import hashlib
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from ..errors import SpecError, SpecIssue
from ..input_words import missing_key, unknown_key
from ..textfile import SPEC_MAX_BYTES, decode, read_bounded
from ..textfile import parse_toml as _parse_toml
from ..units import show_raw
from .requirements import Requirements

MAX_BYTES = SPEC_MAX_BYTES


@dataclass(frozen=True)
class LoadedSpec:
    path: Path
    text: str
    sha256: str
    requirements: Requirements
    project_root: Path | None = None  # set for a temporary copy; see docgen.parts.location


def location(loc: tuple[Any, ...]) -> str:
    """pydantic loc tuple -> TOML-style path such as ``output[1].load_max``."""
    text = ""
    for part in loc:
        if isinstance(part, int):
            text += f"[{part}]"
        else:
            name = "schema" if part == "schema_" else str(part)
            text += f".{name}" if text else name
    return text


def _model_at(loc: tuple[Any, ...]) -> type[BaseModel] | None:
    """The model class that holds the field at ``loc`` (for did-you-mean suggestions)."""
    model: Any = Requirements
    for part in loc[:-1]:
        if isinstance(part, int):
            continue
        field = model.model_fields.get(part)
        if field is None:
            return None
        annotation = field.annotation
        args = getattr(annotation, "__args__", ())
        candidates = [annotation, *args]
        model = next(
            (c for c in candidates if isinstance(c, type) and issubclass(c, BaseModel)), None
        )
        if model is None:
            return None
    return model


def _field_names(model: type[BaseModel]) -> list[str]:
    return [f.alias or name for name, f in model.model_fields.items()]


def _issue_from(error: dict[str, Any]) -> SpecIssue:
    loc = tuple(error["loc"])
    where = location(loc)
    kind = error["type"]
    if kind == "extra_forbidden":
        model = _model_at(loc)
        return SpecIssue(where, unknown_key(str(loc[-1]), _field_names(model) if model else []))
    if kind == "missing":
        return SpecIssue(where, missing_key())
    message = error["msg"]
    for prefix in ("Value error, ", "Assertion failed, "):
        if message.startswith(prefix):
            message = message[len(prefix):]
    if kind == "literal_error":
        message = f"{message}, got {show_raw(error.get('input'))}"
    return SpecIssue(where or "(file)", message)


def read_text(path: Path) -> str:
    """Read a small UTF-8 text file (bounded for any kind of file) or raise SpecError."""
    return decode(path, read_bounded(path, MAX_BYTES, "a .toml file"))


def parse_toml(path: Path, text: str) -> dict[str, Any]:
    return _parse_toml(path, text)


def load_requirements(path: str | Path) -> LoadedSpec:
    """Load and validate one requirements file; raise SpecError listing every problem."""
    path = Path(path)
    text = read_text(path)
    data = parse_toml(path, text)
    if "schema" not in data:
        raise SpecError(
            str(path), [SpecIssue("schema", missing_key() + "; write 'schema = 1' at the top")]
        )
    if type(data.get("schema")) is not int or data["schema"] != 1:
        raise SpecError(
            str(path),
            [SpecIssue("schema", f"unsupported version {show_raw(data.get('schema'))}; "
                                  "expected 1")],
        )
    try:
        requirements = Requirements.model_validate(data)
    except ValidationError as exc:
        issues = [_issue_from(e) for e in exc.errors(include_url=False)]
        raise SpecError(str(path), issues) from None
    digest = hashlib.sha256(text.encode("utf-8")).hexdigest()
    return LoadedSpec(path=path, text=text, sha256=digest, requirements=requirements)
