"""The one reader of a quantity field (and of a level in dB), shared by the requirements file
and the parts library.

Text with a unit ("230 V", "40 mA") or a plain SI number becomes an SI float, checked against
the field's sign and the range docgen accepts there, so a typing slip ("40 A" for "40 mA",
"1e300 V") stops at the edge. Both files say the same thing about the same mistake: every
message starts with what was expected and ends with what was given; the loaders put the file
and the field in front of it.
"""

from __future__ import annotations

import math
import re
from typing import Any

from .units import as_float, expected_text, format_quantity, parse_quantity, show_raw

SIGNS = ("positive", "non-negative", "any")


class QuantityReader:
    """A pydantic ``BeforeValidator`` for one quantity field; ``expects`` is the text a
    "missing field" message quotes."""

    def __init__(self, dimension: str, unit: str | None = None, *, sign: str = "positive",
                 low: float | None = None, high: float | None = None, hint: str = "") -> None:
        if sign not in SIGNS:
            raise ValueError(f"sign must be one of {SIGNS}, got {sign!r}")
        self.dimension = dimension
        self.unit = unit  # the unit limits are shown in
        self.sign = sign
        self.low = low
        self.high = high
        self.hint = hint  # appended to a range message, e.g. where the limit comes from
        self.expects = expected_text(dimension)

    def show(self, value: float) -> str:
        """A limit in the field's own unit (a tempco in 1/K is shown per cent per kelvin)."""
        if self.unit == "1/K":
            return f"{value * 100:g} %/K"
        return format_quantity(value, self.unit) if self.unit is not None else f"{value:g}"

    def __call__(self, raw: Any) -> float:
        # a UnitError (a ValueError) already says what was expected
        value = parse_quantity(raw, self.dimension)
        what = self.dimension.replace("_", " ")
        got = f"got {show_raw(raw)}{self.hint}"
        if self.sign == "positive" and not value > 0:
            raise ValueError(f"expected a positive {what} (greater than zero), {got}")
        if self.sign == "non-negative" and value < 0:
            raise ValueError(f"expected zero or a positive {what} (not negative), {got}")
        if self.low is not None and value < self.low:
            raise ValueError(f"expected at least {self.show(self.low)}, the smallest {what} "
                             f"docgen accepts here, {got}")
        if self.high is not None and value > self.high:
            raise ValueError(f"expected at most {self.show(self.high)}, the largest {what} "
                             f"docgen accepts here, {got}{self._percent_hint(raw)}")
        return value

    def _percent_hint(self, raw: Any) -> str:
        """A plain number over the range of a ratio was most likely meant in per cent."""
        if self.dimension == "ratio" and isinstance(raw, (int, float)) and not isinstance(
                raw, bool):
            return f"; if {show_raw(raw)} is meant in percent, write \"{raw} %\""
        return ""


# Decibels are not an SI unit, so the unit parser does not take them; ASCII digits only, as
# there (float() alone would also read "inf" or full-width digits).
_DECIBELS = re.compile(r"[ \t]*([-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?)"
                       r"[ \t]*(?:dB)?[ \t]*")


class DecibelReader:
    """A level in decibels ("60 dB" or a plain number of dB), kept in dB, with the same
    message shapes as :class:`QuantityReader`."""

    expects = '"60 dB" or a number of decibels'

    def __init__(self, *, sign: str = "positive", high: float | None = None) -> None:
        if sign not in SIGNS:
            raise ValueError(f"sign must be one of {SIGNS}, got {sign!r}")
        self.sign = sign
        self.high = high

    def __call__(self, raw: Any) -> float:
        if isinstance(raw, bool):
            raise ValueError(f"expected {self.expects}, got a true/false value")
        if isinstance(raw, (int, float)):
            value = as_float(raw)
        elif isinstance(raw, str):
            m = _DECIBELS.fullmatch(raw) if len(raw) <= 200 else None
            if not m:
                raise ValueError(f"expected {self.expects}, got {show_raw(raw)}")
            value = float(m.group(1))
        else:
            raise ValueError(f"expected {self.expects}, got {type(raw).__name__}")
        got = f"got {show_raw(raw)}"
        if not math.isfinite(value):
            raise ValueError(f"expected a finite number, {got}")
        if self.sign == "positive" and not value > 0:
            raise ValueError(f"expected a positive level in dB (greater than zero), {got}")
        if self.sign == "non-negative" and value < 0:
            raise ValueError(f"expected zero or a positive level in dB (not negative), {got}")
        if self.high is not None and value > self.high:
            raise ValueError(f"expected at most {self.high:g} dB, the largest level docgen "
                             f"accepts here, {got}")
        return value
