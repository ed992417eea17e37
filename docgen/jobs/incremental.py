"""Incremental builds: skip a spec whose inputs and options have not changed since its last build.

After a successful build, ``OUT/<stem>/.docgen-stamp.json`` is written last (atomically). It
records a SHA-256 of every input that can change the outputs:

* the requirements file bytes and the path it was given as (results.json quotes the path);
* the docgen version, the source of the docgen package (every ``*.py`` under it) and the
  templates folder (the ``docgen.templates`` package files);
* the versions of the libraries that shape the output bytes (Jinja, matplotlib, WeasyPrint, ...);
* extra input files the spec refers to, found by the resolvers in :data:`EXTRA_INPUTS` (today:
  ``[parts] library = "..."``, relative to the spec's folder);
* the options that change the outputs (PDF on or off).

A spec is up to date when the stamp's key equals the key of the current inputs and every output
file listed in the stamp still exists with its recorded SHA-256 (content, not size: two
different reports can have the same length). A rebuild first marks the old
stamp as "building", so a build that stops half way never leaves a stamp that vouches for mixed
outputs.

This module imports no heavy libraries: checking 50 unchanged specs costs a few file reads.
"""

from __future__ import annotations

import hashlib
import json
import os
import stat
import sys
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any

STAMP_NAME = ".docgen-stamp.json"
STAMP_FORMAT = 1

# Libraries whose version can change the bytes of a report; recorded in the stamp.
_OUTPUT_LIBRARIES = ("jinja2", "matplotlib", "weasyprint", "pydantic", "numpy",
                     "latex2mathml")


def _sha256_file(path: Path) -> str | None:
    """SHA-256 of a file's bytes, or None when it does not exist or cannot be read."""
    h = hashlib.sha256()
    try:
        if not path.is_file():  # a device or FIFO named as an input never ends or blocks
            return None
        with open(path, "rb") as fh:
            if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):
                return None
            for block in iter(lambda: fh.read(1 << 20), b""):
                h.update(block)
    except (OSError, ValueError):
        return None
    return h.hexdigest()


def _tree_digest(root: Path, pattern: str) -> str:
    """One SHA-256 over the relative paths and bytes of the files under ``root`` matching
    ``pattern`` (caches and hidden files excluded), in a fixed order."""
    h = hashlib.sha256()
    files = sorted(
        p for p in root.rglob(pattern)
        if p.is_file() and "__pycache__" not in p.parts
        and not any(part.startswith(".") for part in p.relative_to(root).parts)
    )
    for p in files:
        rel = p.relative_to(root).as_posix()
        h.update(rel.encode("utf-8") + b"\0")
        h.update((_sha256_file(p) or "unreadable").encode("ascii") + b"\0")
    return h.hexdigest()


