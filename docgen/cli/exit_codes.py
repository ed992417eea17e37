"""Exit statuses of every subcommand, and the verdict -> status rule.

0 every check passes (warnings allowed unless --strict), 1 a check fails or the design is
infeasible (diff: something changed), 2 the input is invalid or the outputs could not be
written, 130 interrupted.
"""

from __future__ import annotations

OK = 0
FAILED = 1
BAD_INPUT = 2
INTERRUPTED = 130


def exit_for(status: str, strict: bool) -> int:
    """The status of one design: warnings fail only under --strict."""
    if status in ("fail", "infeasible"):
        return FAILED
    if status == "warn" and strict:
        return FAILED
    return OK
