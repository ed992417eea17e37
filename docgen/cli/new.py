"""`docgen new`: print or write (never over a file) a commented starter requirements file."""

from __future__ import annotations

import sys

from .inputs import STDIN


def run_new(args) -> int:
    from ..starter import starter

    text = starter(args.regulator)
    if args.path is None or args.path == STDIN:
        sys.stdout.write(text)
        return 0
    from ..errors import RenderError

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
