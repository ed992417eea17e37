"""Approved parts: IEC 60063 preferred values, the parts-library file and part selection.

* :mod:`docgen.parts.eseries` - E6...E96 tables and rounding to a preferred value.
* :mod:`docgen.parts.library` - the parts-library TOML format and :func:`load_library`.
* :mod:`docgen.parts.select` - ``select_*`` functions returning a :class:`Selection`.
"""

from .eseries import preferred, series_values
from .library import PartsLibrary, load_library, parse_library
from .select import (
    Selection,
    generic_requirement,
    select_bridge_or_diodes,
    select_capacitor,
    select_fuse,
    select_heatsink,
    select_regulator,
    select_resistor,
    select_transformer,
    select_transistor,
    select_zener,
)

__all__ = [
    "PartsLibrary",
    "Selection",
    "generic_requirement",
    "load_library",
    "parse_library",
    "preferred",
    "select_bridge_or_diodes",
    "select_capacitor",
    "select_fuse",
    "select_heatsink",
    "select_regulator",
    "select_resistor",
    "select_transformer",
    "select_transistor",
    "select_zener",
    "series_values",
]
