"""Command line: parses arguments, calls the jobs and maps errors to exit codes.

Where things live: parser.py builds the argparse parser (every subcommand and option, with
its help), help_text.py holds the epilog and per-command exit-status texts, exit_codes.py the
verdict -> status mapping, inputs.py reading spec arguments (folders, '-'), and one module per
subcommand's handler (check.py, build.py, diff.py, new.py, schema.py, completion.py);
dispatch.py routes a parsed command to its handler.
"""

from __future__ import annotations

from .dispatch import main

__all__ = ["main"]
