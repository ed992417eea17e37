"""The HTML change report of `docgen diff -o FILE`, written without ever losing a user's file.

The target is checked before any work: never an input of the comparison, never a folder or a
device, and an existing file only when it is an earlier change report (it carries the marker).
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from ..render.diff_views import REPORT_MARKER, render_html


def check_html_target(target: Path, inputs: list[Path]) -> None:
    """Refuse, before any work, to write the report over an input or over a file that is not
    an earlier change report."""
    from ..errors import RenderError

    for p in inputs:
        try:
            if target.exists() and target.resolve() == p.resolve():
                raise RenderError(f"{target}: is an input of this comparison; expected a new "
                                  "file name for the HTML change report")
        except OSError:
            pass
    if target.is_dir():
        raise RenderError(f"{target}: is a folder; expected a file name for the HTML report")
    if target.exists() and not target.is_file():  # a FIFO would block the read below
        raise RenderError(f"{target}: is not a regular file (a device, pipe or socket); "
                          "expected a file name for the HTML report")
    if target.exists():
        try:
            with open(target, "rb") as fh:
                head = fh.read(4096).decode("utf-8", "replace")
        except OSError as exc:
            raise RenderError(f"{target}: cannot read the existing file ({exc.strerror})") from None
        if REPORT_MARKER not in head:
            raise RenderError(f"{target}: exists and is not a docgen change report; expected a "
                              "new file name (docgen diff overwrites only its own reports)")


def write_html(report: Any, target: Path, inputs: list[Path]) -> None:
    """Write the change report atomically (see :func:`check_html_target`)."""
    from .output import prepare_dir, write_atomic

    check_html_target(target, inputs)
    prepare_dir(target.parent if str(target.parent) else Path("."))
    write_atomic(target, render_html(report))
