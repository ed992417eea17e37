"""The message for a design whose sizing reaches an undefined value: which quantity, why, from
which inputs. Kept apart from the pipeline so every runner (single rail, split) says the same."""

from __future__ import annotations

from .trace import UndefinedValue
from .units import format_quantity


def undefined_text(exc: BaseException) -> str:
    """One line for the user; never Python's own wording ("float division by zero")."""
    if isinstance(exc, UndefinedValue):
        shown = ", ".join(f"{vid} = {format_quantity(v, unit)}"
                          for vid, (v, unit) in list(exc.inputs.items())[:6])
        return (f"{exc.title} ({exc.value_id}) is undefined for these requirements: {exc.why}"
                + (f"; computed from {shown}" if shown else "")
                + "; check the requirements that feed it")
    if isinstance(exc, ZeroDivisionError):
        why = "a division by zero"
    elif isinstance(exc, OverflowError):
        why = "a number too large to compute"
    else:
        why = "a value that is not a finite number"
    return (f"the requirements lead to an undefined value while sizing ({why}); check for "
            "zero, extreme or contradictory values")
