"""The kinds of part a library file holds: each section name and its model."""

from __future__ import annotations

from .part_base import _PartBase
from .power_parts import Bridge, Capacitor, Diode, Fuse, Transformer
from .regulation_parts import Heatsink, Regulator, Resistor, ResistorFamily, Transistor, Zener

Part = (Transformer | Diode | Bridge | Capacitor | Zener | Resistor | ResistorFamily | Transistor
        | Regulator | Fuse | Heatsink)

_MODELS: dict[str, type[_PartBase]] = {
    "transformer": Transformer,
    "diode": Diode,
    "bridge": Bridge,
    "capacitor": Capacitor,
    "zener": Zener,
    "resistor": Resistor,
    "transistor": Transistor,
    "regulator": Regulator,
    "fuse": Fuse,
    "heatsink": Heatsink,
}
KINDS: tuple[str, ...] = tuple(_MODELS)
