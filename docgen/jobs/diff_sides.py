"""The two sides of a diff: a requirements file, or its content at a git revision, computed.

Each side is loaded, validated and run through the pipeline from scratch. The old side can be
the file's content at a git revision, read with ``git show REV:./name`` in the file's folder
(nothing is checked out), together with the files it refers to (a parts library) as they were
at that revision.
"""

from __future__ import annotations

import dataclasses
import os
import subprocess
import tempfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ..errors import DocgenError, InfeasibleDesign, SpecError, SpecIssue


class DiffUsageError(DocgenError):
    """The diff command was called with the wrong arguments."""

    exit_code = 2



@dataclass
class Side:
    """One side of the comparison: where it came from and what it computes to."""

    label: str  # "specs/x.toml" or "specs/x.toml at HEAD~1"
    requirements: Any  # docgen.spec.Requirements
    design: Any = None  # docgen.design.Design, None when infeasible
    status: str = ""  # pass | warn | fail | infeasible
    reason: str = ""  # why it is infeasible
    notes: list[str] = field(default_factory=list)  # how the side was read, if unusual


def _compute(label: str, loaded) -> Side:
    from ..pipeline import run

    try:
        design = run(loaded)
    except InfeasibleDesign as exc:
        return Side(label, loaded.requirements, None, "infeasible", str(exc))
    return Side(label, loaded.requirements, design, design.status, design.infeasible_reason)


def load_side(path: Path) -> Side:
    from ..spec import load_requirements

    return _compute(str(path), load_requirements(path))


def _climbs(rel: str) -> int:
    """How many folders a normalised relative path climbs above its start ("../../x" -> 2)."""
    parts = rel.split("/")
    n = 0
    while n < len(parts) and parts[n] == "..":
        n += 1
    return n


def load_text_side(text: str, name: str, label: str,
                   files: list[tuple[str, bytes]] | None = None,
                   notes: list[str] | None = None) -> Side:
    """Load requirements given as text (written to a temporary folder, since the loader reads
    files), with the files it refers to (``files``: path relative to the spec's folder, bytes)
    at the same relative places; errors name ``label`` instead of the temporary file."""
    from ..spec import load_requirements

    files = files or []
    with tempfile.TemporaryDirectory(prefix="docgen-diff-") as tmp:
        root = Path(tmp)
        depth = max((_climbs(rel) for rel, _ in files), default=0)
        spec_dir = root.joinpath(*[f"level{i}" for i in range(depth)])
        spec_dir.mkdir(parents=True, exist_ok=True)
        for rel, data in files:
            target = Path(os.path.normpath(spec_dir / rel))
            target.parent.mkdir(parents=True, exist_ok=True)
            target.write_bytes(data)
        target = spec_dir / (Path(name).name or "spec.toml")
        target.write_text(text, encoding="utf-8")
        try:
            # the temporary folder stands for the project: references stay inside it
            loaded = dataclasses.replace(load_requirements(target), project_root=root)
            side = _compute(label, loaded)
        except SpecError as exc:
            # name the file the user knows, never the temporary copy (gone when this returns)
            where = exc.path
            if Path(where) == target:
                where = label
            elif Path(where).is_relative_to(root):
                rel = os.path.relpath(where, spec_dir).replace(os.sep, "/")
                where = f"{rel} (beside {label})"
            issues = [SpecIssue(i.location, i.message.replace(str(root), "<project>"))
                      for i in exc.issues]
            raise SpecError(where, issues) from None
    side.notes = list(notes or [])
    return side


def _git_blob(folder: Path, rev: str, rel: str) -> tuple[bytes | None, str]:
    """(bytes of ``rel`` at ``rev``, "") or (None, why not); ``rel`` is relative to ``folder``."""
    try:
        proc = subprocess.run(["git", "show", f"{rev}:./{rel}"], cwd=folder,
                              capture_output=True, timeout=120, check=False)
    except FileNotFoundError:
        return None, "git is not installed; expected the git command on PATH"
    except OSError as exc:
        return None, f"cannot run git ({exc.strerror})"
    except subprocess.TimeoutExpired:
        return None, "git did not answer within 120 s"
    if proc.returncode != 0:
        detail = proc.stderr.decode("utf-8", "replace").strip().splitlines()
        first = detail[0] if detail else f"git exited with status {proc.returncode}"
        return None, first.removeprefix("fatal: ")
    return proc.stdout, ""


def _check_rev(spec: Path, rev: str) -> None:
    if not rev or rev.startswith("-") or any(c in rev for c in "\n\0"):
        raise SpecError(str(spec), [SpecIssue(
            f"--rev {rev}", "expected a git revision such as HEAD, HEAD~1, a tag or a commit id")])


def git_show(spec: Path, rev: str) -> str:
    """The content of ``spec`` at git revision ``rev`` (``git show REV:./name`` in its folder)."""
    _check_rev(spec, rev)
    folder = spec.parent if str(spec.parent) else Path(".")
    data, why = _git_blob(folder, rev, spec.name)
    if data is None:
        raise SpecError(str(spec), [SpecIssue(
            f"--rev {rev}", f"git cannot read the file at that revision ({why}); expected a "
            "revision of the file's repository in which the file exists")])
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise SpecError(f"{spec} at {rev}", [SpecIssue(
            "", f"not UTF-8 text (byte {exc.start}); expected a TOML text file")]) from None


def load_rev_side(spec: Path, rev: str) -> Side:
    """The spec as it was at ``rev``, with the files it refers to (a parts library) as they were
    at ``rev`` too; a referenced file that git does not hold is taken from the disk, with a note."""
    from .incremental import extra_inputs

    _check_rev(spec, rev)
    if not spec.is_file():
        # the working copy is loaded first so a missing file is reported in the usual way
        from ..spec import load_requirements

        load_requirements(spec)
    text = git_show(spec, rev)
    folder = spec.parent if str(spec.parent) else Path(".")
    files: list[tuple[str, bytes]] = []
    notes: list[str] = []
    from ..parts.library import MAX_BYTES
    from ..parts.location import confine
    from ..textfile import read_bounded

    base = spec.resolve().parent
    for role, ref in extra_inputs(Path(spec.name), text.encode("utf-8")):
        # The same confinement as the working copy's: the revision's spec may name any path,
        # and reading it would echo the key names of whatever file it is.
        try:
            target = confine(spec, str(ref))
        except SpecError as exc:
            raise SpecError(f"{spec} at {rev}", exc.issues) from None
        rel = os.path.relpath(target, base).replace(os.sep, "/")
        data, why = _git_blob(folder, rev, rel)
        if data is None:
            if not target.is_file():
                notes.append(f"{role} {rel}: neither in git at {rev} ({why}) nor on disk")
                continue
            data = read_bounded(target, MAX_BYTES, "a parts library .toml file")
            notes.append(f"{role} {rel}: not in git at {rev} ({why}); the file on disk was used")
        elif len(data) > MAX_BYTES:
            raise SpecError(f"{rel} at {rev}", [SpecIssue(
                "", f"file is {len(data)} bytes; expected at most {MAX_BYTES}")])
        files.append((rel, data))
    return load_text_side(text, spec.name, f"{spec} at {rev}", files, notes)
