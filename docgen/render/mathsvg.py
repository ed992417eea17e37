"""Typeset a LaTeX (mathtext) formula as a small standalone SVG of glyph outlines.

matplotlib's mathtext layout is used through TextPath, without a figure: about 10 ms a formula,
no fonts needed by the viewer, identical bytes on every run. Results are cached by content.
"""

from __future__ import annotations

import base64
from functools import lru_cache

FONT_SIZE = 11.0  # pt; the HTML scales the image by its intrinsic size


def _path_data(vertices, codes, height: float, x0: float) -> str:
    from matplotlib.path import Path

    parts: list[str] = []
    i = 0
    n = len(vertices)
    while i < n:
        code = codes[i]
        if code == Path.MOVETO:
            x, y = vertices[i]
            parts.append(f"M{x - x0:.2f} {height - y:.2f}")
            i += 1
        elif code == Path.LINETO:
            x, y = vertices[i]
            parts.append(f"L{x - x0:.2f} {height - y:.2f}")
            i += 1
        elif code == Path.CURVE3:
            (x1, y1), (x2, y2) = vertices[i], vertices[i + 1]
            parts.append(f"Q{x1 - x0:.2f} {height - y1:.2f} {x2 - x0:.2f} {height - y2:.2f}")
            i += 2
        elif code == Path.CURVE4:
            (x1, y1), (x2, y2), (x3, y3) = vertices[i], vertices[i + 1], vertices[i + 2]
            parts.append(
                f"C{x1 - x0:.2f} {height - y1:.2f} {x2 - x0:.2f} {height - y2:.2f} "
                f"{x3 - x0:.2f} {height - y3:.2f}"
            )
            i += 3
        elif code == Path.CLOSEPOLY:
            parts.append("Z")
            i += 1
        else:  # STOP or unknown
            i += 1
    return "".join(parts)


@lru_cache(maxsize=4096)
def formula_svg(latex: str) -> tuple[str, float, float]:
    """Return (svg text, width pt, height pt) for a mathtext formula (without the $ signs)."""
    from matplotlib.font_manager import FontProperties
    from matplotlib.textpath import TextPath

    prop = FontProperties(family="DejaVu Sans", size=FONT_SIZE)
    # Display-style fractions: mathtext's inline \frac shrinks numbers below reading size.
    tp = TextPath((0, 0), "$" + latex.replace(r"\frac", r"\dfrac") + "$", prop=prop)
    ext = tp.get_extents()
    pad = 1.0
    y_min = min(ext.y0, 0.0) - pad
    y_max = max(ext.y1, FONT_SIZE * 0.75) + pad
    height = y_max - y_min
    width = ext.x1 - ext.x0 + 2 * pad
    vertices = tp.vertices.copy()
    vertices[:, 1] -= y_min
    d = _path_data(vertices, tp.codes, height, ext.x0 - pad)
    svg = (
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{width:.2f}pt" height="{height:.2f}pt" '
        f'viewBox="0 0 {width:.2f} {height:.2f}"><path d="{d}" fill="#1a1a1a"/></svg>'
    )
    return svg, width, height


def formula_data_uri(latex: str) -> tuple[str, float, float]:
    svg, w, h = formula_svg(latex)
    encoded = base64.b64encode(svg.encode("utf-8")).decode("ascii")
    return f"data:image/svg+xml;base64,{encoded}", w, h
