"""Direct tests of the worst-case corners (docgen.verify.corners) and the safety cautions
(docgen.cautions) against hand-worked numbers and the standards' limits.

Limits (docs/references.md): [IEC62368-1] ES1 60 V d.c. (from memory); [IEC61558-2-6] 50 V a.c.
no-load for a safety isolating transformer; the corner set is the full cross product of the
tolerance extremes (common practice for worst-case analysis).
"""

from __future__ import annotations

import numpy as np
import pytest

from docgen.cautions import STANDING, rating_cautions, triggered_cautions
from docgen.design import Check
from docgen.regulators import regulator
from docgen.topology import topology as topology_record
from docgen.trace import Ledger
from docgen.verify.corners import corner_points, sample_points


def corner_ledger() -> Ledger:
    L = Ledger()
    for vid, val in (("mains.tol_low", 0.10), ("mains.tol_high", 0.06),
                     ("output.i_min_worst", 0.0), ("output.i_max", 0.04),
                     ("reservoir.c", 2200e-6), ("reservoir.tol", 0.20),
                     ("zener.v_knee_min", 8.2), ("zener.v_knee_max", 9.4),
                     ("zener.v_min", 8.6), ("zener.v_max", 9.6), ("zener.v_nom", 9.1),
                     ("zener.tol", 0.05), ("zener.r_z", 2.0), ("zener.i_zt", 0.02),
                     ("zener.r", 150.0), ("zener.r_tol", 0.05),
                     # zener voltage extremes with self-heating, and the data for the samples'
                     # hand worst-case self-heating: 0.4 W x 100 K/W = 40 K, 0.06 %/K
                     ("zener.v_min_hot", 8.5), ("zener.v_max_hot", 9.8), ("zener.p", 0.4),
                     ("zener.theta_ja", 100.0), ("zener.tempco", 0.0006),
                     # the rectifier junction at the ambient extremes; one mains frequency
                     ("rect.d_t_cold", 0.0), ("rect.d_t_hot", 50.0), ("mains.freq", 50.0)):
        L.given(vid, vid, val, "", vid)
    return L


def test_zener_corners_are_the_full_cross_product():
    pts = corner_points(corner_ledger(), regulator("zener"))
    assert len(pts) == 3 * 2 * 2 * 2 * 2 * 2  # 96: the last axis is the diode temperature
    # hand values: 230 V -10 % / +6 % -> 0.90, 1.00, 1.06; 2200 uF +/-20 % -> 1760 / 2640 uF;
    # 150 ohm +/-5 % -> 142.5 / 157.5 ohm
    assert sorted(set(np.round(pts.line, 12))) == [0.9, 1.0, 1.06]
    assert sorted(set(np.round(pts.c * 1e6, 9))) == [1760.0, 2640.0]
    assert sorted(set(np.round(pts.r, 9))) == [142.5, 157.5]
    # a shunt zener enters as its knee, V_Z - r_z I_ZT (piecewise-linear zener model), at the
    # hot extremes: 8.5 - 2 x 0.02 = 8.46 V and 9.8 - 0.04 = 9.76 V
    assert sorted(set(np.round(pts.v_z, 12))) == [8.46, 9.76]
    assert sorted(set(pts.load)) == [0.0, 0.04]
    assert sorted(set(pts.t_d)) == [0.0, 50.0] and set(pts.freq) == {50.0}
    assert len(set(pts.name)) == 96
    k = pts.name.index("low line, full load, C -20 %, V_Z high, R +5 %, diodes 50 degC")
    assert pts.t_d[k] == 50.0
    assert (pts.line[k], pts.load[k]) == (0.9, 0.04)
    assert pts.v_z[k] == pytest.approx(9.76, rel=1e-12)
    assert pts.c[k] == pytest.approx(1760e-6) and pts.r[k] == pytest.approx(157.5)


def test_follower_uses_the_zener_voltage_and_series_kinds_drop_it():
    pts = corner_points(corner_ledger(), regulator("follower"))
    assert sorted(set(pts.v_z)) == [8.5, 9.8]  # the base sits at V_Z itself, hot extremes
    L = corner_ledger()
    L.given("reg.v_out_min", "", 4.8, "V", "")
    L.given("reg.v_out_max", "", 5.2, "V", "")
    three = corner_points(L, regulator("three-terminal"))
    # mains x load x capacitance x the regulator's output setpoint at its tolerance extremes
    assert len(three) == 3 * 2 * 2 * 2 * 2  # ... x the diode junction cold / hot
    assert sorted(set(three.v_z)) == [4.8, 5.2] and "V_Z" not in " ".join(three.name)
    assert set(three.r) == {1.0}  # no series resistor axis


