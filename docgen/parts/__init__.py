"""Approved parts: IEC 60063 preferred values, the parts-library file and part selection.

* :mod:`docgen.parts.eseries` - E6...E96 tables and rounding to a preferred value.
"""

from .eseries import preferred, series_values

__all__ = ["preferred", "series_values"]
