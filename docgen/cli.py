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
  docgen new my-supply.toml            write a commented starter requirements file
  docgen new --regulator follower -    print the starter for an emitter follower
  docgen check specs/my-supply.toml    size and check; prints failing and marginal checks
  docgen check --format json spec.toml one JSON verdict on stdout, for CI
  docgen build specs/ -o out           build every spec in a folder into out/<name>/
  docgen diff old.toml new.toml        what a requirements change did to the design
  docgen diff spec.toml --rev HEAD     the same against the file at a git revision
  docgen schema requirements           JSON Schema of the requirements file, for editors
  docgen completion bash               shell completion script (bash or zsh)

exit status: 0 all checks pass, 1 a check fails or the design is infeasible,
             2 invalid input or unwritable output. Each command's help gives its own.

Safety: docgen estimates; it does not approve. Mains work must follow local codes
and be checked by a qualified person.
"""

CHECK_EXIT = """\
exit status:
  0  every check passes (warnings allowed unless --strict)
  1  a check fails, a warning with --strict, or a design is infeasible
  2  a spec is invalid or cannot be read (the message names file and field)

With --format json the verdict of every spec is one JSON object on stdout
(docs/cli-json.md); SPEC '-' reads the requirements from standard input.
"""

BUILD_EXIT = """\
exit status:
  0  every check passes (warnings allowed unless --strict)
  1  a check fails, a warning with --strict, or a design is infeasible
  2  a spec is invalid or an output could not be written

Every spec is validated before the first build starts. Stage progress is shown
on standard error when it is a terminal; -v adds each stage's time.
"""

DIFF_EXIT = """\
exit status:
  0  nothing changed
  1  something changed (requirements, values, parts, checks, cautions or status)
  2  invalid input (a spec, the revision, or the arguments)
"""

NEW_EXIT = """\
exit status:
  0  the starter was printed or written
  2  PATH exists (never overwritten) or cannot be written

PATH '-' (or no PATH) prints the starter on standard output.
"""

SCHEMA_EXIT = """\
exit status:
  0  the schema was printed