def test_monte_carlo_samples_stay_in_their_bands_and_repeat():
    L = corner_ledger()
    a = sample_points(L, 2000, seed=7, t_min=0.0, t_max=50.0, reg=regulator("zener"))
    b = sample_points(L, 2000, seed=7, t_min=0.0, t_max=50.0, reg=regulator("zener"))
    assert np.array_equal(a.line, b.line) and np.array_equal(a.v_z, b.v_z)
    assert a.line.min() >= 0.9 and a.line.max() <= 1.06
    assert a.c.min() >= 1760e-6 * (1 - 1e-12) and a.c.max() <= 2640e-6 * (1 + 1e-12)
    assert a.r.min() >= 142.5 - 1e-9 and a.r.max() <= 157.5 + 1e-9
    assert a.load.min() >= 0.0 and a.load.max() <= 0.04
    # V_Z: 9.1 V +/-5 % at 0..50 degC ambient plus 40 K self-heating, 0.06 %/K from 25 degC,
    # less r_z I_ZT = 0.04 V: bounds 8.645 + 9.1 x 0.0006 x 15 - 0.04 = 8.68690 V and
    # 9.555 + 9.1 x 0.0006 x 65 - 0.04 = 9.87990 V
    assert a.v_z.min() >= 8.6869 - 1e-9 and a.v_z.max() <= 9.8799 + 1e-9
    assert a.v_z.max() - a.v_z.min() > 0.9  # spread over most of the 1.19 V band
    # uniform draws [CP-MONTE-CARLO]: the mean of 2000 uniform line factors is near the middle
    # of the band, 0.98, within a few standard errors (0.046 / sqrt(2000) = 0.001)
    assert a.line.mean() == pytest.approx(0.98, abs=0.005)


def _warn(ref: str) -> Check:
    return Check("check.x", "Thing <= rating", 0.97, 1.0, "W", "max", 0.03, "warn", "hot", "a",
                 "b", ref=ref)


def test_standing_cautions_defer_to_codes():
    ids = [c.id for c in STANDING]
    assert {"caution.mains", "caution.fusing", "caution.defer"} <= set(ids)
    assert all(c.source for c in STANDING)


@pytest.mark.parametrize("v_dc, v_sec, energy, topology, expected", [
    (59.0, 40.0, 5.0, "bridge", set()),
    (61.0, 40.0, 5.0, "bridge", {"caution.above_elv"}),  # above the 60 V ES1 limit
    (59.0, 51.0, 5.0, "bridge", {"caution.secondary_not_selv"}),  # above 50 V a.c. no-load
    (59.0, 40.0, 21.0, "bridge", {"caution.stored_energy"}),  # above 20 J (from memory)
    (10.0, 9.0, 1.0, "half-wave", {"caution.half_wave_dc"}),  # DC in the core
])
def test_triggered_cautions_at_the_standards_limits(v_dc, v_sec, energy, topology, expected):
    got = {c.id for c in triggered_cautions(v_dc, v_sec, energy, [],
                                            topology=topology_record(topology))}
    assert got == expected


def test_near_rating_caution_names_the_part():
    got = triggered_cautions(10.0, 9.0, 1.0, [_warn("Q1"), _warn("")],
                             topology=topology_record("bridge"))
    assert [c.id for c in got] == ["caution.near_rating.Q1"]
    assert "Q1" in got[0].title and "3.0 %" in got[0].text


def test_one_rating_caution_per_part_and_none_left_out():
    """Two close checks on one part give one caution naming both; a part that fails (less
    margin than a warning) gets one too, worded as beyond its rating (common practice)."""
    import dataclasses

    two = dataclasses.replace(_warn("U1"), id="check.y", title="Other <= rating", margin=0.01)
    fail = dataclasses.replace(_warn("U2"), id="check.z", status="fail", margin=-0.2)
    ok = dataclasses.replace(_warn("U3"), id="check.w", status="pass", margin=0.5)
    got = rating_cautions([_warn("U1"), two, fail, ok])
    assert [c.id for c in got] == ["caution.near_rating.U1", "caution.near_rating.U2"]
    u1, u2 = got
    assert u1.text.index("1.0 %") < u1.text.index("3.0 %")  # least margin first
    assert u1.triggered_by == "check.y, check.x"
    assert "beyond" in u2.title and "exceeded by 20.0 %" in u2.text
