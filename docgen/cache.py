"""A small persistent on-disk cache for derived artefacts (today: typeset formula SVGs).

Entries live in the user's cache folder: ``$DOCGEN_CACHE_DIR`` if set, else
``$XDG_CACHE_HOME/docgen``, else ``~/.cache/docgen``. ``DOCGEN_NO_CACHE=1`` turns the cache off.

The cache can only make a build faster, never different or broken:

* the caller's key covers everything that shapes the entry (input, tool versions, code);
* every entry carries a SHA-256 of its payload and is ignored when it does not match;
* writes go to a temporary file in the same folder and are renamed into place (atomic);
* any OS error (read-only or full disk, missing home folder, permissions) turns the cache into
  a no-op for that call.

A namespace is kept below a number of entries by :func:`trim`, which drops the oldest written
entries first.
"""

from __future__ import annotations

import hashlib
import os
import tempfile
from pathlib import Path

ENV_DIR = "DOCGEN_CACHE_DIR"
ENV_OFF = "DOCGEN_NO_CACHE"
_MAGIC = b"docgen-cache 1 "


def enabled() -> bool:
    return os.environ.get(ENV_OFF, "").strip().lower() not in ("1", "true", "yes", "on")


def cache_root() -> Path | None:
    """The cache folder (not created here), or None when caching is turned off."""
    if not enabled():
        return None
    explicit = os.environ.get(ENV_DIR, "").strip()
    if explicit:
        return Path(explicit).expanduser()
    xdg = os.environ.get("XDG_CACHE_HOME", "").strip()
    if xdg and os.path.isabs(xdg):
        return Path(xdg) / "docgen"
    try:
        return Path.home() / ".cache" / "docgen"
    except (RuntimeError, KeyError):  # no home folder could be determined
        return None


def digest(*parts: str | bytes) -> str:
    """SHA-256 over the parts, each length-prefixed so that no two part lists collide."""
    h = hashlib.sha256()
    for part in parts:
        data = part.encode("utf-8") if isinstance(part, str) else part
        h.update(len(data).to_bytes(8, "big"))
        h.update(data)
    return h.hexdigest()


def _entry_path(root: Path, namespace: str, key: str) -> Path:
    return root / namespace / key[:2] / key


def get(namespace: str, key: str) -> bytes | None:
    """The payload stored under ``key``, or None (missing, damaged, cache off, unreadable)."""
    root = cache_root()
    if root is None:
        return None
    try:
        raw = _entry_path(root, namespace, key).read_bytes()
    except (OSError, ValueError):
        return None
    if not raw.startswith(_MAGIC):
        return None
    header_end = raw.find(b"\n")
    if header_end < 0:
        return None
    checksum = raw[len(_MAGIC):header_end]
    payload = raw[header_end + 1:]
    if hashlib.sha256(payload).hexdigest().encode("ascii") != checksum:
        return None
    return payload


def put(namespace: str, key: str, payload: bytes) -> bool:
    """Store ``payload`` under ``key`` atomically; False (and no exception) when that fails."""
    root = cache_root()
    if root is None:
        return False
    target = _entry_path(root, namespace, key)
    data = _MAGIC + hashlib.sha256(payload).hexdigest().encode("ascii") + b"\n" + payload
    tmp_name = None
    try:
        target.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp_name = tempfile.mkstemp(prefix=".tmp-", dir=target.parent)
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.replace(tmp_name, target)
        tmp_name = None
        return True
    except (OSError, ValueError):
        return False
    finally:
        if tmp_name is not None:
            try:
                os.unlink(tmp_name)
            except OSError:
                pass


def trim(namespace: str, max_entries: int, recent_key: str) -> int:
    """Keep at most about ``max_entries`` entries in ``namespace``; returns how many were removed.

    Cheap when there is nothing to do: only the bucket of ``recent_key`` (a 256th of the entries)
    is counted, and the whole namespace is scanned only when that bucket is over its share.
    Entries are removed oldest (by modification time) first, down to 80 % of the limit."""
    root = cache_root()
    if root is None:
        return 0
    base = root / namespace
    share = max(1, max_entries // 256)
    try:
        with os.scandir(base / recent_key[:2]) as it:
            bucket = sum(1 for _ in it)
        if bucket <= share + share // 4:
            return 0
        entries = []
        for sub in os.scandir(base):
            if not sub.is_dir(follow_symlinks=False):
                continue
            for entry in os.scandir(sub.path):
                if entry.is_file(follow_symlinks=False) and not entry.name.startswith("."):
                    entries.append((entry.stat().st_mtime_ns, entry.path))
    except OSError:
        return 0
    if len(entries) <= max_entries:
        return 0
    entries.sort()
    removed = 0
    for _, path in entries[: len(entries) - (max_entries * 4) // 5]:
        try:
            os.unlink(path)
            removed += 1
        except OSError:
            pass
    return removed
