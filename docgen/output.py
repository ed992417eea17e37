"""Writing output files safely: temporary file in the same folder, then an atomic rename."""

from __future__ import annotations

import os
import re
import tempfile
from pathlib import Path

from .errors import RenderError


def prepare_dir(path: Path) -> Path:
    try:
        path.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise RenderError(f"{path}: cannot create the output folder ({exc.strerror})") from None
    if not os.access(path, os.W_OK):
        raise RenderError(f"{path}: the output folder is not writable")
    return path


def write_atomic(path: Path, data: bytes | str) -> None:
    """Write ``data`` to ``path`` so that readers see the old file or the new, never a part."""
    payload = data.encode("utf-8") if isinstance(data, str) else data
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    except OSError as exc:
        raise RenderError(f"{path.parent}: cannot write there ({exc.strerror})") from None
    try:
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)
        with os.fdopen(fd, "wb") as fh:
            fh.write(payload)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except OSError as exc:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise RenderError(f"{path}: cannot write ({exc.strerror})") from None


def safe_stem(path: Path) -> str:
    """Output folder name from the spec file name; cannot climb out of the output folder."""
    stem = re.sub(r"[^A-Za-z0-9._-]+", "-", path.stem).strip(".-")
    return stem or "spec"