@lru_cache(maxsize=1)
def tool_inputs() -> dict[str, Any]:
    """Digests of docgen itself: version, package source, templates, output libraries."""
    from importlib import metadata, resources

    from .. import __version__

    package_dir = Path(__file__).resolve().parents[1]  # the whole docgen package
    templates_dir = Path(str(resources.files("docgen.templates")))
    libraries = {}
    for name in _OUTPUT_LIBRARIES:
        try:
            libraries[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            libraries[name] = None
    return {
        "docgen_version": __version__,
        "docgen_source": _tree_digest(package_dir, "*.py"),
        "templates": _tree_digest(templates_dir, "*"),
        "libraries": libraries,
        "python": f"{sys.version_info[0]}.{sys.version_info[1]}",
    }


# --------------------------------------------------------------------------- extra input files

def _parts_library(raw: dict[str, Any], spec_dir: Path) -> list[tuple[str, Path]]:
    parts = raw.get("parts")
    if isinstance(parts, dict) and isinstance(parts.get("library"), str) and parts["library"]:
        ref = parts["library"]
        if any(ord(c) < 32 for c in ref) or "://" in ref:
            return []  # refused by the build, which names the field
        return [("parts library", spec_dir / ref)]
    return []


#: Functions (raw TOML, spec folder) -> [(role, path)] naming further files a spec reads.
#: Add one here when the requirements format gains another reference to a file.
EXTRA_INPUTS: list[Callable[[dict[str, Any], Path], list[tuple[str, Path]]]] = [_parts_library]


def _raw_toml(data: bytes) -> dict[str, Any]:
    try:
        import tomllib
    except ModuleNotFoundError:  # pragma: no cover - Python 3.10
        import tomli as tomllib  # type: ignore[no-redef]
    try:
        return tomllib.loads(data.decode("utf-8"))
    except (UnicodeDecodeError, tomllib.TOMLDecodeError):
        return {}  # an unreadable spec fails in the build, which reports it properly


def extra_inputs(spec: Path, data: bytes) -> list[tuple[str, Path]]:
    raw = _raw_toml(data)
    found: list[tuple[str, Path]] = []
    for resolve in EXTRA_INPUTS:
        found.extend(resolve(raw, spec.parent))
    return found


# --------------------------------------------------------------------------- the stamp

@dataclass
class Inputs:
    """The current inputs of one spec and the key that summarises them."""

    spec: Path
    spec_sha256: str | None
    files: list[dict[str, Any]]
    options: dict[str, Any]
    tool: dict[str, Any] = field(default_factory=dict)  # see tool_inputs()

    def as_dict(self) -> dict[str, Any]:
        return {
            "spec": {"path": str(self.spec), "sha256": self.spec_sha256},
            "files": self.files,
            "options": self.options,
            **self.tool,
        }

    @property
    def key(self) -> str:
        text = json.dumps(self.as_dict(), sort_keys=True, separators=(",", ":"))
        return hashlib.sha256(text.encode("utf-8")).hexdigest()


BODY_ONLY = "body"  # the pdf option of --body-only: the PDF without its appendices


def current_inputs(spec: Path, *, pdf: bool | str) -> Inputs:
    from ..errors import SpecError
    from ..textfile import SPEC_MAX_BYTES, read_bounded

    try:  # bounded, and regular files only: the build itself reports what is wrong
        data: bytes | None = read_bounded(spec, SPEC_MAX_BYTES)
    except SpecError:
        data = None
    files = []
    if data is not None:
        for role, path in extra_inputs(spec, data):
            files.append({"role": role, "path": str(path), "sha256": _sha256_file(path)})
    digest = hashlib.sha256(data).hexdigest() if data is not None else None
    # pdf: True (the whole document), "body" (--body-only) or False (--no-pdf)
    return Inputs(spec, digest, files, {"pdf": pdf if pdf == BODY_ONLY else bool(pdf)},
                  tool_inputs())


def stamp_path(out_dir: Path) -> Path:
    return out_dir / STAMP_NAME


def read_stamp(out_dir: Path) -> dict[str, Any] | None:
    path = stamp_path(out_dir)
    try:
        if not path.is_file() or path.stat().st_size > 10_000_000:  # a FIFO would block
            return None
        stamp = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError, RecursionError):
        return None
    if not isinstance(stamp, dict) or stamp.get("stamp_format") != STAMP_FORMAT:
        return None
    return stamp


def stale_reasons(stamp: dict[str, Any] | None, inputs: Inputs, out_dir: Path) -> list[str]:
    """Why the outputs in ``out_dir`` do not match ``inputs``; empty when they are up to date."""
    if stamp is None:
        return ["not built before"]
    if stamp.get("state") == "building":
        return ["the previous build did not finish"]
    if inputs.spec_sha256 is None:
        return ["requirements file unreadable"]
    reasons: list[str] = []
    if stamp.get("key") != inputs.key:
        old = stamp.get("inputs", {})
        new = inputs.as_dict()
        if old.get("spec") != new["spec"]:
            reasons.append("requirements file changed")
        old_files = {f.get("path"): f for f in old.get("files", [])}
        for f in new["files"]:
            if old_files.get(f["path"]) != f:
                reasons.append(f"{f['role']} changed ({f['path']})")
        if {f.get("path") for f in old.get("files", [])} - {f["path"] for f in new["files"]}:
            reasons.append("referenced files changed")
        if old.get("options") != new["options"]:
            reasons.append("options changed")
        for name, label in (("docgen_version", "docgen version changed"),
                             ("docgen_source", "docgen source changed"),
                             ("templates", "templates changed"),
                             ("libraries", "library versions changed"),
                             ("python", "Python version changed")):
            if old.get(name) != new[name]:
                reasons.append(label)
        if not reasons:
            reasons.append("stamp does not match")
    if _has_leftovers(out_dir):
        reasons.append("a killed build left temporary files")
    outputs = stamp.get("outputs")
    if not isinstance(outputs, dict) or not outputs:
        reasons.append("stamp lists no outputs")
        return reasons
    for name, info in sorted(outputs.items()):
        target = out_dir / name
        if not target.is_file():
            reasons.append(f"output missing: {name}")
            continue
        # By content, not size: two builds' reports can have the same length.
        if not isinstance(info, dict) or info.get("sha256") != _sha256_file(target):
            reasons.append(f"output changed: {name}")
    return reasons


def _has_leftovers(out_dir: Path) -> bool:
    from .output import is_leftover

    for folder in (out_dir, out_dir / "plots"):
        try:
            if any(is_leftover(p.name) for p in folder.iterdir()):
                return True
        except OSError:
            continue
    return False


