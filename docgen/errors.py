"""Error types: one base class so the CLI can map every expected failure to a clear line.

Messages quote the user's own text (keys, values, file names), so they are bounded and made
printable here, once: a control character in a key must not drive the user's terminal, and a
file with 20,000 unknown keys must not print 20,000 lines.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

MAX_ISSUES_SHOWN = 20
MAX_LOCATION = 120
MAX_MESSAGE = 600

# C0 and C1 controls except newline and tab, DEL, and the bidirectional overrides that can make
# text display in another order than it is stored.
_UNPRINTABLE = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u200e\u200f\u202a-\u202e"
                          "\u2066-\u2069]")


def printable(text: str) -> str:
    """``text`` with every terminal control character shown as an escape such as ``\x1b``."""
    return _UNPRINTABLE.sub(lambda m: repr(m.group())[1:-1] if ord(m.group()) < 0x100
                            else f"\\u{ord(m.group()):04x}", text)


def close_quotes(text: str) -> str:
    """``text`` with a quote that a cut left open closed again, so a cut message still reads
    as quoted text (a lost closing quote makes the value look like it runs on)."""
    for quote in ("'", '"'):
        if text.count(quote) % 2:
            text += quote
    return text


def clip(text: str, limit: int) -> str:
    """``text`` cut to about ``limit`` characters, saying how long it was."""
    if len(text) <= limit:
        return text
    return f"{close_quotes(text[: limit - 30])}... ({len(text)} characters)"


class DocgenError(Exception):
    """Base of every error docgen raises on purpose (bad input, infeasible design, render
    failure)."""

    exit_code = 1


@dataclass
class SpecIssue:
    """One problem in an input file: where it is and what was expected."""

    location: str  # TOML path, e.g. "output[1].load_max"
    message: str

    def __str__(self) -> str:
        where = clip(self.location, MAX_LOCATION)
        message = clip(self.message, MAX_MESSAGE)
        return printable(f"{where}: {message}" if where else message)


@dataclass
class SpecError(ValueError, DocgenError):
    """An input file (requirements or parts library) is unreadable or invalid.

    All problems found in one file are carried together so the user fixes them in one pass.
    """

    path: str
    issues: list[SpecIssue] = field(default_factory=list)
    exit_code = 2

    def __str__(self) -> str:
        path = printable(clip(str(self.path), 300))
        if len(self.issues) == 1:
            return f"{path}: {self.issues[0]}"
        lines = [f"{path}: {len(self.issues)} problems"]
        lines += [f"  - {issue}" for issue in self.issues[:MAX_ISSUES_SHOWN]]
        if len(self.issues) > MAX_ISSUES_SHOWN:
            lines.append(f"  ... and {len(self.issues) - MAX_ISSUES_SHOWN} more problems")
        return "\n".join(lines)


class InfeasibleDesign(DocgenError):
    """The requirements cannot be met by any design of the chosen kind; the message says why."""

    exit_code = 1


class RenderError(DocgenError):
    """The document could not be written (output folder, renderer, refused resource)."""

    exit_code = 2
