"""`docgen completion`: print the shell completion script generated from the parser."""

from __future__ import annotations

import sys


def run_completion(args) -> int:
    from ..completion import script
    from .parser import build_parser

    sys.stdout.write(script(build_parser(), args.shell))
    return 0
