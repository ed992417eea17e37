"""Regulator kinds: one module each, behind the protocol of ``docgen.regulators.base.Regulator``.

The registry maps the name written in the requirements file to the module holding the kind and
a short description for the file format's documentation. Modules are imported on first use, so
reading the registry (as the requirements models do) costs nothing.

Adding a kind: write its module (subclass ``Regulator``), add one line here, regenerate
docs/requirements.md, and add its test (see DEVELOPERS.md).
"""

from __future__ import annotations

import importlib
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from .base import Regulator

# name in the requirements file -> (module, description for the file format)
KINDS: dict[str, tuple[str, str]] = {
    "zener": ("zener", "zener shunt regulator"),
    "follower": ("follower", "zener-referenced emitter follower"),
    "three-terminal": ("three_terminal", "fixed three-terminal regulator"),
    "adjustable": ("adjustable", "adjustable three-terminal regulator with a divider"),
    "none": ("unregulated", "no regulator: the reservoir voltage is the output"),
    "dropper": ("dropper", "no regulator: a series resistor drops the reservoir voltage to "
                           "the output, for a load of nearly constant current"),
}


def regulator(kind: str) -> Regulator:
    """The regulator kind registered under ``kind``."""
    try:
        module_name = KINDS[kind][0]
    except KeyError:
        raise ValueError(f"unknown regulator kind {kind!r}; expected one of "
                         f"{', '.join(KINDS)}") from None
    return importlib.import_module(f"{__name__}.{module_name}").KIND


def all_kinds() -> list[Regulator]:
    return [regulator(k) for k in KINDS]
