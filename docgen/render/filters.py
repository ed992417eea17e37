"""Number and text formatting for templates: the only place numbers become text."""

from __future__ import annotations

from ..units import display_unit, format_quantity


def qty(value: float, unit: str, digits: int = 4) -> str:
    return format_quantity(value, unit, digits)


def pct(value: float, digits: int = 3) -> str:
    return format_quantity(value, "%", digits)


def unit_text(unit: str) -> str:
    return display_unit(unit)


STATUS_WORDS = {"pass": "PASS", "warn": "WARN", "fail": "FAIL", "infeasible": "INFEASIBLE"}


def status_word(status: str) -> str:
    return STATUS_WORDS.get(status, status.upper())


def anchor(value_id: str) -> str:
    return "v-" + value_id.replace(".", "-")


# --------------------------------------------------------------------------- formulas as text

_SYMBOLS = {
    r"\cdot": " · ", r"\times": " × ", r"\%": "%", r"\,": " ", r"\ ": " ", r"\quad": "   ",
    r"\theta": "θ", r"\mu": "µ", r"\Omega": "Ω", r"\pi": "π", r"\eta": "η", r"\delta": "δ",
    r"\Delta": "Δ", r"\alpha": "α", r"\beta": "β", r"\circ": "°", r"\lceil": "⌈",
    r"\rceil": "⌉", r"\lfloor": "⌊", r"\rfloor": "⌋", r"\max": "max", r"\min": "min",
    r"\arccos": "arccos", r"\tan": "tan", r"\le": " ≤ ", r"\ge": " ≥ ", r"\approx": " ≈ ",
    r"\pm": "±", r"\infty": "∞", r"\ln": "ln", r"\exp": "exp", r"\sin": "sin", r"\cos": "cos",
}


def _group(text: str, i: int) -> tuple[str, int]:
    """The brace group (or single character) starting at ``i``: (content, index after it)."""
    while i < len(text) and text[i] == " ":
        i += 1
    if i >= len(text):
        return "", i
    if text[i] != "{":
        if text[i] == "\\":
            j = i + 1
            while j < len(text) and text[j].isalpha():
                j += 1
            return text[i:max(j, i + 2)], max(j, i + 2)
        return text[i], i + 1
    depth, j = 0, i
    while j < len(text):
        depth += {"{": 1, "}": -1}.get(text[j], 0)
        if depth == 0:
            return text[i + 1:j], j + 1
        j += 1
    return text[i + 1:], len(text)


def _simple(text: str) -> bool:
    return all(ch.isalnum() or ch in ".,µΩ° _" for ch in text)


def formula_text(latex: str) -> str:
    """A formula as plain text a screen reader can speak and a person can read: the LaTeX of
    the equations without its markup ("V_{lo} = V_{nom} \\cdot (1 - t_{lo})" becomes
    "V_lo = V_nom · (1 − t_lo)")."""
    out: list[str] = []
    i = 0
    while i < len(latex):
        ch = latex[i]
        if ch == "\\":
            name, j = _group(latex, i)
            if name in (r"\frac",):
                num, j = _group(latex, j)
                den, j = _group(latex, j)
                num, den = formula_text(num), formula_text(den)
                num = num if _simple(num) else f"({num})"
                den = den if _simple(den) else f"({den})"
                out.append(f"{num} / {den}")
            elif name == r"\sqrt":
                arg, j = _group(latex, j)
                out.append(f"√({formula_text(arg)})")
            elif name in (r"\mathrm", r"\text", r"\mathit", r"\operatorname"):
                arg, j = _group(latex, j)
                out.append(formula_text(arg))
            elif name in (r"\left", r"\right"):
                pass
            else:
                out.append(_SYMBOLS.get(name, name.lstrip("\\")))
            i = j
        elif ch in "_^":
            arg, j = _group(latex, i + 1)
            arg = formula_text(arg)
            if ch == "^" and arg.strip() == "°":
                out.append("°")
            elif ch == "^":
                out.append("^" + (arg if _simple(arg) else f"({arg})"))
            else:
                out.append("_" + arg.replace(" ", ""))
            i = j
        elif ch in "{}":
            i += 1
        elif ch == "-":
            out.append("−")
            i += 1
        else:
            out.append(ch)
            i += 1
    text = " ".join("".join(out).split())
    return text.replace("° C", "°C")
