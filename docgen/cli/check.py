"""`docgen check`: validate, size and check; print failing and marginal checks."""

from __future__ import annotations

import sys

from ..errors import printable
from .exit_codes import exit_for
from .inputs import STDIN, load_all, reporter, spec_files


def run_check(args) -> int:
    from .. import cli_json
    from ..errors import InfeasibleDesign
    from ..pipeline import run
    from ..progress import reporting, stage
    from ..units import format_quantity as fq

    text = args.format == "text" and not args.quiet
    specs = spec_files(args.specs)
    if specs.count(STDIN) > 1:
        from ..errors import SpecError, SpecIssue

        raise SpecError("<stdin>", [SpecIssue("", "'-' may be given once")])
    worst = 0
    entries = []
    with reporting(reporter(args)):
        with stage("reading and validating every spec"):
            loaded_all = load_all(specs)
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
            worst = max(worst, exit_for(design.status, args.strict))
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