The same files are published as docs/schema/*.schema.json.
"""

COMPLETION_EXIT = """\
exit status:
  0  the script was printed

bash:  docgen completion bash > ~/.local/share/bash-completion/completions/docgen
zsh:   docgen completion zsh > "${fpath[1]}/_docgen"   (a folder on your $fpath)
"""


def _sub(sub, name: str, help_text: str, description: str, epilog: str):
    return sub.add_parser(name, help=help_text, description=description, epilog=epilog,
                          formatter_class=argparse.RawDescriptionHelpFormatter)


def _output_options(p: argparse.ArgumentParser, verbose_help: str) -> None:
    """--format, -q and -v, shared by check, build and diff."""
    p.add_argument("--format", choices=("text", "json"), default="text",
                   help="text for people (default) or one JSON object on stdout")
    loud = p.add_mutually_exclusive_group()
    loud.add_argument("-q", "--quiet", action="store_true",
                      help="print nothing on stdout but the JSON of --format json; errors "
                      "still go to stderr and the exit status tells the verdict")
    loud.add_argument("-v", "--verbose", action="store_true", help=verbose_help)


def _parser() -> argparse.ArgumentParser:
    from .starter import REGULATORS

    p = argparse.ArgumentParser(
        prog="docgen",
        description="Size a small mains-powered linear DC supply from a requirements file and "
        "write a traced design document (HTML, PDF and results.json).",
        epilog=EPILOG,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("--version", action="version", version=f"docgen {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    b = _sub(sub, "build", "build the design document for one or more specs",
             "Build OUT/<spec name>/ with report.html, report.pdf, results.json, bom.csv, "
             "bom-stresses.csv and the plots. A folder builds every .toml spec in it.",
             BUILD_EXIT)
    b.add_argument("specs", nargs="+", metavar="SPEC_OR_DIR", type=Path)
    b.add_argument("-o", "--out", type=Path, default=Path("out"),
                   help="output folder (default: ./out)")
    b.add_argument("--no-pdf", action="store_true", help="write HTML and results.json only")
    b.add_argument("--body-only", action="store_true",
                   help="leave the appendices out of the PDF (report.html keeps everything)")
    b.add_argument("--strict", action="store_true", help="treat warnings as failures")
    b.add_argument("--force", action="store_true",
                   help="rebuild even when the outputs are up to date")
    b.add_argument("-j", "--jobs", type=_positive_int, default=None, metavar="N",
                   help="worker processes for several specs (default: number of CPUs)")
    _output_options(b, "print the time of each stage of a single build on stderr")

    c = _sub(sub, "check", "validate, size and check; print the result",
             "Validate and compute without writing files; print each failing or marginal "
             "check with its corner and margin.", CHECK_EXIT)
    c.add_argument("specs", nargs="+", metavar="SPEC", type=Path,
                   help="requirements files or folders; '-' reads one from standard input")
    c.add_argument("--strict", action="store_true", help="treat warnings as failures")
    _output_options(c, "print passing checks too, and each stage's time on stderr")

    d = _sub(sub, "diff", "show what a requirements change does to the design",
             "Compute two versions of a requirements file and list what changed: "
             "requirements, values, parts, checks, cautions and the overall status. Give two "
             "files, or one file and --rev to compare it with its content at a git revision.",
             DIFF_EXIT)
    d.add_argument("specs", nargs="+", metavar="SPEC", type=Path,
                   help="OLD NEW, or one SPEC with --rev")
    d.add_argument("--rev", metavar="REV",
                   help="compare SPEC with its content at this git revision (e.g. HEAD, main~3)")
    d.add_argument("--threshold", type=_non_negative_float, default=1e-9, metavar="REL",
                   help="smallest relative change of a value or margin to report (default 1e-9)")
    d.add_argument("-o", "--out", type=Path, metavar="FILE",
                   help="also write an HTML change report to FILE")
    _output_options(d, "print the time of reading and computing each side on stderr")

    n = _sub(sub, "new", "print or write a commented starter requirements file",
             "Print a commented starter requirements file, or write it to PATH (never "
             "overwriting an existing file). The output block fits the regulator kind asked.",
             NEW_EXIT)
    n.add_argument("path", nargs="?", type=Path, help="file to create; '-' or none: stdout")
    n.add_argument("--regulator", choices=REGULATORS, default="zener",
                   help="regulator kind of the starter's output (default: zener)")

    s = _sub(sub, "schema", "print a JSON Schema (requirements file or results.json)",
             "Print the JSON Schema of the requirements file (for editors and TOML language "
             "servers; quantities accept a number or a string with units), of results.json, or "
             "of the --format json output of check, build or diff.",
             SCHEMA_EXIT)
    s.add_argument("which", choices=("requirements", "results", "check", "build", "diff"),
                   help="requirements file, results.json, or the --format json output of "
                   "check, build or diff")

    k = _sub(sub, "completion", "print a shell completion script",
             "Print a completion script for bash or zsh, generated from docgen's own "
             "argument parser.", COMPLETION_EXIT)
    k.add_argument("shell", choices=("bash", "zsh"))
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


STDIN = Path("-")


def _spec_files(items: list[Path]) -> list[Path]:
    from .errors import SpecError, SpecIssue

    out: list[Path] = []
    for item in items:
        if item == STDIN:
            out.append(item)
        elif item.is_dir():
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


def _reporter(args, label: str = ""):
    """Stage progress on stderr: live on a terminal, timings with -v, nothing with -q."""
    from .progress import StageReporter

    if args.quiet:
        return None
    reporter = StageReporter(timings=args.verbose, label=label)
    return reporter if (reporter.live or reporter.timings) else None


def _load_stdin():
    """The requirements file given on standard input, loaded as if it were in the current
    folder (so a relative [parts] library resolves from there); errors name '<stdin>'."""
    import os
    import tempfile

    from .errors import SpecError
    from .spec import load_requirements

    data = sys.stdin.buffer.read()
    try:
        fd, tmp = tempfile.mkstemp(prefix=".docgen-stdin-", suffix=".toml", dir=".")
    except OSError:
        fd, tmp = tempfile.mkstemp(prefix="docgen-stdin-", suffix=".toml")
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        try:
            return load_requirements(Path(tmp))
        except SpecError as exc:
            raise SpecError("<stdin>", exc.issues) from None
    finally:
        os.unlink(tmp)


def _label(path: Path) -> str:
    return "<stdin>" if path == STDIN else str(path)


def _load_all(specs: list[Path]):
    """Validate every spec before any computation: [(label, loaded or None, error or None)]."""
    from .errors import DocgenError
    from .spec import load_requirements

    out = []
    for path in specs:
        try:
            loaded = _load_stdin() if path == STDIN else load_requirements(path)
            out.append((_label(path), loaded, None))
        except DocgenError as exc:
            out.append((_label(path), None, exc))
    return out


def _cmd_check(args) -> int:
    from . import cli_json
    from .errors import InfeasibleDesign
    from .pipeline import run
    from .progress import reporting, stage
    from .units import format_quantity as fq

    text = args.format == "text" and not args.quiet
    specs = _spec_files(args.specs)
    if specs.count(STDIN) > 1:
        from .errors import SpecError, SpecIssue

        raise SpecError("<stdin>", [SpecIssue("", "'-' may be given once")])
    worst = 0
    entries = []
    with reporting(_reporter(args)):
        with stage("reading and validating every spec"):
            loaded_all = _load_all(specs)
        for label, loaded, error in loaded_all:
            if error is not None:
                print(f"docgen: error: {printable(str(error))}", file=sys.stderr)
                entries.append(cli_json.problem_entry(label, "error", str(error)))
                worst = max(worst, error.exit_code)
                continue
            try:
                with stage(f"sizing, corners and Monte Carlo ({label})"):
                    design = run(loaded)
            except InfeasibleDesign as exc:
                if text:
                    print(f"{printable(label)}: INFEASIBLE: {printable(str(exc))}")
                entries.append(cli_json.problem_entry(label, "infeasible", str(exc)))
                worst = max(worst, 1)
                continue
            entries.append(cli_json.check_entry(label, design))
            worst = max(worst, _exit_for(design.status, args.strict))
            if not text:
                continue
            counts = design.counts()
            print(f"{printable(label)}: {design.status.upper()} ({counts['pass']} pass, "
                  f"{counts['warn']} warn, {counts['fail']} fail)")
            for ch in design.checks:
                if ch.status != "pass" or args.verbose:
                    rel = "<=" if ch.sense == "max" else ">="
                    print(f"  {ch.status.upper():4s} {ch.id}: {fq(ch.value, ch.unit)} {rel} "
                          f"{fq(ch.limit, ch.unit)} (margin {ch.margin * 100:.1f} %) at "
                          f"{ch.corner}")
    if args.format == "json":
        sys.stdout.write(cli_json.check_document(entries, worst, args.strict))
    return worst


def _cmd_build(args) -> int:
    specs = _spec_files(args.specs)
    if STDIN in specs:
        from .errors import SpecError, SpecIssue

        raise SpecError("-", [SpecIssue("", "build reads specs from files (the report names "
                                            "and attaches the file); '-' works with check")])
    if len(specs) == 1 and not any(item.is_dir() for item in args.specs):
        return _build_single(specs[0], args)
    return _build_batch(specs, args)


def _pdf_option(args) -> bool | str:
    """True (whole PDF), "body" (--body-only) or False (--no-pdf)."""
    if args.no_pdf:
        return False
    return "body" if args.body_only else True


def _build_single(path: Path, args) -> int:
    from .errors import DocgenError
    from .incremental import build_incremental
    from .progress import reporting

    try:
        with reporting(_reporter(args, str(path))):
            outcome = build_incremental(path, args.out, pdf=_pdf_option(args), force=args.force)
    except DocgenError as exc:
        if args.format != "json":
            raise
        from .batch import _error_outcome

        print(f"docgen: error: {exc}", file=sys.stderr)
        outcome = _error_outcome(path, args.out, str(exc), exc.exit_code)
    code = (outcome.exit_code if outcome.action == "error"
            else _exit_for(outcome.status, args.strict))
    if args.format == "json":
        from . import cli_json

        sys.stdout.write(cli_json.build_document([outcome], code, args.strict, str(args.out)))
        return code
    if args.quiet:
        return code
    note = " (up to date; --force rebuilds)" if outcome.action == "up to date" else ""
    shown = printable(str(path))
    if outcome.status == "infeasible":
        print(f"{shown}: INFEASIBLE: {printable(outcome.reason)}{note}")
    else:
        counts = outcome.counts
        print(f"{shown}: {outcome.status.upper()} ({counts['pass']} pass, {counts['warn']} warn, "
              f"{counts['fail']} fail) -> {printable(str(outcome.out_dir))}/{note}")
    if outcome.removed:
        print(f"  removed stale outputs of the previous build: {', '.join(outcome.removed)}")
    return code


def _build_batch(specs: list[Path], args) -> int:
    from .batch import Progress, _error_outcome, run_batch, summary_table, unique_specs

    specs = unique_specs(specs, args.out)
    progress = None if args.quiet else Progress(len(specs))
    # Every spec to be built is validated first, so a bad file is reported before the first
    # build starts; the valid ones are still built. An up-to-date spec was valid when it was
    # built and has not changed since, so it is not read again (a no-change run stays fast).
    from .incremental import check_up_to_date

    stale = [spec for spec in specs
             if args.force or check_up_to_date(spec, args.out, pdf=_pdf_option(args))[0] is None]
    invalid = {}
    for label, _, error in _load_all(stale):
        if error is not None:
            invalid[label] = _error_outcome(Path(label), args.out, str(error), error.exit_code)
            if progress is not None:
                progress(invalid[label])
    valid = [spec for spec in specs if str(spec) not in invalid]
    try:
        built = run_batch(valid, args.out, pdf=_pdf_option(args), force=args.force,
                          jobs=args.jobs, on_done=progress)
    finally:
        if progress is not None:
            progress.close()
    by_spec = {o.spec: o for o in built}
    outcomes = [invalid.get(str(spec)) or by_spec[str(spec)] for spec in specs]
    worst = 0
    for o in outcomes:
        worst = max(worst, o.exit_code if o.action == "error" else _exit_for(o.status, args.strict))
    if args.format == "json":
        from . import cli_json

        sys.stdout.write(cli_json.build_document(outcomes, worst, args.strict, str(args.out)))
    elif not args.quiet:
        sys.stdout.write(summary_table(outcomes, strict=args.strict, out_root=args.out,
                                       worst=worst))
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
    from .progress import reporting, stage

    if args.out is not None:
        check_html_target(args.out, list(args.specs))
    with reporting(_reporter(args)):
        if args.rev is not None:
            if len(args.specs) != 1:
                raise DiffUsageError("diff --rev REV takes one SPEC; expected 'docgen diff SPEC "
                                     "--rev REV'")
            with stage(f"new side: {args.specs[0]}"):
                new = load_side(args.specs[0])
            with stage(f"old side: {args.specs[0]} at {args.rev}"):
                old = load_rev_side(args.specs[0], args.rev)
        else:
            if len(args.specs) != 2:
                raise DiffUsageError("diff takes two specs; expected 'docgen diff OLD NEW' or "
                                     "'docgen diff SPEC --rev REV'")
            with stage(f"old side: {args.specs[0]}"):
                old = load_side(args.specs[0])
            with stage(f"new side: {args.specs[1]}"):
                new = load_side(args.specs[1])
        report = compare(old, new, args.threshold)
    code = 1 if report.changed else 0
    if args.format == "json":
        from . import cli_json

        sys.stdout.write(cli_json.diff_document(report, code))
    elif not args.quiet:
        sys.stdout.write(terminal_text(report))
    if args.out is not None:
        write_html(report, args.out, list(args.specs))
        if args.format == "text" and not args.quiet:
            print(f"wrote {args.out}")
    return code


def _cmd_new(args) -> int:
    from .starter import starter

    text = starter(args.regulator)
    if args.path is None or args.path == STDIN:
        sys.stdout.write(text)
        return 0
    from .errors import RenderError

    try:
        with open(args.path, "x", encoding="utf-8") as fh:
            fh.write(text)
    except FileExistsError:
        raise RenderError(
            f"{args.path}: already exists; docgen new never overwrites a file") from None
    except OSError as exc:
        raise RenderError(f"{args.path}: cannot write ({exc.strerror})") from None
    print(f"wrote {args.path}")
    return 0


def _cmd_schema(args) -> int:
    from .schema import schema_text

    sys.stdout.write(schema_text(args.which))
    return 0


def _cmd_completion(args) -> int:
    from .completion import script

    sys.stdout.write(script(_parser(), args.shell))
    return 0


def main(argv: list[str] | None = None) -> int:
    parser = _parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return 2
    handlers = {"build": _cmd_build, "check": _cmd_check, "diff": _cmd_diff, "new": _cmd_new,
                "schema": _cmd_schema, "completion": _cmd_completion}
    try:
        return handlers[args.command](args)
    except DocgenError as exc:
        print(f"docgen: error: {printable(str(exc))}", file=sys.stderr)
        if getattr(args, "format", "text") == "json":
            from .cli_json import error_document

            sys.stdout.write(error_document(args.command, exc.exit_code, str(exc)))
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
