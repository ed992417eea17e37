"""Spec arguments (files, folders, '-' for standard input) and the stage reporter."""

from __future__ import annotations

import sys
from pathlib import Path

STDIN = Path("-")


def spec_files(items: list[Path]) -> list[Path]:
    """Files as given, folders expanded to their .toml specs; an empty folder is bad input."""
    from ..errors import SpecError, SpecIssue

    out: list[Path] = []
    for item in items:
        if item == STDIN:
            out.append(item)
        elif item.is_dir():
            found = sorted(p for p in item.glob("*.toml") if p.is_file())
            if not found:
                raise SpecError(str(item), [SpecIssue("", "folder holds no .toml spec files")])
            out.extend(found)
        else:
            out.append(item)
    return out


def reporter(args, label: str = ""):
    """Stage progress on stderr: live on a terminal, timings with -v, nothing with -q."""
    from ..progress import StageReporter

    if args.quiet:
        return None
    rep = StageReporter(timings=args.verbose, label=label)
    return rep if (rep.live or rep.timings) else None


def load_stdin():
    """The requirements file given on standard input, loaded as if it were in the current
    folder (so a relative [parts] library resolves from there); errors name '<stdin>'."""
    import os
    import tempfile

    from ..errors import SpecError
    from ..spec import load_requirements

    data = sys.stdin.buffer.read()
    try:
        fd, tmp = tempfile.mkstemp(prefix=".docgen-stdin-", suffix=".toml", dir=".")
    except OSError:
        fd, tmp = tempfile.mkstemp(prefix="docgen-stdin-", suffix=".toml")
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        try:
            return load_requirements(Path(tmp))
        except SpecError as exc:
            raise SpecError("<stdin>", exc.issues) from None
    finally:
        os.unlink(tmp)


def label(path: Path) -> str:
    return "<stdin>" if path == STDIN else str(path)


def load_all(specs: list[Path]):
    """Validate every spec before any computation: [(label, loaded or None, error or None)]."""
    from ..errors import DocgenError
    from ..spec import load_requirements

    out = []
    for path in specs:
        try:
            loaded = load_stdin() if path == STDIN else load_requirements(path)
            out.append((label(path), loaded, None))
        except DocgenError as exc:
            out.append((label(path), None, exc))
    return out
