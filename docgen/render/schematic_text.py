"""Geometry and text metrics of the schematic: units, sizes, label wrapping and widths from
the DejaVu Sans metrics matplotlib ships, and SVG text elements."""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from xml.sax.saxutils import escape

# ---------------------------------------------------------------------------------------------
# Geometry (schemdraw drawing units; 1 unit = 36 pt in the SVG's own coordinates, y upwards).

PT_PER_UNIT = 36.0
FONT = "DejaVu Sans"
FS = 20.0            # label font size, SVG pt
FS_SMALL = 15.0      # pin names, L/N
LINE = 1.2 * FS / PT_PER_UNIT        # label line pitch, units
PHYS_SCALE = 7.0 / FS                # natural size: labels at 7 pt
MAX_WIDTH_CM = 16.0
H = 5.5              # rail height above (or below) the 0 V line
BUMP = 0.5           # winding bump diameter
LBL_GAP = 0.55       # part body to its label
COL_GAP = 0.8        # label to the next column
WRAP = 9             # value text beside a part wraps at about this many characters
WRAP_ABOVE = 12      # ... and above a part
STROKE = 1.8         # line width, SVG pt
SYMBOL = 1.25        # size of two-terminal symbols relative to schemdraw's own

_DESIG = re.compile(r"^([A-Za-z]+)(\d*)")
_LEAD_DESIG = re.compile(r"^((?:[A-Z]{1,3}\d+[A-Z]?,?\s+)+)(.*)$")
_NONPOLAR = re.compile(r"\d\s*[np]F\b|ceramic|film|MLCC", re.IGNORECASE)
_NUM = re.compile(r"^[-+\u2212]?[\d.,]+$")

def _natural(key: str) -> tuple[str, int, str]:
    m = _DESIG.match(key)
    if not m:
        return ("", 0, key)
    return (m.group(1).upper(), int(m.group(2)) if m.group(2) else 10**9, key)


def _split_designator(text: str) -> tuple[str, str]:
    """'F1 160 mA T' -> ('F1', '160 mA T'); 'D1, D2 1 A' -> ('D1, D2', '1 A')."""
    m = _LEAD_DESIG.match(text.strip() + " ")
    if not m:
        return "", text.strip()
    return m.group(1).strip(), m.group(2).strip()


def _wrap(value: str, width: int = WRAP) -> list[str]:
    """Wrap value text at spaces, keeping a number with the unit after it."""
    words = value.split()
    chunks: list[str] = []
    i = 0
    while i < len(words):
        w = words[i]
        if _NUM.match(w) and i + 1 < len(words) and not _NUM.match(words[i + 1]):
            w = f"{w} {words[i + 1]}"
            i += 1
        chunks.append(w)
        i += 1
    lines: list[str] = []
    for c in chunks:
        if lines and len(lines[-1]) + 1 + len(c) <= width:
            lines[-1] += " " + c
        else:
            lines.append(c)
    return lines


@lru_cache(maxsize=1)
def _font():
    import os

    import matplotlib
    from matplotlib.ft2font import FT2Font

    font = FT2Font(os.path.join(matplotlib.get_data_path(), "fonts", "ttf", "DejaVuSans.ttf"))
    font.set_size(100.0, 72)
    return font


@lru_cache(maxsize=4096)
def _advance(ch: str) -> float:
    """Advance width of one character in em (DejaVu Sans)."""
    font = _font()
    try:
        glyph = font.load_char(ord(ch))
    except (RuntimeError, ValueError):
        return 0.6
    return glyph.linearHoriAdvance / 65536.0 / 100.0


def _text_width(s: str, size: float = FS) -> float:
    """Width of a line of text in drawing units."""
    return sum(_advance(c) for c in s) * size / PT_PER_UNIT


@dataclass
class _Text:
    x: float
    y: float
    lines: list[str]
    halign: str
    valign: str
    size: float
    color: str = "#000000"

    def box(self) -> tuple[float, float, float, float]:
        w = max((_text_width(t, self.size) for t in self.lines), default=0.0)
        h = len(self.lines) * 1.2 * self.size / PT_PER_UNIT
        x0 = {"left": self.x, "center": self.x - w / 2, "right": self.x - w}[self.halign]
        top = {"top": self.y, "center": self.y + h / 2, "bottom": self.y + h}[self.valign]
        return x0, top - h, x0 + w, top

    def svg(self) -> str:
        pitch = 1.2 * self.size / PT_PER_UNIT
        _, _, _, top = self.box()
        anchor = {"left": "start", "center": "middle", "right": "end"}[self.halign]
        x = _fmt(self.x * PT_PER_UNIT)
        spans = []
        for i, line in enumerate(self.lines):
            base = top - i * pitch - pitch / 2 - 0.36 * self.size / PT_PER_UNIT
            spans.append(f'<tspan x="{x}" y="{_fmt(-base * PT_PER_UNIT)}">{escape(line)}</tspan>')
        return (f'<text font-family="{FONT}" font-size="{_fmt(self.size)}" '
                f'text-anchor="{anchor}" fill="{self.color}">{"".join(spans)}</text>')


def _fmt(v: float) -> str:
    s = f"{v:.2f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s
