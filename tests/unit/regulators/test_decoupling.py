"""Input and output capacitors of three-terminal regulators: values typical of makers' data
sheets (from memory), voltage ratings the next standard step above the stress over the
capacitor voltage derating (common practice; the steps are the usual electrolytic/ceramic
ratings 6.3, 10, 16, 25, 35, 50 V ...)."""

from __future__ import annotations

import pytest

from docgen.regulators.decoupling import TYPICAL, size_decoupling
from docgen.trace import Ledger


@pytest.mark.parametrize("adjustable, v_in, v_out, rating_in, rating_out", [
    (False, 17.5, 5.2, 25.0, 10.0),   # 17.5 / 0.8 = 21.9 -> 25 V; 5.2 / 0.8 = 6.5 -> 10 V
    (True, 27.9, 6.9, 35.0, 10.0),    # 34.9 -> 35 V; 8.6 -> 10 V
    (False, 28.1, 15.6, 50.0, 25.0),  # 35.1 -> 50 V; 19.5 -> 25 V
])
def test_values_and_derated_voltage_ratings(adjustable, v_in, v_out, rating_in, rating_out):
    L = Ledger()
    L.given("reservoir.v_max", "V", v_in, "V", "peak")
    L.given("reg.v_out_max", "V", v_out, "V", "output")
    L.given("margins.cap_voltage", "k", 0.8, "%", "derating")
    size_decoupling(L, adjustable)
    assert (L["reg.c_in"], L["reg.c_out"]) == TYPICAL[adjustable]
    assert L["reg.c_in_v_rating"] == rating_in
    assert L["reg.c_out_v_rating"] == rating_out
    assert "makers' data sheets" in L.values["reg.c_in"].source
