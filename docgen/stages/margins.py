"""Design margins: the ratios and the warning band every later stage reads."""

from __future__ import annotations

from ..topology import topology
from ..trace import Ledger
from .context import SizingContext

WRITES = ("margins.",)
TITLE = "Design margins"
INTRO = "Derating factors and design ratios used below."


def record_margins(ctx: SizingContext, L: Ledger) -> None:
    m = ctx.spec.margins
    topo = topology(ctx.spec.rectifier.topology)
    if m.secondary_rms_factor is not None:
        L.given("margins.secondary_rms_factor", r"k_{rms}", m.secondary_rms_factor, "",
                "Secondary RMS to DC current ratio")
    else:
        L.given("margins.secondary_rms_factor", r"k_{rms}", topo.rms_factor, "",
                f"Secondary RMS to DC current ratio ({topo.name}, capacitor input)",
                defaulted=True, source="common practice: upper end of makers' selection "
                "tables (bridge 1.6-1.8, center-tap 1.0-1.2 per half, half-wave 2.6-3.6)")
    L.given("margins.warn_band", r"w", m.warn_band, "%", "Warning band for checks",
            defaulted="warn_band" not in m.model_fields_set)
