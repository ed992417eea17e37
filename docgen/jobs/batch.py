"""Batch builds: many specs at once, in parallel worker processes, skipping the up-to-date ones.

The parent process checks every spec's stamp first (cheap, see :mod:`docgen.jobs.incremental`) and
sends only the stale ones to a process pool, so a run with nothing to do starts no workers. One
spec's error (bad input, unwritable output) is reported on its line and does not stop the others.
"""

from __future__ import annotations

import os
import sys
from collections.abc import Callable
from pathlib import Path
from typing import TextIO

from ..errors import DocgenError, SpecError, SpecIssue, close_quotes, printable
from .incremental import Outcome, build_incremental, check_up_to_date, out_dir_for


def cpu_count() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):  # pragma: no cover - not Linux
        return max(1, os.cpu_count() or 1)


def unique_specs(specs: list[Path], out_root: Path) -> list[Path]:
    """Drop repeated specs; refuse two specs that would write to the same output folder."""
    seen: dict[Path, Path] = {}
    owners: dict[Path, Path] = {}
    result: list[Path] = []
    for spec in specs:
        key = spec.resolve()
        if key in seen:
            continue
        seen[key] = spec
        out_dir = out_dir_for(spec, out_root)
        if out_dir in owners:
            raise SpecError(str(spec), [SpecIssue(
                "", f"would be built into {out_dir}/, the same folder as {owners[out_dir]}; "
                "expected specs with different file names")])
        owners[out_dir] = spec
        result.append(spec)
    return result


def _error_outcome(spec: Path, out_root: Path, message: str, code: int) -> Outcome:
    return Outcome(spec=str(spec), out_dir=str(out_dir_for(spec, out_root)), action="error",
                   status="error", reason=message, exit_code=code)


def build_worker(spec: Path, out_root: Path, pdf: bool | str, force: bool,
                 why: list[str]) -> Outcome:
    """Build one stale spec (runs in a worker process); errors come back as an Outcome."""
    try:
        return build_incremental(spec, out_root, pdf=pdf, force=force, why=why)
    except DocgenError as exc:
        return _error_outcome(spec, out_root, str(exc), exc.exit_code)
    except Exception as exc:  # a bug: report it on the spec's line rather than lose the batch
        return _error_outcome(spec, out_root,
                              f"internal error ({type(exc).__name__}: {exc}); please report it", 2)


def _pool_context():
    import multiprocessing

    # Not "fork": forking a process that may hold threads is unsafe, and Python warns about it.
    methods = multiprocessing.get_all_start_methods()
    return multiprocessing.get_context("forkserver" if "forkserver" in methods else "spawn")


def run_batch(
    specs: list[Path],
    out_root: Path,
    *,
    pdf: bool | str = True,
    force: bool = False,
    jobs: int | None = None,
    on_done: Callable[[Outcome], None] | None = None,
) -> list[Outcome]:
    """Build every spec (or skip it when up to date); outcomes in the order of ``specs``."""
    specs = unique_specs(specs, out_root)
    outcomes: dict[int, Outcome] = {}

    def done(i: int, outcome: Outcome) -> None:
        outcomes[i] = outcome
        if on_done is not None:
            on_done(outcome)

    stale: list[tuple[int, Path, list[str]]] = []
    for i, spec in enumerate(specs):
        if force:
            stale.append((i, spec, ["forced"]))
            continue
        skipped, why = check_up_to_date(spec, out_root, pdf=pdf)
        if skipped is not None:
            done(i, skipped)
        else:
            stale.append((i, spec, why))

    workers = min(jobs or cpu_count(), len(stale))
    if workers == 1:
        for i, spec, why in stale:
            done(i, build_worker(spec, out_root, pdf, force, why))
    elif workers > 1:
        from concurrent.futures import ProcessPoolExecutor, as_completed

        pool = ProcessPoolExecutor(max_workers=workers, mp_context=_pool_context())
        try:
            futures = {pool.submit(build_worker, spec, out_root, pdf, force, why): (i, spec)
                       for i, spec, why in stale}
            for future in as_completed(futures):
                i, spec = futures[future]
                try:
                    outcome = future.result()
                except Exception as exc:  # the worker process died (killed, out of memory)
                    outcome = _error_outcome(
                        spec, out_root, f"worker process stopped ({type(exc).__name__}: {exc})", 2)
                done(i, outcome)
        except BaseException:
            pool.shutdown(wait=False, cancel_futures=True)
            raise
        pool.shutdown(wait=True)
    return [outcomes[i] for i in range(len(specs))]


