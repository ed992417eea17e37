"""Layout of the whole schematic: mains, fuse, transformer, rectifier, then one rail per
polarity with its outputs, serialised to SVG with the labels as text."""

from __future__ import annotations

from typing import Any
from xml.sax.saxutils import escape

from .schematic import _C_FILL, _REQUIRED, _ROLE_LETTER, _ROLES, OutputDrawing, SchematicDrawing
from .schematic_sections import Sections
from .schematic_text import (
    BUMP,
    COL_GAP,
    FONT,
    FS,
    FS_SMALL,
    LBL_GAP,
    MAX_WIDTH_CM,
    PHYS_SCALE,
    PT_PER_UNIT,
    STROKE,
    SYMBOL,
    WRAP,
    WRAP_ABOVE,
    H,
    _fmt,
    _natural,
    _split_designator,
    _Text,
    _text_width,
    _wrap,
)


class _Frame:
    """Drawing helpers in a frame whose y axis is flipped for a negative rail.

    In the frame the rail is at +H and 0 V at 0; `s` = -1 mirrors it below the 0 V line.
    Polarised parts are given as (a, b) for the positive case and turned round when mirrored.
    `dy` shifts the frame (the front end of a negative supply sits below the 0 V line).
    """

    def __init__(self, sch: Layout, s: int = 1, dy: float = 0.0):
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


class Layout(Sections):
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
