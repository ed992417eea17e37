"""The sections of a schematic rail drawn part by part: shunt and series parts, the output
terminal, and one method per drawing style of a regulator section (``reg_<style>``).

Each regulator method starts where the rail reaches x and returns the x of its output terminal,
with the rail drawn up to it; it draws the positive rail and the frame mirrors it."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from .schematic_text import (
    _NONPOLAR,
    COL_GAP,
    FS_SMALL,
    LBL_GAP,
    LINE,
    WRAP,
    WRAP_ABOVE,
    H,
)

if TYPE_CHECKING:
    from .schematic import OutputDrawing
    from .schematic_layout import _Frame


class Sections:
    """Mixin of the layout: the drawing of parts along a rail."""

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