# --------------------------------------------------------------------------- terminal output

def _status_word(outcome: Outcome) -> str:
    return outcome.status.upper()


def _what(outcome: Outcome, strict: bool) -> str:
    """The failing checks of a spec, or why it has none to show."""
    if outcome.status == "error":
        return outcome.reason.splitlines()[0] if outcome.reason else "error"
    if outcome.status == "infeasible":
        return f"infeasible: {outcome.reason}"
    ids = list(outcome.failing) + (list(outcome.warnings) if strict else [])
    return ", ".join(ids) if ids else "-"


class Progress:
    """One line per finished spec on a text stream; a bar under them when it is a terminal."""

    def __init__(self, total: int, stream: TextIO | None = None) -> None:
        self.total = total
        self.count = 0
        self.stream = stream if stream is not None else sys.stderr
        try:
            self.tty = self.stream.isatty()
        except (AttributeError, ValueError):
            self.tty = False

    def __call__(self, outcome: Outcome) -> None:
        self.count += 1
        width = len(str(self.total))
        head = f"[{self.count:>{width}}/{self.total}] {printable(outcome.spec)}: "
        if outcome.action == "error":
            line = head + "ERROR: " + printable(outcome.reason)
        elif outcome.action == "up to date":
            line = head + f"up to date, {_status_word(outcome)}"
        else:
            why = f" ({'; '.join(outcome.why)})" if outcome.why else ""
            line = head + f"built in {outcome.seconds:.1f} s{why}, {_status_word(outcome)}"
        if outcome.status == "infeasible":
            line += f": {outcome.reason}"
        if outcome.removed:
            line += f" (removed stale: {', '.join(outcome.removed)})"
        line = printable(line)
        if self.tty:
            self.stream.write("\r\x1b[K")
        self.stream.write(line + "\n")
        if self.tty:
            self.stream.write(self._bar())
        self.stream.flush()

    def _bar(self, width: int = 30) -> str:
        filled = round(width * self.count / self.total) if self.total else width
        return f"[{'#' * filled}{'.' * (width - filled)}] {self.count}/{self.total}"

    def close(self) -> None:
        if self.tty:
            self.stream.write("\r\x1b[K")
            self.stream.flush()


def summary_table(outcomes: list[Outcome], *, strict: bool = False, out_root: Path | None = None,
                  worst: int | None = None) -> str:
    """The end-of-run table: spec, status, failing checks, time, built or skipped."""
    header = ("spec", "status", "failing checks", "time", "build")
    rows = []
    for o in outcomes:
        seconds = "-" if o.action == "error" else f"{o.seconds:.1f} s"
        what = printable(_what(o, strict))
        if len(what) > 60:
            what = close_quotes(what[:56]) + "..."
        rows.append((printable(o.spec), _status_word(o), what, seconds, o.action))
    widths = [max(len(r[k]) for r in [header, *rows]) for k in range(len(header))]

    def line(cells: tuple[str, ...]) -> str:
        parts = [c.rjust(w) if k == 3 else c.ljust(w)
                 for k, (c, w) in enumerate(zip(cells, widths, strict=True))]
        return "  ".join(parts).rstrip()

    text = [line(header), line(tuple("-" * w for w in widths))]
    text += [line(r) for r in rows]
    built = sum(o.action == "built" for o in outcomes)
    skipped = sum(o.action == "up to date" for o in outcomes)
    errors = sum(o.action == "error" for o in outcomes)
    tail = f"{len(outcomes)} specs: {built} built, {skipped} up to date, {errors} errors"
    if out_root is not None:
        tail += f"; outputs in {out_root}/"
    if worst is not None:
        tail += f"; exit status {worst}"
    text.append(tail)
    return "\n".join(text) + "\n"
