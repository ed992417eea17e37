"""`docgen diff`: what a requirements change (two files, or one file and --rev) did."""

from __future__ import annotations

import sys

from .inputs import reporter


def run_diff(args) -> int:
    from ..jobs.diff_changes import compare
    from ..jobs.diff_file import check_html_target, write_html
    from ..jobs.diff_sides import DiffUsageError, load_rev_side, load_side
    from ..progress import reporting, stage
    from ..render.diff_views import terminal_text

    if args.out is not None:
        check_html_target(args.out, list(args.specs))
    with reporting(reporter(args)):
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
        from .. import cli_json

        sys.stdout.write(cli_json.diff_document(report, code))
    elif not args.quiet:
        sys.stdout.write(terminal_text(report))
    if args.out is not None:
        write_html(report, args.out, list(args.specs))
        if args.format == "text" and not args.quiet:
            print(f"wrote {args.out}")
    return code
