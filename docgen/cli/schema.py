"""`docgen schema`: print one of the JSON Schemas."""

from __future__ import annotations

import sys


def run_schema(args) -> int:
    from ..schema import schema_text

    sys.stdout.write(schema_text(args.which))
    return 0
