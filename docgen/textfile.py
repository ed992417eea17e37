"""Reading a TOML input file (requirements or parts library) with every cost bounded.

Why a module of its own: the size of a file, the kind of file, the depth of its nesting and the
length of its dotted keys all have to be bounded *before* the TOML parser sees the text, because
the parser's cost grows with the square of a dotted key's length and it recurses once per level
of nesting. Each refusal is a :class:`~docgen.errors.SpecError` naming the file and what was
expected.
"""

from __future__ import annotations

import os
import re
import stat
from pathlib import Path
from typing import Any

from .errors import SpecError, SpecIssue

try:  # Python 3.11+
    import tomllib
except ModuleNotFoundError:  # pragma: no cover - Python 3.10
    import tomli as tomllib  # type: ignore[no-redef]

SPEC_MAX_BYTES = 1_000_000  # a requirements file is a page of text; far larger is a mistake
MAX_DEPTH = 32  # arrays and tables nested deeper than this are a mistake in a page of settings
MAX_KEY_PARTS = 64  # a dotted key of more parts than this is a mistake


def _refuse(path: Path | str, message: str, where: str = "") -> SpecError:
    return SpecError(str(path), [SpecIssue(where, message)])


def read_bounded(path: Path, limit: int, what: str = "a .toml file") -> bytes:
    """The bytes of a regular file of at most ``limit`` bytes.

    Devices, FIFOs and sockets are refused before they are opened (a FIFO would block, and
    ``/dev/zero`` reports a size of 0 but never ends); the read itself stops at ``limit + 1``
    bytes so a file that grows, or lies about its size, still costs at most that much.
    """
    try:
        info = os.stat(path)
    except FileNotFoundError:
        raise _refuse(path, "file not found") from None
    except ValueError:  # an embedded NUL byte in the path
        raise _refuse(path, f"the path holds a NUL byte; expected {what}") from None
    except OSError as exc:
        raise _refuse(path, f"cannot read: {exc.strerror}") from None
    if stat.S_ISDIR(info.st_mode):
        raise _refuse(path, f"is a folder, expected {what}")
    if not stat.S_ISREG(info.st_mode):
        raise _refuse(path, f"is not a regular file (a device, pipe or socket); expected {what}")
    if info.st_size > limit:
        raise _refuse(path, f"file is {info.st_size} bytes; expected at most {limit}")
    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except OSError as exc:
        raise _refuse(path, f"cannot read: {exc.strerror}") from None
    try:
        if not stat.S_ISREG(os.fstat(fd).st_mode):  # replaced between stat and open
            raise _refuse(path, f"is not a regular file; expected {what}")
        chunks: list[bytes] = []
        total = 0
        while total <= limit:
            block = os.read(fd, min(1 << 20, limit + 1 - total))
            if not block:
                break
            chunks.append(block)
            total += len(block)
    except OSError as exc:
        raise _refuse(path, f"cannot read: {exc.strerror}") from None
    finally:
        os.close(fd)
    if total > limit:
        raise _refuse(path, f"file is larger than {limit} bytes; expected at most {limit}")
    return b"".join(chunks)


def decode(path: Path | str, data: bytes) -> str:
    """UTF-8 text without a byte-order mark or NUL bytes, or a SpecError saying which."""
    if data.startswith(b"\xef\xbb\xbf"):
        raise _refuse(path, "the file starts with a UTF-8 byte-order mark (BOM); expected plain "
                            "UTF-8: save it again as 'UTF-8' without BOM")
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise _refuse(path, f"not UTF-8 text (byte {exc.start}); expected a TOML text "
                            "file") from None
    if "\x00" in text:
        raise _refuse(path, "binary data (a NUL byte); expected a TOML text file")
    return text


# Tokens that matter for the shape scan: string openers, comments, brackets, dots, '=', ',',
# line ends. Everything else is skipped by the regular expression in one step.
_TOKEN = re.compile(r'"""|\'\'\'|["\'#\[\]{}.=,\n]')
_CLOSE = {'"""': re.compile(r'(?:[^"\\]|\\.|"(?!""))*"""', re.S),
          "'''": re.compile(r"'''", re.S),
          '"': re.compile(r'(?:[^"\\\n]|\\.)*"'),
          "'": re.compile(r"'")}


def check_shape(path: Path | str, text: str) -> None:
    """Refuse nesting deeper than MAX_DEPTH and dotted keys of more than MAX_KEY_PARTS parts.

    A tolerant scan: it only tracks strings, comments and brackets, so a file that is not valid
    TOML passes through to the parser, which names the error.
    """
    stack: list[str] = []
    key_mode = True  # between a line start (or '{' / ',' in an inline table) and '='
    dots = 0
    line = 1
    pos = 0
    while True:
        m = _TOKEN.search(text, pos)
        if m is None:
            return
        tok = m.group()
        pos = m.end()
        if tok in _CLOSE:
            end = _CLOSE[tok].search(text, pos) if tok in ('"""', "'''") else \
                _CLOSE[tok].match(text, pos)
            if end is None:
                return  # an unterminated string: the parser reports it
            line += text.count("\n", pos, end.end())
            pos = end.end()
            continue
        if tok == "#":
            nl = text.find("\n", pos)
            if nl < 0:
                return
            pos = nl
            continue
        if tok == "\n":
            line += 1
            if not stack or stack[-1] != "[":
                key_mode, dots = not stack, 0
            continue
        if tok == ".":
            if key_mode:
                dots += 1
                if dots >= MAX_KEY_PARTS:
                    raise _refuse(path, f"line {line}: a dotted key of more than "
                                        f"{MAX_KEY_PARTS} parts; expected a short key")
        elif tok == "=":
            key_mode, dots = False, 0
        elif tok in "[{":
            stack.append(tok)
            if len(stack) > MAX_DEPTH:
                raise _refuse(path, f"line {line}: arrays or tables nested more than "
                                    f"{MAX_DEPTH} deep; expected a flat settings file")
            if tok == "{":
                key_mode, dots = True, 0
        elif tok in "]}":
            if stack:
                stack.pop()
            if tok == "}":
                key_mode = False
        elif tok == "," and stack and stack[-1] == "{":
            key_mode, dots = True, 0


def parse_toml(path: Path | str, text: str) -> dict[str, Any]:
    """Parse TOML text whose shape has been checked; every parser failure becomes a SpecError."""
    check_shape(path, text)
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise _refuse(path, f"not valid TOML: {exc}") from None
    except RecursionError:  # pragma: no cover - check_shape bounds the nesting first
        raise _refuse(path, f"nested too deep; expected at most {MAX_DEPTH} levels") from None
    except ValueError as exc:  # Python's limit on the digits of an integer literal
        if "digits" in str(exc):
            raise _refuse(path, "an integer literal with thousands of digits; expected a "
                                "number of ordinary size") from None
        raise _refuse(path, "not valid TOML: a value could not be read") from None
