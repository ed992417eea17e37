"""Stage progress of one build: a live line on a terminal, stage timings on request.

The build code marks its stages with :func:`stage`; it costs nothing when no reporter is set
(tests, library use, batch workers). The command line sets a :class:`StageReporter` that writes
to standard error, so standard output stays clean for --format json and for pipes.
"""

from __future__ import annotations

import sys
import time
from collections.abc import Iterator
from contextlib import contextmanager
from typing import TextIO


class StageReporter:
    """Shows the running stage on a terminal (``live``); prints stage times (``timings``)."""

    def __init__(self, stream: TextIO | None = None, *, live: bool | None = None,
                 timings: bool = False, label: str = "") -> None:
        self.stream = stream if stream is not None else sys.stderr
        if live is None:
            try:
                live = self.stream.isatty()
            except (AttributeError, ValueError):
                live = False
        self.live = live
        self.timings = timings
        self.label = label
        self.done: list[tuple[str, float]] = []
        self._count = 0

    def start(self, name: str) -> None:
        self._count += 1
        if self.live:
            head = f"{self.label}: " if self.label else ""
            self.stream.write(f"\r\x1b[K{head}[{self._count}] {name} ...")
            self.stream.flush()

    def finish(self, name: str, seconds: float) -> None:
        self.done.append((name, seconds))
        if self.live:
            self.stream.write("\r\x1b[K")
        if self.timings:
            self.stream.write(f"  {name:<44} {seconds:7.2f} s\n")
        self.stream.flush()

    def close(self) -> None:
        if self.timings and self.done:
            total = sum(s for _, s in self.done)
            self.stream.write(f"  {'total of the stages':<44} {total:7.2f} s\n")
        if self.live:
            self.stream.write("\r\x1b[K")
        self.stream.flush()


_reporter: StageReporter | None = None


@contextmanager
def reporting(reporter: StageReporter | None) -> Iterator[StageReporter | None]:
    """Send the stages marked inside this block to ``reporter`` (None: report nothing)."""
    global _reporter
    previous, _reporter = _reporter, reporter
    try:
        yield reporter
    finally:
        _reporter = previous
        if reporter is not None:
            reporter.close()


@contextmanager
def stage(name: str) -> Iterator[None]:
    """Mark a stage of the work; timed and shown only when a reporter is set."""
    reporter = _reporter
    if reporter is None:
        yield
        return
    reporter.start(name)
    start = time.perf_counter()
    try:
        yield
    finally:
        reporter.finish(name, time.perf_counter() - start)
