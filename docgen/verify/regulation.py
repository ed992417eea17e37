"""Line and load regulation from the engine's corners.

Line regulation: at full load, the spread of the mean output voltage over low, nominal and high
line, for one set of part values (capacitance, reference and resistor at one corner each).
Load regulation: at nominal mains, the spread from the least load to full load, likewise. Both
are fractions of the nominal output; the worst set of part values is reported with its two
corners ("highest against lowest"; when the mean does not move, any two of the set).
"""

from __future__ import annotations

import math

from .. import equations as eq
from ..design import Check
from ..trace import Ledger
from .checks import make_check
from .corners import CornerResult, model_inputs


def _spread(cr: CornerResult, keep, vary: str) -> tuple[float, str]:
    """Largest spread of the mean output over ``vary`` ("line" or "load") among the corners
    ``keep`` selects, grouped by the other axes; (nan, "") when no group has two points."""
    pts = cr.corners
    v = cr.corner_metric("v_out_mean")
    groups: dict[tuple, list[int]] = {}
    for k in range(cr.n_corners):
        if keep(k) and math.isfinite(float(v[k])):
            other = (pts.load[k] if vary == "line" else pts.line[k], pts.c[k], pts.v_z[k],
                     pts.r[k])
            groups.setdefault(other, []).append(k)
    best, where = math.nan, ""
    for ks in groups.values():
        if len(ks) < 2:
            continue
        hi = max(ks, key=lambda k: v[k])
        lo = min((k for k in ks if k != hi), key=lambda k: v[k])
        d = float(v[hi] - v[lo])
        if not d <= best:
            best = d
            where = f"{pts.name[hi]} against {pts.name[lo]}"
    return best, where


def regulation_checks(ctx, L: Ledger, cr: CornerResult, reg) -> list[Check]:
    """The line and load regulation checks the requirements ask for."""
    w = ctx.spec.margins.warn_band
    v_nom = L["output.v_nom"]
    out: list[Check] = []
    cases = (
        ("line", "output.line_regulation", lambda k: cr.corners.load[k] == L["output.i_max"],
         "Line regulation (engine, full load, over the mains range)", r"\delta_{line}"),
        ("load", "output.load_regulation",
         lambda k: cr.corners.line_name[k] == "nominal mains",
         "Load regulation (engine, nominal mains, least to full load)", r"\delta_{load}"),
    )
    for vary, limit_id, keep, title, symbol in cases:
        if limit_id not in L:
            continue
        spread, where = _spread(cr, keep, vary)
        if not math.isfinite(spread):
            continue  # the engine check "every corner solved" already fails
        vid = f"engine.{vary}_regulation"
        L.measured(vid, eq.REGULATION_SPREAD, symbol, spread / v_nom, "%", title,
                   ("output.v_nom", *model_inputs(L)), where)
        out.append(make_check(L, f"check.{vary}_regulation",
                              f"{vary.capitalize()} regulation <= limit", vid, limit_id, "max",
                              where, w, ref="", requirement=f"output[0].{vary}_regulation"))
    return out

