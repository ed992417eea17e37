"""Read a requirements file: bytes -> TOML -> validated models, with every problem reported at once."""

from __future__ import annotations

import difflib
import hashlib
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from ..errors import SpecError, SpecIssue
from .models import Requirements

try:  # Python 3.11+
    import tomllib
except ModuleNotFoundError:  # pragma: no cover - Python 3.10
    import tomli as tomllib  # type: ignore[no-redef]

MAX_BYTES = 1_000_000  # a requirements file is a page of text; anything larger is a mistake


@dataclass(frozen=True)
class LoadedSpec:
    path: Path
    text: str
    sha256: str
    requirements: Requirements


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
        known = _field_names(model) if model else []
        hint = difflib.get_close_matches(str(loc[-1]), known, n=1)
        text = f"unknown key '{loc[-1]}'"
        if hint:
            text += f"; did you mean '{hint[0]}'?"
        elif known:
            text += f"; expected one of: {', '.join(known)}"
        return SpecIssue(where, text)
    if kind == "missing":
        return SpecIssue(where, "required but missing")
    message = error["msg"]
    for prefix in ("Value error, ", "Assertion failed, "):
        if message.startswith(prefix):
            message = message[len(prefix):]
    if kind == "literal_error":
        message = f"{message}, got {error.get('input')!r}"
    return SpecIssue(where or "(file)", message)


def read_text(path: Path) -> str:
    """Read a small UTF-8 text file or raise SpecError naming what is wrong with it."""
    try:
        size = path.stat().st_size
    except FileNotFoundError:
        raise SpecError(str(path), [SpecIssue("", "file not found")]) from None
    except OSError as exc:
        raise SpecError(str(path), [SpecIssue("", f"cannot read: {exc.strerror}")]) from None
    if path.is_dir():
        raise SpecError(str(path), [SpecIssue("", "is a folder, expected a .toml file")])
    if size > MAX_BYTES:
        raise SpecError(
            str(path), [SpecIssue("", f"file is {size} bytes; expected at most {MAX_BYTES}")]
        )
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise SpecError(str(path), [SpecIssue("", f"cannot read: {exc.strerror}")]) from None
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise SpecError(
            str(path),
            [SpecIssue("", f"not UTF-8 text (byte {exc.start}); expected a TOML text file")],
        ) from None


def parse_toml(path: Path, text: str) -> dict[str, Any]:
    if "\x00" in text:
        raise SpecError(str(path), [SpecIssue("", "binary data; expected a TOML text file")])
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        detail = str(exc)
        return_msg = f"not valid TOML: {detail}"
        raise SpecError(str(path), [SpecIssue("", return_msg)]) from None


def load_requirements(path: str | Path) -> LoadedSpec:
    """Load and validate one requirements file; raise SpecError listing every problem."""
    path = Path(path)
    text = read_text(path)
    data = parse_toml(path, text)
    if "schema" not in data:
        raise SpecError(
            str(path), [SpecIssue("schema", "required but missing; write 'schema = 1' at the top")]
        )
    if type(data.get("schema")) is not int or data["schema"] != 1:
        raise SpecError(
            str(path),
            [SpecIssue("schema", f"unsupported version {data.get('schema')!r}; expected 1")],
        )
    try:
        requirements = Requirements.model_validate(data)
    except ValidationError as exc:
        issues = [_issue_from(e) for e in exc.errors(include_url=False)]
        raise SpecError(str(path), issues) from None
    digest = hashlib.sha256(text.encode("utf-8")).hexdigest()
    return LoadedSpec(path=path, text=text, sha256=digest, requirements=requirements)