def write_stamp(out_dir: Path, inputs: Inputs, files: list[Path], result: dict[str, Any]) -> Path:
    from .output import write_atomic

    outputs = {}
    for f in files:
        rel = Path(f).relative_to(out_dir).as_posix()
        outputs[rel] = {"size": Path(f).stat().st_size, "sha256": _sha256_file(Path(f))}
    stamp = {
        "stamp_format": STAMP_FORMAT,
        "key": inputs.key,
        "inputs": inputs.as_dict(),
        "outputs": outputs,
        "result": result,
        "state": "built",
    }
    target = stamp_path(out_dir)
    write_atomic(target, json.dumps(stamp, sort_keys=True, indent=1) + "\n")
    return target


def invalidate_stamp(out_dir: Path) -> None:
    """Mark the stamp as "building" before a rebuild, so a build that stops half way leaves no
    stamp vouching for the mixed outputs. The file is rewritten atomically, not removed: it
    keeps the previous inputs, which say why the next build runs."""
    from .output import write_atomic

    target = stamp_path(out_dir)
    if not target.exists():
        return
    stamp = read_stamp(out_dir) or {"stamp_format": STAMP_FORMAT}
    stamp["key"] = None
    stamp["state"] = "building"
    write_atomic(target, json.dumps(stamp, sort_keys=True, indent=1) + "\n")


# --------------------------------------------------------------------------- one spec

@dataclass
class Outcome:
    """What happened to one spec; plain data so it can cross process boundaries."""

    spec: str
    out_dir: str
    action: str  # "built" | "up to date" | "error"
    status: str  # "pass" | "warn" | "fail" | "infeasible" | "error"
    counts: dict[str, int] = field(default_factory=dict)
    failing: list[str] = field(default_factory=list)  # ids of failing checks
    warnings: list[str] = field(default_factory=list)  # ids of checks in the warning band
    reason: str = ""  # infeasible reason or error message
    why: list[str] = field(default_factory=list)  # why it was rebuilt
    seconds: float = 0.0
    exit_code: int = 0  # for errors: the error's exit code
    removed: list[str] = field(default_factory=list)  # stale outputs of an earlier build removed


def _result_summary(build_result) -> dict[str, Any]:
    design = build_result.design
    if design is None:
        return {"status": build_result.status, "counts": {}, "failing": [], "warnings": [],
                "reason": build_result.reason}
    return {
        "status": design.status,
        "counts": design.counts(),
        "failing": [c.id for c in design.checks if c.status == "fail"],
        "warnings": [c.id for c in design.checks if c.status == "warn"],
        "reason": "",
    }


def out_dir_for(spec: Path, out_root: Path) -> Path:
    from .output import safe_stem

    return out_root / safe_stem(spec)


def check_up_to_date(spec: Path, out_root: Path, *, pdf: bool | str
                     ) -> tuple[Outcome | None, list[str]]:
    """(Outcome for a skip, []) when the spec's outputs are current, else (None, reasons)."""
    start = time.perf_counter()
    out_dir = out_dir_for(spec, out_root)
    stamp = read_stamp(out_dir)
    reasons = stale_reasons(stamp, current_inputs(spec, pdf=pdf), out_dir)
    if reasons:
        return None, reasons
    result = stamp.get("result", {})  # type: ignore[union-attr]
    return Outcome(
        spec=str(spec), out_dir=str(out_dir), action="up to date",
        status=str(result.get("status", "pass")), counts=dict(result.get("counts", {})),
        failing=list(result.get("failing", [])), warnings=list(result.get("warnings", [])),
        reason=str(result.get("reason", "")), seconds=time.perf_counter() - start,
    ), []


def build_incremental(spec: Path, out_root: Path, *, pdf: bool | str = True, force: bool = False,
                      why: list[str] | None = None) -> Outcome:
    """Build one spec unless it is up to date; write the stamp last. Raises DocgenError."""
    if not force and why is None:
        skipped, why = check_up_to_date(spec, out_root, pdf=pdf)
        if skipped is not None:
            return skipped
    start = time.perf_counter()
    from .build import build_one

    out_dir = out_dir_for(spec, out_root)
    inputs = current_inputs(spec, pdf=pdf)
    from ..spec import load_requirements
    from .output import output_lock

    load_requirements(spec)  # bad input is reported before the output folder is touched
    with output_lock(out_dir):
        invalidate_stamp(out_dir)
        result = build_one(spec, out_root, pdf=pdf)
        summary = _result_summary(result)
        # Stamp only when the inputs did not change while the build ran.
        after = current_inputs(spec, pdf=pdf)
        if after.key == inputs.key:
            write_stamp(result.out_dir, inputs, result.files, summary)
    return Outcome(
        spec=str(spec), out_dir=str(result.out_dir), action="built", status=summary["status"],
        counts=summary["counts"], failing=summary["failing"], warnings=summary["warnings"],
        reason=summary["reason"], why=["forced"] if force else list(why or []),
        seconds=time.perf_counter() - start, removed=list(result.removed),
    )
