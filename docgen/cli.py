"""Command line: thin layer that parses arguments, calls the pipeline and maps errors to exit codes.

Exit codes: 0 every check passes (warnings allowed unless --strict), 1 a check fails or the design
is infeasible, 2 the input is invalid or the outputs could not be written.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from . import __version__
from .errors import DocgenError, printable

EPILOG = """\
examples:
  docgen new > my-supply.toml          write a commented starter requirements file
  docgen check specs/my-supply.toml    size and check; prints failing and marginal checks
  docgen build specs/ -o out           build every spec in a folder into out/<name>/
  docgen diff old.toml new.toml        what a requirements change did to the design
  docgen diff spec.toml --rev HEAD     the same against the file at a git revision

exit status: 0 all checks pass, 1 a check fails or the design is infeasible,
             2 invalid input or unwritable output.

Safety: docgen estimates; it does not approve. Mains work must follow local codes
and be checked by a qualified person.
"""


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="docgen",
        description="Size a small mains-powered linear DC supply from a requirements file and "
        "write a traced design document (HTML, PDF and results.json).",
        epilog=EPILOG,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("--version", action="version", version=f"docgen {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    b = sub.add_parser("build", help="build the design document for one or more specs",
                       description="Build OUT/<spec name>/ with report.html, report.pdf, "
                       "results.json and the plots. A folder builds every .toml spec in it.")
    b.add_argument("specs", nargs="+", metavar="SPEC_OR_DIR", type=Path)
    b.add_argument("-o", "--out", type=Path, default=Path("out"),
                   help="output folder (default: ./out)")
    b.add_argument("--no-pdf", action="store_true", help="write HTML and results.json only")
    b.add_argument("--strict", action="store_true", help="treat warnings as failures")
    b.add_argument("--force", action="store_true",
                   help="rebuild even when the outputs are up to date")
    b.add_argument("-j", "--jobs", type=_positive_int, default=None, metavar="N",
                   help="worker processes for several specs (default: number of CPUs)")

    c = sub.add_parser("check", help="validate, size and check; print the result",
                       description="Validate and compute without writing files; print each "
                       "failing or marginal check with its corner and margin.")
    c.add_argument("specs", nargs="+", metavar="SPEC", type=Path)
    c.add_argument("--strict", action="store_true", help="treat warnings as failures")
    c.add_argument("-v", "--verbose", action="store_true", help="print passing checks too")

    d = sub.add_parser("diff", help="show what a requirements change does to the design",
                       description="Compute two versions of a requirements file and list what "
                       "changed: requirements, values, parts, checks, cautions and the overall "
                       "status. Give two files, or one file and --rev to compare it with its "
                       "content at a git revision.",
                       epilog="exit status: 0 nothing changed, 1 something changed, "
                       "2 invalid input.")
    d.add_argument("specs", nargs="+", metavar="SPEC", type=Path,
                   help="OLD NEW, or one SPEC with --rev")
    d.add_argument("--rev", metavar="REV",
                   help="compare SPEC with its content at this git revision (e.g. HEAD, main~3)")
    d.add_argument("--threshold", type=_non_negative_float, default=1e-9, metavar="REL",
                   help="smallest relative change of a value or margin to report (default 1e-9)")
    d.add_argument("-o", "--out", type=Path, metavar="FILE",
                   help="also write an HTML change report to FILE")

    n = sub.add_parser("new", help="print a commented starter requirements file",
                       description="Print a commented starter requirements file, or write it "
                       "to PATH (never overwriting an existing file).")
    n.add_argument("path", nargs="?", type=Path)
    return p


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 1:
        raise argparse.ArgumentTypeError(f"expected a whole number of at least 1, got {text!r}")
    return value


def _non_negative_float(text: str) -> float:
    import math

    try:
        value = float(text)
    except ValueError:
        value = -1.0
    if not (math.isfinite(value) and value >= 0):
        raise argparse.ArgumentTypeError(f"expected a number of 0 or more, got {text!r}")
    return value


def _spec_files(items: list[Path]) -> list[Path]:
    from .errors import SpecError, SpecIssue

    out: list[Path] = []
    for item in items:
        if item.is_dir():
            found = sorted(p for p in item.glob("*.toml") if p.is_file())
            if not found:
                raise SpecError(str(item), [SpecIssue("", "folder holds no .toml spec files")])
            out.extend(found)
        else:
            out.append(item)
    return out


def _exit_for(status: str, strict: bool) -> int:
    if status in ("fail", "infeasible"):
        return 1
    if status == "warn" and strict:
        return 1
    return 0


def _cmd_check(args) -> int:
    from .errors import InfeasibleDesign
    from .pipeline import run
    from .spec import load_requirements
    from .units import format_quantity as fq

    worst = 0
    for path in _spec_files(args.specs):
        loaded = load_requirements(path)
        shown = printable(str(path))
        try:
            design = run(loaded)
        except InfeasibleDesign as exc:
            print(f"{shown}: INFEASIBLE: {printable(str(exc))}")
            worst = max(worst, 1)
            continue
        counts = design.counts()
        print(f"{shown}: {design.status.upper()} ({counts['pass']} pass, {counts['warn']} warn, "
              f"{counts['fail']} fail)")
        for ch in design.checks:
            if ch.status != "pass" or args.verbose:
                rel = "<=" if ch.sense == "max" else ">="
                print(f"  {ch.status.upper():4s} {ch.id}: {fq(ch.value, ch.unit)} {rel} "
                      f"{fq(ch.limit, ch.unit)} (margin {ch.margin * 100:.1f} %) at {ch.corner}")
        worst = max(worst, _exit_for(design.status, args.strict))
    return worst


def _cmd_build(args) -> int:
    specs = _spec_files(args.specs)
    if len(specs) == 1 and not any(item.is_dir() for item in args.specs):
        return _build_single(specs[0], args)
    return _build_batch(specs, args)


def _build_single(path: Path, args) -> int:
    from .incremental import build_incremental

    outcome = build_incremental(path, args.out, pdf=not args.no_pdf, force=args.force)
    note = " (up to date; --force rebuilds)" if outcome.action == "up to date" else ""
    shown = printable(str(path))
    if outcome.status == "infeasible":
        print(f"{shown}: INFEASIBLE: {printable(outcome.reason)}{note}")
    else:
        counts = outcome.counts
        print(f"{shown}: {outcome.status.upper()} ({counts['pass']} pass, {counts['warn']} warn, "
              f"{counts['fail']} fail) -> {printable(outcome.out_dir)}/{note}")
    if outcome.removed:
        print(f"  removed stale outputs of the previous build: {', '.join(outcome.removed)}")
    return _exit_for(outcome.status, args.strict)


def _build_batch(specs: list[Path], args) -> int:
    from .batch import Progress, run_batch, summary_table, unique_specs

    specs = unique_specs(specs, args.out)
    progress = Progress(len(specs))
    try:
        outcomes = run_batch(specs, args.out, pdf=not args.no_pdf, force=args.force,
                             jobs=args.jobs, on_done=progress)
    finally:
        progress.close()
    worst = 0
    for o in outcomes:
        worst = max(worst, o.exit_code if o.action == "error" else _exit_for(o.status, args.strict))
    sys.stdout.write(summary_table(outcomes, strict=args.strict, out_root=args.out, worst=worst))
    return worst


def _cmd_diff(args) -> int:
    from .diff import (
        DiffUsageError,
        check_html_target,
        compare,
        load_rev_side,
        load_side,
        terminal_text,
        write_html,
    )

    if args.out is not None:
        check_html_target(args.out, list(args.specs))
    if args.rev is not None:
        if len(args.specs) != 1:
            raise DiffUsageError("diff --rev REV takes one SPEC; expected 'docgen diff SPEC "
                                 "--rev REV'")
        new = load_side(args.specs[0])
        old = load_rev_side(args.specs[0], args.rev)
    else:
        if len(args.specs) != 2:
            raise DiffUsageError("diff takes two specs; expected 'docgen diff OLD NEW' or "
                                 "'docgen diff SPEC --rev REV'")
        old = load_side(args.specs[0])
        new = load_side(args.specs[1])
    report = compare(old, new, args.threshold)
    sys.stdout.write(terminal_text(report))
    if args.out is not None:
        write_html(report, args.out, list(args.specs))
        print(f"wrote {args.out}")
    return 1 if report.changed else 0


def _cmd_new(args) -> int:
    from .starter import STARTER

    if args.path is None:
        sys.stdout.write(STARTER)
        return 0
    from .errors import RenderError

    try:
        with open(args.path, "x", encoding="utf-8") as fh:
            fh.write(STARTER)
    except FileExistsError:
        raise RenderError(
            f"{args.path}: already exists; docgen new never overwrites a file") from None
    except OSError as exc:
        raise RenderError(f"{args.path}: cannot write ({exc.strerror})") from None
    print(f"wrote {args.path}")
    return 0


def main(argv: list[str] | None = None) -> int:
    parser = _parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return 2
    handlers = {"build": _cmd_build, "check": _cmd_check, "diff": _cmd_diff, "new": _cmd_new}
    try:
        return handlers[args.command](args)
    except DocgenError as exc:
        print(f"docgen: error: {printable(str(exc))}", file=sys.stderr)
        return exc.exit_code
    except KeyboardInterrupt:
        print("docgen: interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:
        # the reader (e.g. `| head`) went away; stop quietly
        import os

        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 1


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
