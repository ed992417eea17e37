"""Schematic of the designed supply, drawn by the program from a neutral description.

The caller describes what to draw (`SchematicDrawing`, one `OutputDrawing` per output) with
finished text only; this module does no sizing and formats no numbers. `schematic_svg` returns
SVG text. Symbols and wires are drawn with schemdraw (imported lazily, together with matplotlib,
which supplies the DejaVu Sans metrics); every label is added afterwards as a plain SVG
``<text>`` element in "DejaVu Sans", so the labels stay searchable text in the HTML and PDF and
the layout uses real glyph widths. A ``<title>`` and a ``<desc>`` (one line per label, in drawing
order) carry the same labels for screen readers and tools. The same description always gives
byte-identical SVG.

Layout (left to right): mains terminals L and N, the fuse in the live line, the transformer
(centre-tapped for "center-tap" and "split"), the rectifier, then per polarity the reservoir
capacitor, the bleeder and one section per output ending in an output terminal; a 0 V line runs
along the bottom to a "0 V" terminal. A bridge is drawn as a package box with ~ ~ + - pins.
A centre tap is tied to ground through a ground symbol; with a continuous wire instead, the
diode wiring of a centre-tap or split rectifier cannot be drawn without a crossing. In a split
supply the positive rail is above the 0 V line and the negative rail below it, drawn as a mirror
image (PNP pass transistor, reversed diodes, capacitor + at 0 V); the bleeder then spans the
whole supply (+ to -) and is drawn before the 0 V line starts. Further outputs on the same
rail are fed from the reservoir by a bus drawn above the first output.

Designators in `OutputDrawing.labels` are given roles by letter, in natural order:
C: reservoir (first output on each rail only), then input and output capacitors where the
regulator has them (with fewer C entries, the reservoir and then the output capacitor are
filled first); R: series/base resistor, or for "adjustable" R1 (OUT to ADJ) then R2 (ADJ to 0 V);
D: the zener; Q: the pass transistor; U: the regulator. Parts the circuit needs but the labels
do not name get the next free designator; entries that fit no role are listed in a note under
that output's terminal, so every label given is shown.

Sizes: labels are 7 pt when the drawing is shown at its natural size (the width/height
attributes); a layout wider than 16 cm is scaled down to 16 cm. In a page, show it at its natural
size with ``max-width: 100%`` rather than a fixed width.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from types import MappingProxyType

TOPOLOGIES = ("bridge", "center-tap", "half-wave", "split")
# Drawing styles of a regulator section (each regulator kind names the style it is drawn in).
REGULATORS = ("zener", "follower", "three-terminal", "adjustable", "none", "series")
POLARITIES = ("+", "-")


@dataclass(frozen=True)
class OutputDrawing:
    """One regulated (or unregulated, regulator="none") output as it should be drawn."""

    name: str
    regulator: str
    polarity: str = "+"
    labels: Mapping[str, str] = field(default_factory=dict)
    v_out_text: str = ""

    def __post_init__(self) -> None:
        if self.regulator not in REGULATORS:
            raise ValueError(f"regulator must be one of {', '.join(REGULATORS)}; "
                             f"got {self.regulator!r}")
        if self.polarity not in POLARITIES:
            raise ValueError(f"polarity must be '+' or '-'; got {self.polarity!r}")
        object.__setattr__(self, "labels", MappingProxyType(dict(self.labels)))


@dataclass(frozen=True)
class SchematicDrawing:
    """The whole supply as it should be drawn. All texts are shown as given."""

    topology: str
    mains_text: str
    fuse: str = ""
    transformer: str = ""
    rectifier: str = ""
    bleeder: str = ""
    outputs: tuple[OutputDrawing, ...] = ()

    def __post_init__(self) -> None:
        if self.topology not in TOPOLOGIES:
            raise ValueError(f"topology must be one of {', '.join(TOPOLOGIES)}; "
                             f"got {self.topology!r}")
        object.__setattr__(self, "outputs", tuple(self.outputs))
        pols = {o.polarity for o in self.outputs}
        if self.topology == "split":
            if pols != {"+", "-"}:
                raise ValueError("a split supply needs at least one '+' and one '-' output")
        elif len(pols) > 1:
            raise ValueError(f"a {self.topology} rectifier feeds one rail; outputs must all "
                             "have the same polarity (use topology 'split' for + and -)")


def schematic_svg(drawing: SchematicDrawing) -> str:
    """The schematic as SVG text (deterministic: same description, same bytes)."""
    from .schematic_layout import Layout

    return Layout(drawing).render()


# Roles of the labelled parts in each drawing style.
_ROLES = {
    "zener": {"R": ["series"], "D": ["zener"], "DZ": ["zener"], "C": ["reservoir", "output"]},
    "follower": {"R": ["base"], "D": ["zener"], "DZ": ["zener"], "Q": ["pass"],
                 "C": ["reservoir", "output"]},
    "three-terminal": {"U": ["reg"], "C": ["reservoir", "input", "output"]},
    "adjustable": {"U": ["reg"], "R": ["upper", "lower"], "C": ["reservoir", "input", "output"]},
    "none": {"C": ["reservoir", "output"]},
    "series": {"R": ["series"], "C": ["reservoir", "output"]},
}
_C_FILL = ("reservoir", "output", "input")          # which capacitor roles are filled first
_REQUIRED = {
    "zener": ("series", "zener"),
    "follower": ("base", "zener", "pass"),
    "three-terminal": ("reg", "input", "output"),
    "adjustable": ("reg", "upper", "lower", "input", "output"),
    "none": (),
    "series": ("series",),
}
_ROLE_LETTER = {"series": "R", "base": "R", "upper": "R", "lower": "R", "zener": "D",
                "pass": "Q", "reg": "U", "reservoir": "C", "input": "C", "output": "C"}
