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

import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import lru_cache
from types import MappingProxyType
from typing import Any
from xml.sax.saxutils import escape

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
    return _Schematic(drawing).render()


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

_ROLES = {
    "zener": {"R": ["series"], "D": ["zener"], "C": ["reservoir", "output"]},
    "follower": {"R": ["base"], "D": ["zener"], "Q": ["pass"], "C": ["reservoir", "output"]},
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


class _Frame:
    """Drawing helpers in a frame whose y axis is flipped for a negative rail.

    In the frame the rail is at +H and 0 V at 0; `s` = -1 mirrors it below the 0 V line.
    Polarised parts are given as (a, b) for the positive case and turned round when mirrored.
    `dy` shifts the frame (the front end of a negative supply sits below the 0 V line).
    """

    def __init__(self, sch: _Schematic, s: int = 1, dy: float = 0.0):
        self.sch, self.s, self.dy = sch, s, dy

    def p(self, x: float, y: float) -> tuple[float, float]:
        return (x, self.s * y + self.dy)

    def wire(self, *pts: tuple[float, float]) -> None:
        for a, b in zip(pts, pts[1:], strict=False):
            if a != b:
                self.sch.add(self.sch.elm.Line().at(self.p(*a)).to(self.p(*b)))

    def dot(self, x: float, y: float) -> None:
        self.sch.add(self.sch.elm.Dot(radius=0.1).at(self.p(x, y)))

    def terminal(self, x: float, y: float) -> None:
        self.sch.add(self.sch.elm.Dot(radius=0.14, open=True).at(self.p(x, y)))

    def part(self, cls: Any, a: tuple[float, float], b: tuple[float, float],
             oriented: bool = False, **kw: Any) -> Any:
        if oriented and self.s < 0:
            a, b = b, a
        return self.sch.add(cls(**kw).scale(SYMBOL).at(self.p(*a)).to(self.p(*b)))

    def text(self, x: float, y: float, lines: list[str], halign: str = "left",
             valign: str = "center", size: float = FS, color: str = "#000000") -> _Text:
        if self.s < 0:
            valign = {"top": "bottom", "bottom": "top"}.get(valign, valign)
        t = _Text(x, self.s * y + self.dy, [ln for ln in lines if ln], halign, valign, size,
                  color)
        self.sch.texts.append(t)
        return t


class _Schematic:
    def __init__(self, drawing: SchematicDrawing):
        self.dw = drawing
        self.texts: list[_Text] = []
        self.desc: list[str] = []
        self.used: set[str] = set()
        self._collect_designators()

    # -- bookkeeping ----------------------------------------------------------------------------
    def _collect_designators(self) -> None:
        for s in (self.dw.fuse, self.dw.transformer, self.dw.rectifier, self.dw.bleeder):
            des, _ = _split_designator(s)
            self.used.update(d.strip() for d in des.split(",") if d.strip())
        for o in self.dw.outputs:
            self.used.update(o.labels)

    def _fresh(self, letter: str) -> str:
        n = 1
        while f"{letter}{n}" in self.used:
            n += 1
        self.used.add(f"{letter}{n}")
        return f"{letter}{n}"

    def _assign(self, out: OutputDrawing, first_on_rail: bool) -> tuple[dict, list]:
        """Role -> (designator, value); and the (designator, value) pairs that fit no role."""
        roles = _ROLES[out.regulator]
        by_letter: dict[str, list[str]] = {}
        for key in sorted(out.labels, key=_natural):
            by_letter.setdefault(_natural(key)[0], []).append(key)
        assigned: dict[str, tuple[str, str]] = {}
        extra: list[tuple[str, str]] = []
        for letter, keys in by_letter.items():
            order = list(roles.get(letter, []))
            if letter == "C":
                if not first_on_rail:
                    order = [r for r in order if r != "reservoir"]
                chosen = [r for r in _C_FILL if r in order][:len(keys)]
                order = [r for r in order if r in chosen]
            for key, role in zip(keys, order, strict=False):
                assigned[role] = (key, out.labels[key])
            extra += [(k, out.labels[k]) for k in keys[len(order):]]
        needed = list(_REQUIRED[out.regulator]) + (["reservoir"] if first_on_rail else [])
        for role in needed:
            if role not in assigned:
                assigned[role] = (self._fresh(_ROLE_LETTER[role]), "")
        return assigned, extra

    def add(self, element: Any) -> Any:
        return self.d.add(element)

    def note(self, text: str) -> None:
        if text:
            self.desc.append(" ".join(text.split()))

    # -- labels ---------------------------------------------------------------------------------
    def part_lines(self, designator: str, value: str, wrap: int = WRAP) -> list[str]:
        self.note(f"{designator} {value}")
        return [designator] + _wrap(value, wrap)

    def top_lines(self, text: str, wrap: int = WRAP) -> list[str]:
        self.note(text)
        des, value = _split_designator(text)
        return ([des] if des else []) + _wrap(value, wrap)

    @staticmethod
    def width(lines: list[str], size: float = FS) -> float:
        return max((_text_width(t, size) for t in lines), default=0.0)

    # -- top level ------------------------------------------------------------------------------
    def render(self) -> str:
        import schemdraw
        import schemdraw.elements as elm

        self.elm = elm
        self.d = schemdraw.Drawing(canvas="svg", show=False)
        self.d.config(fontsize=FS_SMALL, font=FONT, lw=STROKE, color="black")
        split = self.dw.topology == "split"
        sign = -1 if (not split and self.dw.outputs and self.dw.outputs[0].polarity == "-") else 1
        x_dc = self.front_end(sign)
        rails = (1, -1) if split else (sign,)
        x_start = x_dc + 2.2
        gnd_start = self.gnd_from
        if split:
            x_start = x_dc + 1.4
            if self.dw.bleeder:
                f = _Frame(self, 1)
                lines = self.top_lines(self.dw.bleeder)
                f.part(elm.ResistorIEC, (x_start, -H), (x_start, H))
                f.dot(x_start, H)
                f.dot(x_start, -H)
                f.text(x_start + LBL_GAP, 0.9, lines, valign="bottom")
                x_start += LBL_GAP + self.width(lines) + COL_GAP
            gnd_start = x_start - 0.2
            x_start += 1.0
        gnd_symbol = gnd_start if split else x_dc + 1.0
        self.add(elm.Ground().at((gnd_symbol, 0)).theta(0))
        ends = []
        for s in rails:
            outs = [o for o in self.dw.outputs if (o.polarity == "+") == (s > 0)]
            ends.append(self.rail(s, x_dc, x_start, outs))
        x_end = max(ends)
        f = _Frame(self, 1)
        f.wire((gnd_start, 0), (x_end, 0))
        f.terminal(x_end, 0)
        f.text(x_end + 0.35, 0, ["0 V"])
        return self.finish()

    def front_end(self, sign: int) -> float:
        """Mains, fuse, transformer and rectifier. Returns the x where the DC wiring turns.

        Drawn upright in a frame whose top level (y = H) is the positive side and whose bottom
        level (y = 0) the negative side: rail and 0 V for a positive supply, 0 V and rail for a
        negative one (shifted down by H). A split supply is centred on the 0 V line instead.
        """
        elm = self.elm
        topo = self.dw.topology
        split = topo == "split"
        neg = sign < 0
        f = _Frame(self, 1, -H if neg else 0.0)
        yc = 0.0 if split else H / 2
        yp1, yp2 = yc + 2.5 * BUMP, yc - 2.5 * BUMP
        tapped = topo in ("center-tap", "split")
        n_sec = 8 if tapped else 5
        ys1, ys2 = yc + n_sec * BUMP / 2, yc - n_sec * BUMP / 2
        # mains
        f.terminal(0, yp1)
        f.terminal(0, yp2)
        f.text(-0.35, yp1, ["L"], halign="right", size=FS_SMALL)
        f.text(-0.35, yp2, ["N"], halign="right", size=FS_SMALL)
        self.note(f"mains {self.dw.mains_text}")
        f.text(-0.6, yp2 - 0.45, ["mains"] + _wrap(self.dw.mains_text, 12), valign="top")
        # labels first: the parts move right as far as their labels need
        fuse = self.top_lines(self.dw.fuse, WRAP_ABOVE) if self.dw.fuse else []
        xfmr = self.top_lines(self.dw.transformer, WRAP_ABOVE) if self.dw.transformer else []
        rect = self.top_lines(self.dw.rectifier, WRAP_ABOVE) if self.dw.rectifier else []
        fuse_right = 2.2 + self.width(fuse) / 2 if fuse else 0.0
        xp = max(4.8, fuse_right + 0.5 + self.width(xfmr) / 2 - 0.7)
        xfmr_right = xp + 0.7 + self.width(xfmr) / 2 if xfmr else xp + 1.0
        rect_left = xfmr_right + 0.5 + self.width(rect) / 2     # lowest centre for its label
        if fuse:
            f.wire((0.14, yp1), (0.9, yp1))
            f.part(elm.FuseIEC, (0.9, yp1), (3.5, yp1))
            f.wire((3.5, yp1), (xp, yp1))
            f.text(2.2, yp1 + 0.45, fuse, halign="center", valign="bottom")
        else:
            f.wire((0.14, yp1), (xp, yp1))
        f.wire((0.14, yp2), (xp, yp2))
        # transformer: windings bulge towards the core
        xs = xp + 1.4
        self.add(self._winding(f.p(xp, yp2), 5, right=True))
        self.add(self._winding(f.p(xs, ys2), n_sec, right=False))
        top, bot = max(yp1, ys1) + 0.15, min(yp2, ys2) - 0.15
        for xc in (xp + 0.6, xp + 0.8):
            f.wire((xc, bot), (xc, top))
        f.text(xp + 0.7, top + 0.45, xfmr, halign="center", valign="bottom")
        # rectifier
        if topo in ("bridge", "split"):
            x_dc = self._bridge_box(f, xs, max(xs + 1.2, rect_left - 1.2), ys1, ys2, split, rect)
            self.gnd_from = x_dc
            return x_dc
        xr = max(xs + 1.0, rect_left - 1.2)
        x_dc = xr + 3.6
        if topo == "half-wave":
            # positive: diode in the upper lead up to the rail, lower lead to 0 V;
            # negative: diode (reversed) in the lower lead down to the rail, upper lead to 0 V
            yd, yo, level, other = (ys2, ys1, 0.0, H) if neg else (ys1, ys2, H, 0.0)
            f.wire((xs, yd), (xr, yd))
            f.part(elm.Diode, *(((xr + 2.4, yd), (xr, yd)) if neg else ((xr, yd), (xr + 2.4, yd))))
            f.wire((xr + 2.4, yd), (x_dc, yd), (x_dc, level))
            # the lead to 0 V rises past the transformer label when it goes up
            xo = max(xs + 0.6, xfmr_right + 0.5) if neg else xs + 0.6
            f.wire((xs, yo), (xo, yo), (xo, other))
            self.gnd_from = xo
            f.text(xr + 1.2, yd + 0.45, rect, halign="center", valign="bottom")
        else:  # center-tap: both diodes to one node, centre tap to ground
            for y in (ys1, ys2):
                f.wire((xs, y), (xr, y))
                f.part(elm.Diode, *(((xr + 2.4, y), (xr, y)) if neg else ((xr, y), (xr + 2.4, y))))
            near, far, level = (ys2, ys1, 0.0) if neg else (ys1, ys2, H)
            f.wire((xr + 2.4, near), (x_dc, near), (x_dc, level))
            f.wire((xr + 2.4, far), (x_dc, far), (x_dc, near))
            f.dot(x_dc, near)
            f.wire((xs, yc), (xs + 0.7, yc))
            self.add(elm.Ground().at(f.p(xs + 0.7, yc)).theta(0))
            f.text(xr + 1.2, ys1 + 0.45, rect, halign="center", valign="bottom")
            self.gnd_from = x_dc + 1.0
        return x_dc

    def _winding(self, at: tuple[float, float], n: int, right: bool) -> Any:
        """A winding of n bumps upwards from `at`, bulging right (primary) or left."""
        from schemdraw.segments import SegmentArc

        e = self.elm.Element()
        r = BUMP / 2
        t1, t2 = (270, 90) if right else (90, 270)
        for k in range(n):
            e.segments.append(SegmentArc((0, r + k * BUMP), BUMP, BUMP, theta1=t1, theta2=t2))
        e.anchors["start"] = (0, 0)
        return e.at(at).theta(0)

    def _bridge_box(self, f: _Frame, xs: float, bx0: float, ys1: float, ys2: float,
                    split: bool, rect: list[str]) -> float:
        """Bridge rectifier package: ~ pins left, + and - pins right. Returns the DC corner x."""
        bx1 = bx0 + 2.4
        btop, bbot = ys1 + 0.6, ys2 - 0.6
        f.wire((bx0, btop), (bx1, btop), (bx1, bbot), (bx0, bbot), (bx0, btop))
        f.wire((xs, ys1), (bx0, ys1))
        f.wire((xs, ys2), (bx0, ys2))
        # a small four-diode icon inside the box, for recognition
        cx, cy = (bx0 + bx1) / 2, (ys1 + ys2) / 2
        self.add(self.elm.Rectifier().scale(0.42).theta(0).color("#555555")
                 .at(f.p(cx - 0.63, cy)))
        for y, mark in ((ys1, "~"), (ys2, "~")):
            f.text(bx0 + 0.12, y, [mark], halign="left", size=FS_SMALL)
        f.text(bx1 - 0.12, ys1, ["+"], halign="right", size=FS_SMALL)
        f.text(bx1 - 0.12, ys2, ["\u2212"], halign="right", size=FS_SMALL)
        f.text((bx0 + bx1) / 2, btop + 0.3, rect, halign="center", valign="bottom")
        x_dc = bx1 + 0.9
        f.wire((bx1, ys1), (x_dc, ys1), (x_dc, H))
        if split:
            f.wire((bx1, ys2), (x_dc, ys2), (x_dc, -H))
            xg = xs + 0.7
            f.wire((xs, 0), (xg, 0))
            self.add(self.elm.Ground().at((xg, 0)).theta(0))
        else:
            f.wire((bx1, ys2), (x_dc, ys2), (x_dc, 0))
        return x_dc

    # -- one rail -------------------------------------------------------------------------------
    def rail(self, s: int, x_dc: float, x: float, outs: list[OutputDrawing]) -> float:
        """Reservoir, bleeder and the outputs of one polarity. Returns the 0 V terminal x."""
        elm = self.elm
        f = _Frame(self, s)
        if not outs:   # nothing to regulate: reservoir and a bare terminal
            outs = [OutputDrawing("DC out", "none", "+" if s > 0 else "-")]
        roles, extra = self._assign(outs[0], first_on_rail=True)
        f.wire((x_dc, H), (x, H))
        x = self.shunt(f, x, elm.Capacitor, roles["reservoir"], cap="polar")
        if self.dw.bleeder and self.dw.topology != "split":
            x = self.shunt(f, x, elm.ResistorIEC, ("", self.dw.bleeder), top=True)
        x_tap = x - 0.4                 # where a bus to further outputs leaves the rail
        bus_y = H + 3.4
        terminals: list[float] = []
        for k, out in enumerate(outs):
            if k:
                roles, extra = self._assign(out, first_on_rail=False)
                f.wire((x_tap, H), (x_tap, bus_y), (x, bus_y), (x, H))
                if k == 1:
                    f.dot(x_tap, H)
                if k < len(outs) - 1:
                    f.dot(x, bus_y)
            x_term = getattr(self, "reg_" + out.regulator.replace("-", "_"))(f, x, roles)
            terminals.append(x_term)
            x = self.terminal(f, x_term, out, extra)
        return max(terminals)

    def shunt(self, f: _Frame, x: float, cls: Any, part: tuple[str, str], cap: bool | str = False,
              y0: float = 0.0, y1: float = H, dots: tuple[bool, bool] = (True, True),
              oriented: bool = True, top: bool = False, rail: bool = True,
              wrap: int = WRAP) -> float:
        """A part standing between y0 and y1 at x, label on the right. Returns the next x.

        When the part hangs from the rail (y1 == H) the rail is drawn on to the next x.
        `top` means `part` is a top-level text that carries its own designator. A capacitor
        (`cap`) is drawn polarised when cap == "polar" (the reservoir) or when its value names no
        nF/pF capacitance and no ceramic or film type.
        """
        lines = self.top_lines(part[1], wrap) if top else self.part_lines(*part, wrap)
        if cap:
            polar = cap == "polar" or not _NONPOLAR.search(part[1])
            f.part(cls, (x, y1), (x, y0), oriented=True, polar=polar)
        else:
            f.part(cls, (x, y0), (x, y1), oriented=oriented)
        if dots[0]:
            f.dot(x, y0)
        if dots[1]:
            f.dot(x, y1)
        f.text(x + LBL_GAP, (y0 + y1) / 2, lines)
        x_next = x + LBL_GAP + self.width(lines) + COL_GAP
        if rail and y1 == H:
            f.wire((x, H), (x_next, H))
        return x_next

    def series(self, f: _Frame, x: float, y: float, cls: Any, part: tuple[str, str],
               above: bool = True) -> float:
        """A part along a horizontal line from x, label above (or below). Returns its end x."""
        lines = self.part_lines(*part, WRAP_ABOVE)
        span = max(2.6, self.width(lines) + 0.4)
        f.part(cls, (x, y), (x + span, y))
        if above:
            f.text(x + span / 2, y + 0.45, lines, halign="center", valign="bottom")
        else:
            f.text(x + span / 2, y - 0.45, lines, halign="center", valign="top")
        return x + span

    def terminal(self, f: _Frame, x: float, out: OutputDrawing,
                 extra: list[tuple[str, str]]) -> float:
        """Output terminal at x with its name; returns where a following section may start."""
        f.terminal(x, H)
        sign = "+" if f.s > 0 else "\u2212"
        self.note(f"output ({sign}) {out.name} {out.v_out_text}")
        lines = [out.name, out.v_out_text]
        t = f.text(x + 0.35, H, lines)
        w = self.width(lines)
        if extra:
            note = ["also:"] + [" ".join(p for p in kv if p) for kv in extra]
            for k, v in extra:
                self.note(f"{k} {v}")
            f.text(x + 0.35, H - 0.3 - len(t.lines) * LINE / 2, note, valign="top",
                   size=FS_SMALL)
            w = max(w, self.width(note, FS_SMALL))
        return x + 0.35 + w + 1.6

    # -- regulators (drawn for the positive rail; the frame mirrors them) ----------------------
    # Each starts where the rail reaches x and returns the x of its output terminal, with the
    # rail drawn up to it.

    def _tail(self, f: _Frame, x: float, roles: dict) -> float:
        """Optional output capacitor before the terminal."""
        if "output" in roles:
            x = self.shunt(f, x, self.elm.Capacitor, roles["output"], cap=True)
        return x

    def reg_none(self, f: _Frame, x: float, roles: dict) -> float:
        return self._tail(f, x, roles)

    def reg_series(self, f: _Frame, x: float, roles: dict) -> float:
        """A series element on the rail (a dropping resistor), then the output."""
        x = self.series(f, x, H, self.elm.ResistorIEC, roles["series"])
        f.wire((x, H), (x + 1.0, H))
        return self._tail(f, x + 1.0, roles)

    def reg_zener(self, f: _Frame, x: float, roles: dict) -> float:
        x = self.series(f, x, H, self.elm.ResistorIEC, roles["series"])
        f.wire((x, H), (x + 1.0, H))
        x = self.shunt(f, x + 1.0, self.elm.Zener, roles["zener"])
        return self._tail(f, x, roles)

    def reg_follower(self, f: _Frame, x: float, roles: dict) -> float:
        """R from the rail to the base node, zener from it to 0 V, pass transistor on the rail."""
        elm = self.elm
        yb = 2.4                        # base node height
        f.dot(x, H)
        xr = self.shunt(f, x, elm.ResistorIEC, roles["base"], y0=yb, dots=(False, True),
                        oriented=False, rail=False)
        xz = self.shunt(f, x, elm.Zener, roles["zener"], y1=yb, wrap=WRAP_ABOVE)
        xb = max(xr + 0.4, x + 2.4)     # transistor base x
        f.wire((x, yb), (xb, yb), (xb, H - 0.75))
        f.wire((x, H), (xb - 0.7, H))
        cls = elm.BjtNpn if f.s > 0 else elm.BjtPnp
        self.add(cls(circle=True).theta(90 if f.s > 0 else -90).at(f.p(xb, H - 0.75)))
        lines = self.part_lines(*roles["pass"], WRAP_ABOVE)
        f.text(xb, H + 0.8, lines, halign="center", valign="bottom")
        x_next = max(xz, xb + 1.7, xb + self.width(lines) / 2 + 0.6)
        f.wire((xb + 0.7, H), (x_next, H))
        return self._tail(f, x_next, roles)

    def _regulator_box(self, f: _Frame, x: float, part: tuple[str, str],
                       bottom_pin: str) -> tuple[float, float]:
        """IN/OUT box on the rail from x, one pin at the bottom. Returns (right edge, pin x)."""
        lines = self.part_lines(*part, WRAP_ABOVE)
        w = max(2.8, self.width(lines) - 0.4)
        x0, x1 = x + 0.4, x + 0.4 + w
        top, bot = H + 0.7, H - 1.4
        f.wire((x, H), (x0, H))
        f.wire((x0, top), (x1, top), (x1, bot), (x0, bot), (x0, top))
        f.text(x0 + 0.15, H, ["IN"], halign="left", size=FS_SMALL)
        f.text(x1 - 0.15, H, ["OUT"], halign="right", size=FS_SMALL)
        xm = (x0 + x1) / 2
        f.text(xm, bot + 0.12, [bottom_pin], halign="center", valign="bottom", size=FS_SMALL)
        f.text(xm, top + 0.3, lines, halign="center", valign="bottom")
        return x1, xm

    def reg_three_terminal(self, f: _Frame, x: float, roles: dict) -> float:
        elm = self.elm
        x = self.shunt(f, x, elm.Capacitor, roles["input"], cap=True)
        x1, xm = self._regulator_box(f, x, roles["reg"], "GND")
        f.wire((xm, H - 1.4), (xm, 0))
        f.dot(xm, 0)
        f.wire((x1, H), (x1 + 1.2, H))
        return self.shunt(f, x1 + 1.2, elm.Capacitor, roles["output"], cap=True)

    def reg_adjustable(self, f: _Frame, x: float, roles: dict) -> float:
        elm = self.elm
        x = self.shunt(f, x, elm.Capacitor, roles["input"], cap=True)
        x1, xm = self._regulator_box(f, x, roles["reg"], "ADJ")
        ya = 2.6                        # adjust node height
        xr = x1 + 1.2
        f.wire((x1, H), (xr, H))
        f.wire((xm, H - 1.4), (xm, ya), (xr, ya))
        xa = self.shunt(f, xr, elm.ResistorIEC, roles["upper"], y0=ya, oriented=False)
        xb = self.shunt(f, xr, elm.ResistorIEC, roles["lower"], y1=ya, dots=(True, False),
                        oriented=False)
        f.wire((xa, H), (max(xa, xb), H))
        return self.shunt(f, max(xa, xb), elm.Capacitor, roles["output"], cap=True)

    # -- output ---------------------------------------------------------------------------------
    def finish(self) -> str:
        # The tree is serialised here rather than by ElementTree: its namespace prefixes are
        # process-wide state that other libraries change (WeasyPrint registers its own).
        self.d.draw(show=False)
        tree = self.d.fig.getsvg()
        vx, vy, vw, vh = (float(v) for v in tree.get("viewBox").split())
        x0, y0, x1, y1 = vx, vy, vx + vw, vy + vh
        for t in self.texts:
            bx0, by0, bx1, by1 = t.box()
            x0, x1 = min(x0, bx0 * PT_PER_UNIT), max(x1, bx1 * PT_PER_UNIT)
            y0, y1 = min(y0, -by1 * PT_PER_UNIT), max(y1, -by0 * PT_PER_UNIT)
        pad = 6.0
        x0, y0, x1, y1 = x0 - pad, y0 - pad, x1 + pad, y1 + pad
        w_pt, h_pt = x1 - x0, y1 - y0
        scale = min(PHYS_SCALE, MAX_WIDTH_CM / 2.54 * 72 / w_pt)
        width_cm, height_cm = w_pt * scale / 72 * 2.54, h_pt * scale / 72 * 2.54
        title = "; ".join([f"Schematic: {self.dw.topology} rectifier"] + [
            f"{o.name} ({o.polarity}, {o.regulator})" for o in self.dw.outputs])
        head = (f'<svg xmlns="http://www.w3.org/2000/svg" width="{width_cm:.2f}cm" '
                f'height="{height_cm:.2f}cm" viewBox="{_fmt(x0)} {_fmt(y0)} {_fmt(w_pt)} '
                f'{_fmt(h_pt)}">\n<title>{escape(title)}</title>\n'
                f'<desc>{escape(chr(10).join(self.desc))}</desc>\n'
                f'<rect x="{_fmt(x0)}" y="{_fmt(y0)}" width="{_fmt(w_pt)}" '
                f'height="{_fmt(h_pt)}" fill="#ffffff"/>\n')
        body = "".join(_serialise(child) for child in tree)
        texts = "\n".join(t.svg() for t in self.texts)
        return head + body + "\n" + texts + "\n</svg>\n"


def _serialise(el: Any) -> str:
    """One ElementTree element as SVG text, with local names only (no namespace prefixes)."""
    tag = el.tag.rsplit("}", 1)[-1]
    attrs = "".join(
        f' {k.rsplit("}", 1)[-1]}="{escape(v, {chr(34): "&quot;"})}"'
        for k, v in el.attrib.items()
        if not (k == "style" and v == "")
    ).replace("stroke-dasharray:-;", "")
    inner = escape(el.text or "") + "".join(_serialise(c) for c in el)
    return f"<{tag}{attrs}>{inner}</{tag}>" + escape(el.tail or "")
