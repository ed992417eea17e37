"""The wording of input errors that the requirements file and the parts library share, so that
the same mistake reads the same in both files (a misspelt key, a key left out)."""

from __future__ import annotations

import difflib
from collections.abc import Sequence

from .units import show_raw


def unknown_key(key: str, known: Sequence[str]) -> str:
    """A key the table does not have: the nearest known key, else the list of known keys."""
    text = f"unknown key {show_raw(key)}"
    close = difflib.get_close_matches(key, list(known), n=1, cutoff=0.6) if len(key) <= 100 else []
    if close:
        return f"{text}; did you mean '{close[0]}'?"
    if known:
        return f"{text}; expected one of: {', '.join(known)}"
    return text


def missing_key(expects: str | None = None) -> str:
    """A required key left out, with what it takes when that is known."""
    return "required but missing" + (f"; expected {expects}" if expects else "")
