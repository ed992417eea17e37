"""Writing output files safely: temporary file in the same folder, then an atomic rename; one
build per output folder at a time (a lock), and no file of an earlier build left beside the new
ones."""

from __future__ import annotations

import fcntl
import os
import re
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

from ..errors import RenderError


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


# --------------------------------------------------------------------------- one build per folder

LOCK_NAME = ".docgen.lock"
_held: set[Path] = set()  # output folders this process has locked (the lock is re-entrant)


@contextmanager
def output_lock(out_dir: Path) -> Iterator[None]:
    """Hold an exclusive lock on ``out_dir`` for one build; refuse at once when another build
    (another process) holds it. The kernel drops the lock when its holder dies, even by SIGKILL,
    so a killed build never leaves the folder locked."""
    key = out_dir.resolve()
    if key in _held:
        yield
        return
    created = not out_dir.exists()
    prepare_dir(out_dir)
    try:
        fd = os.open(out_dir / LOCK_NAME, os.O_RDWR | os.O_CREAT, 0o644)
    except OSError as exc:
        raise RenderError(f"{out_dir}: cannot create the build lock ({exc.strerror})") from None
    try:
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError:
            raise RenderError(f"{out_dir}: another docgen build is writing this folder; expected "
                              "one build at a time per output folder (run again when it "
                              "ends)") from None
        _held.add(key)
        try:
            yield
        finally:
            _held.discard(key)
            if created:  # a build that wrote nothing (bad input) leaves no folder behind
                _remove_if_only_lock(out_dir)
            fcntl.flock(fd, fcntl.LOCK_UN)
    finally:
        os.close(fd)


def _remove_if_only_lock(out_dir: Path) -> None:
    try:
        if [p.name for p in out_dir.iterdir()] == [LOCK_NAME]:
            (out_dir / LOCK_NAME).unlink()
            out_dir.rmdir()
    except OSError:
        pass


# write_atomic's private files: "." + target name + "." + mkstemp's 8 random characters + ".tmp"
_LEFTOVER = re.compile(r"^\..+\.[a-z0-9_]{8}\.tmp$")


def is_leftover(name: str) -> bool:
    return bool(_LEFTOVER.match(name))


def remove_leftovers(out_dir: Path) -> list[str]:
    """Delete temporary files a killed build left (call only while holding the folder's lock,
    so none of them belongs to a running writer). Returns their names relative to ``out_dir``."""
    removed = []
    for folder in (out_dir, out_dir / "plots"):
        try:
            entries = list(folder.iterdir())
        except OSError:
            continue
        for entry in entries:
            if _LEFTOVER.match(entry.name) and entry.is_file() and not entry.is_symlink():
                try:
                    entry.unlink()
                except OSError:
                    continue
                removed.append(entry.relative_to(out_dir).as_posix())
    return sorted(removed)


# Files every build may write; with the outputs named in the previous stamp, these are what a
# build may remove when the new build does not write them again. Nothing else is touched.
OWNED = ("results.json", "report.html", "report.pdf", "bom.csv")


def remove_stale(out_dir: Path, written: list[Path], previous: list[str]) -> list[str]:
    """Delete the outputs of an earlier build that this build did not write again (a report of
    a design that is now infeasible, the PDF of a build now run with --no-pdf), so the folder
    never mixes two builds. Returns the removed names, relative to ``out_dir``."""
    keep = {Path(p).resolve() for p in written}
    candidates = set(OWNED) | {p for p in previous if isinstance(p, str)}
    try:  # the plots folder is docgen's own: every figure in it belongs to some build
        candidates |= {f"plots/{p.name}" for p in (out_dir / "plots").glob("*.svg")}
    except OSError:
        pass
    removed = []
    root = out_dir.resolve()
    for rel in sorted(candidates):
        target = (out_dir / rel).resolve()
        if not target.is_relative_to(root) or target in keep or target == root:
            continue  # a stamp naming a path outside the folder is not followed
        if target.is_file() and not (out_dir / rel).is_symlink():
            try:
                target.unlink()
            except OSError:
                continue
            removed.append(rel)
    plots = out_dir / "plots"
    try:
        if plots.is_dir() and not any(plots.iterdir()):
            plots.rmdir()
    except OSError:
        pass
    return removed
