"""Error types: one base class so the CLI can map every expected failure to a clear line."""

from __future__ import annotations

from dataclasses import dataclass, field


class DocgenError(Exception):
    """Base of every error docgen raises on purpose (bad input, infeasible design, render failure)."""

    exit_code = 1


@dataclass
class SpecIssue:
    """One problem in an input file: where it is and what was expected."""

    location: str  # TOML path, e.g. "output[1].load_max"
    message: str

    def __str__(self) -> str:
        return f"{self.location}: {self.message}" if self.location else self.message


@dataclass
class SpecError(ValueError, DocgenError):
    """An input file (requirements or parts library) is unreadable or invalid.

    All problems found in one file are carried together so the user fixes them in one pass.
    """

    path: str
    issues: list[SpecIssue] = field(default_factory=list)
    exit_code = 2

    def __str__(self) -> str:
        if len(self.issues) == 1:
            return f"{self.path}: {self.issues[0]}"
        lines = [f"{self.path}: {len(self.issues)} problems"]
        lines += [f"  - {issue}" for issue in self.issues]
        return "\n".join(lines)


class InfeasibleDesign(DocgenError):
    """The requirements cannot be met by any design of the chosen kind; the message says why."""

    exit_code = 1


class RenderError(DocgenError):
    """The document could not be written (output folder, renderer, refused resource)."""

    exit_code = 2
