"""Choosing parts from an approved-parts library, with the reason in words.

The selection rule and the machinery are in :mod:`docgen.parts.choose`; the functions for each
kind of part in :mod:`docgen.parts.select_power` and :mod:`docgen.parts.select_regulation`.
This module gathers the public functions.
"""

from __future__ import annotations

from .choose import Selection, generic_requirement
from .select_power import (
    select_bridge_or_diodes,
    select_capacitor,
    select_fuse,
    select_transformer,
)
from .select_regulation import (
    select_heatsink,
    select_regulator,
    select_resistor,
    select_transistor,
    select_zener,
)

__all__ = [
    "Selection",
    "generic_requirement",
    "select_capacitor",
    "select_transformer",
    "select_bridge_or_diodes",
    "select_zener",
    "select_resistor",
    "select_regulator",
    "select_transistor",
    "select_fuse",
    "select_heatsink",
]
