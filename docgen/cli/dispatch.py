"""main(): parse, route the command to its handler, and map errors to exit codes."""

from __future__ import annotations

import sys

from ..errors import DocgenError, printable
from .build import run_build
from .check import run_check
from .completion import run_completion
from .diff import run_diff
from .exit_codes import BAD_INPUT, FAILED, INTERRUPTED
from .explore import handle as run_explore
from .new import run_new
from .parser import build_parser
from .schema import run_schema

# A new subcommand: its parser block in parser.py, its handler module, one line here.
HANDLERS = {"build": run_build, "check": run_check, "diff": run_diff, "new": run_new,
            "schema": run_schema, "completion": run_completion, "explore": run_explore}


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return BAD_INPUT
    try:
        return HANDLERS[args.command](args)
    except DocgenError as exc:
        print(f"docgen: error: {printable(str(exc))}", file=sys.stderr)
        if getattr(args, "format", "text") == "json":
            from ..cli_json import error_document

            sys.stdout.write(error_document(args.command, exc.exit_code, str(exc)))
        return exc.exit_code
    except KeyboardInterrupt:
        print("docgen: interrupted", file=sys.stderr)
        return INTERRUPTED
    except BrokenPipeError:
        # the reader (e.g. `| head`) went away; stop quietly
        import os

        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return FAILED
