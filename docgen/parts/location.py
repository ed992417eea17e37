"""Where a requirements file's parts library may be: a file inside the project, nowhere else.

Why: a requirements file can come from someone else (a pull request, a shared folder). Reading
the library it names must not become a way to read, and echo the key names of, any file on the
machine. The project is the enclosing git work tree; outside one it is the spec's own folder
(not its parent: a spec in a top-level temporary folder would otherwise reach the whole disk).
"""

from __future__ import annotations

from pathlib import Path

from ..errors import SpecError, SpecIssue

FIELD = "parts.library"


def project_root(folder: Path) -> Path:
    """The enclosing git work tree of ``folder`` (not the file system root), else ``folder``."""
    folder = folder.resolve()
    for candidate in (folder, *folder.parents):
        if candidate == candidate.parent:  # a .git at "/" would open the whole disk
            break
        if (candidate / ".git").exists():
            return candidate
    return folder


def _refuse(spec: Path | str, message: str) -> SpecError:
    return SpecError(str(spec), [SpecIssue(FIELD, message)])


def confine(spec: Path, ref: str, root: Path | None = None) -> Path:
    """The resolved path of ``ref`` (relative to the spec's folder), confined to the project;
    the file need not exist. ``root`` overrides the project folder (a spec rebuilt from a git
    revision in a temporary copy of its folder). Raises SpecError naming the field."""
    if any(ord(c) < 32 or ord(c) == 127 for c in ref):
        raise _refuse(spec, "holds a control character (such as a NUL byte); expected a plain "
                            "relative path such as \"parts/library.toml\"")
    if "://" in ref or ref.startswith("~"):
        raise _refuse(spec, "must be a path relative to the requirements file, not a URL")
    base = spec.resolve().parent
    root = (root or project_root(base)).resolve()
    try:
        path = (base / ref).resolve()
    except (OSError, RuntimeError, ValueError):  # a symlink loop, an unreadable folder
        raise _refuse(spec, f"{ref!r} cannot be resolved; expected a file under the project "
                            f"folder {root}") from None
    if not path.is_relative_to(root):
        raise _refuse(spec, f"{ref!r} points outside the project folder {root}; docgen reads "
                            "only files under the project (the git work tree, or the "
                            "requirements file's folder outside git)")
    return path


def library_path(spec: Path, ref: str, root: Path | None = None) -> Path:
    """:func:`confine`, and the file must exist."""
    path = confine(spec, ref, root)
    if not path.is_file():
        raise _refuse(spec, f"{ref!r}: file not found (expected a regular file)")
    return path


def library_for(loaded):
    """The parts library a loaded requirements file names, or None when it names none."""
    ref = loaded.requirements.parts.library
    if not ref:
        return None
    from .library import load_library

    return load_library(library_path(loaded.path, ref, getattr(loaded, "project_root", None)))
