"""`docgen build`: one spec (incremental) or several (batch, in worker processes)."""

from __future__ import annotations

import sys
from pathlib import Path

from ..errors import printable
from .exit_codes import exit_for
from .inputs import STDIN, load_all, reporter, spec_files


def run_build(args) -> int:
    specs = spec_files(args.specs)
    if STDIN in specs:
        from ..errors import SpecError, SpecIssue

        raise SpecError("-", [SpecIssue("", "build reads specs from files (the report names "
                                            "and attaches the file); '-' works with check")])
    if args.design == "best":
        from .explore import build_best

        return build_best(specs, args)
    if len(specs) == 1 and not any(item.is_dir() for item in args.specs):
        return _build_single(specs[0], args)
    return _build_batch(specs, args)


def pdf_option(args) -> bool | str:
    """True (whole PDF), "body" (--body-only) or False (--no-pdf)."""
    if args.no_pdf:
        return False
    return "body" if args.body_only else True


def _build_single(path: Path, args) -> int:
    from ..errors import DocgenError
    from ..jobs.incremental import build_incremental
    from ..progress import reporting

    try:
        with reporting(reporter(args, str(path))):
            outcome = build_incremental(path, args.out, pdf=pdf_option(args), force=args.force)
    except DocgenError as exc:
        if args.format != "json":
            raise
        from ..jobs.batch import _error_outcome

        print(f"docgen: error: {exc}", file=sys.stderr)
        outcome = _error_outcome(path, args.out, str(exc), exc.exit_code)
    code = (outcome.exit_code if outcome.action == "error"
            else exit_for(outcome.status, args.strict))
    if args.format == "json":
        from .. import cli_json

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
    from ..jobs.batch import Progress, _error_outcome, run_batch, summary_table, unique_specs

    specs = unique_specs(specs, args.out)
    progress = None if args.quiet else Progress(len(specs))
    # Every spec to be built is validated first, so a bad file is reported before the first
    # build starts; the valid ones are still built. An up-to-date spec was valid when it was
    # built and has not changed since, so it is not read again (a no-change run stays fast).
    from ..jobs.incremental import check_up_to_date

    stale = [spec for spec in specs
             if args.force or check_up_to_date(spec, args.out, pdf=pdf_option(args))[0] is None]
    invalid = {}
    for label, _, error in load_all(stale):
        if error is not None:
            invalid[label] = _error_outcome(Path(label), args.out, str(error), error.exit_code)
            if progress is not None:
                progress(invalid[label])
    valid = [spec for spec in specs if str(spec) not in invalid]
    try:
        built = run_batch(valid, args.out, pdf=pdf_option(args), force=args.force,
                          jobs=args.jobs, on_done=progress)
    finally:
        if progress is not None:
            progress.close()
    by_spec = {o.spec: o for o in built}
    outcomes = [invalid.get(str(spec)) or by_spec[str(spec)] for spec in specs]
    worst = 0
    for o in outcomes:
        worst = max(worst, o.exit_code if o.action == "error" else exit_for(o.status, args.strict))
    if args.format == "json":
        from .. import cli_json

        sys.stdout.write(cli_json.build_document(outcomes, worst, args.strict, str(args.out)))
    elif not args.quiet:
        sys.stdout.write(summary_table(outcomes, strict=args.strict, out_root=args.out,
                                       worst=worst))
    return worst
