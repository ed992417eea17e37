"""No regulator: the reservoir voltage is the output, so its trough, peak and ripple must all
lie inside the output requirements."""

from __future__ import annotations

from .. import equations as eq
from ..verify.checks import COMMON_CHECKS, OUTPUT_HIGH, OUTPUT_LOW, OUTPUT_RIPPLE
from .base import Regulator, record_output, series_ripple

TITLE = "Unregulated output"
INTRO = ("Without a regulator the reservoir voltage is the output: its trough, peak and ripple "
         "must all lie inside the output requirements.")


class Unregulated(Regulator):
    kind = "none"
    title = TITLE
    intro = INTRO
    load_model = "the load as a constant current"
    drawing = "none"
    engine_checks = (OUTPUT_RIPPLE, OUTPUT_HIGH, OUTPUT_LOW, *COMMON_CHECKS)

    def needs(self, ctx, L):
        record_output(ctx, L)
        L.calc("regulator.v_in_min_needed", eq.IDENT, r"V_{in,min}", "V",
               "Reservoir trough needed (lowest output allowed)", {"x": "output.v_lower_limit"},
               lambda x: x)
        L.calc("regulator.i_in_design", eq.IDENT, r"I_{in}", "A", "Load current at full load",
               {"x": "output.i_max"}, lambda x: x)
        L.calc("regulator.ripple_in_allowed", eq.IDENT, r"V_{r,in,out}", "V",
               "Ripple allowed at the output", {"x": "output.ripple_max"}, lambda x: x)

    def size(self, ctx, L):
        series_ripple(ctx, L)

    def circuit(self, L, pts, common):
        from ..engine import Circuit

        return Circuit(**common, load="current", i_load=pts.load)

    def derived_metrics(self, L, pts, m):
        return {"v_out_pp": m["ripple_pp"], "v_out_max": m["v_c_max"],
                "v_out_min": m["v_c_min"], "p_out": m["v_c_mean"] * pts.load}


KIND = Unregulated()
