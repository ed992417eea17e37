"""The engine's rectifier diode, fitted to the chosen part and moved with temperature.

Sources (docs/references.md): the Shockley law with a series resistance
V = n (kT/q) ln(1 + I / Is) + r_s I ([SEDRA-SMITH], diode forward characteristic; written out
in this file, not imported), [CODATA-SI] for k/q, and the ideal-junction temperature law
Is ~ T^XTI exp(-Eg / kT) ([SZE-NG], sections 2.3 and 3.3, from memory). A bridge loses two diode
drops ([SEDRA-SMITH], peak rectifier). Tolerance of the fit: 1 mV, a tenth of the 10 mV
resolution data sheets state forward voltages to (common practice).
"""

from __future__ import annotations

import math
import shutil
from pathlib import Path

import numpy as np
import pytest

from docgen.engine import Circuit, simulate
from docgen.pipeline import run
from docgen.spec import load_requirements
from docgen.stages.diodes import TYPES, fit

ROOT = Path(__file__).resolve().parents[2]
K_OVER_Q = 1.380649e-23 / 1.602176634e-19  # V/K, [CODATA-SI]
FIT_TOL = 1e-3  # V


def shockley(i: float, is_: float, n: float, rs: float, t_c: float = 25.0) -> float:
    """Forward drop of a junction with series resistance ([SEDRA-SMITH])."""
    return n * K_OVER_Q * (t_c + 273.15) * math.log1p(i / is_) + rs * i


@pytest.mark.parametrize("kind", ["silicon", "schottky"])
@pytest.mark.parametrize("v_f,i_f", [(1.0, 1.0), (1.1, 1.0), (0.5, 1.0), (0.95, 3.0),
                                     (0.85, 0.1)])
def test_one_point_fit_reproduces_the_stated_forward_voltage(kind, v_f, i_f):
    f = fit(v_f, i_f, TYPES[kind])
    assert shockley(i_f, f.is_, f.n, f.rs) == pytest.approx(v_f, abs=FIT_TOL)
    # the default share of the drop sits in the series resistance
    assert f.rs * i_f == pytest.approx(TYPES[kind].rs_share * v_f, rel=1e-12)


def test_stated_series_resistance_is_kept():
    f = fit(1.0, 2.0, TYPES["silicon"], rs=0.1)
    assert f.rs == 0.1 and f.n == TYPES["silicon"].n
    assert shockley(2.0, f.is_, f.n, f.rs) == pytest.approx(1.0, abs=FIT_TOL)


@pytest.mark.parametrize("points", [
    ((1.0, 1.0), (0.75, 0.05)),   # gentle: default n, series resistance from the two points
    ((0.9, 1.0), (0.6, 0.01)),    # steeper than n = 1.8 allows: exponential, n fitted
])
def test_two_point_fit_goes_through_both_points(points):
    (v1, i1), (v2, i2) = points
    f = fit(v1, i1, TYPES["silicon"], v2=v2, i2=i2)
    assert f.rs >= 0 and f.n > 0
    assert shockley(i1, f.is_, f.n, f.rs) == pytest.approx(v1, abs=FIT_TOL)
    assert shockley(i2, f.is_, f.n, f.rs) == pytest.approx(v2, abs=FIT_TOL)


def test_impossible_characteristics_are_refused():
    with pytest.raises(ValueError, match="series resistance"):
        fit(0.5, 1.0, TYPES["silicon"], rs=0.6)
    with pytest.raises(ValueError, match="rise with"):
        fit(1.0, 1.0, TYPES["silicon"], v2=1.1, i2=0.1)


def test_engine_bus_rises_with_the_junction_temperature():
    # Same circuit, rectifier junction at 0 and at 60 degC: the hot bridge drops less, so the
    # bus is higher, by about two junctions' temperature coefficient times 60 K. The old engine
    # only scaled kT/q with temperature, which raised the drop and lowered the bus.
    f = fit(1.0, 1.0, TYPES["silicon"])
    common = dict(topology="bridge", v_rms=12.0, freq=50.0, r_s=0.5, l_s=0.0, c=4700e-6,
                  esr=0.02, i_load=0.3, diode_is=f.is_, diode_n=f.n, diode_rs=f.rs,
                  diode_t_ref=25.0, diode_eg=1.11, diode_xti=3.0)
    ss = simulate(Circuit(**common, diode_t_c=np.array([0.0, 60.0])))
    assert ss.converged.all()
    rise = ss.v_c_max[1] - ss.v_c_max[0]
    # between 0.5 and 2.5 mV/K per junction, two junctions in series, over 60 K (the textbook's
    # ~2 mV/K at small currents, less at the charging peaks where the series resistance and the
    # higher junction voltage weigh in: [SEDRA-SMITH], [SZE-NG])
    assert 2 * 0.5e-3 * 60 < rise < 2 * 2.5e-3 * 60


def _design_with(tmp_path: Path, part: str):
    (tmp_path / "parts").mkdir(exist_ok=True)
    shutil.copy(ROOT / "specs" / "parts" / "demo-parts.toml", tmp_path / "parts")
    text = (ROOT / "specs" / "hydroponic-sensor-hub.toml").read_text(encoding="utf-8")
    spec = tmp_path / f"{part}.toml"
    spec.write_text(text.replace('topology = "bridge"', f'topology = "bridge"\npart = "{part}"'),
                    encoding="utf-8")
    return run(load_requirements(spec), samples=0)


@pytest.fixture(scope="module")
def silicon_and_schottky(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("diodes")
    return _design_with(tmp, "DP-D-1A-1000V"), _design_with(tmp, "DP-D-1A-40V-SCH")


def test_schottky_part_gives_a_higher_bus_than_a_silicon_part(silicon_and_schottky):
    si, sch = silicon_and_schottky
    # the same transformer and capacitor (sized by hand before the part is known) ...
    for vid in ("transformer.v_nl", "transformer.r_w", "reservoir.c"):
        assert si.values[vid].value == sch.values[vid].value
    # ... but the engine models each part: 1.1 V against 0.5 V at 1 A in the library
    assert si.values["rect.d_vf"].value == 1.1 and sch.values["rect.d_vf"].value == 0.5
    rows_si = {r["name"]: r for r in si.corners}
    for row in sch.corners:
        # two diodes in the path ([SEDRA-SMITH]); their stated drops differ by 0.6 V each at
        # 1 A, and by at least half that at the smaller charging peaks here
        assert row["v_c_max"] - rows_si[row["name"]]["v_c_max"] > 2 * 0.3


def test_fitted_parts_reproduce_their_stated_forward_voltage(silicon_and_schottky):
    for d in silicon_and_schottky:
        v = {k: x.value for k, x in d.values.items()}
        assert shockley(v["rect.d_if"], v["rect.d_is"], v["rect.d_n"], v["rect.d_rs"],
                        v["rect.d_t0"]) == pytest.approx(v["rect.d_vf"], abs=FIT_TOL)


def test_hot_corners_drop_less_than_cold_ones(silicon_and_schottky):
    for d in silicon_and_schottky:
        v = {k: x.value for k, x in d.values.items()}
        cold, hot = v["rect.d_t_cold"], v["rect.d_t_hot"]
        assert (cold, hot) == (d.requirements.environment.ambient_min,
                               d.requirements.environment.ambient_max)
        # the stated forward point, evaluated with the document's saturation currents
        assert shockley(v["rect.d_if"], v["rect.d_is_hot"], v["rect.d_n"], v["rect.d_rs"], hot) \
            < shockley(v["rect.d_if"], v["rect.d_is_cold"], v["rect.d_n"], v["rect.d_rs"], cold)
        assert v["rect.d_vf_hot"] < v["rect.d_vf_cold"]
        # every corner pair that differs only in the junction temperature: hot bus higher
        rows = {r["name"]: r for r in d.corners}
        pairs = 0
        for name, row in rows.items():
            if name.endswith(f"diodes {cold:g} degC"):
                hot_row = rows[name.replace(f"diodes {cold:g} degC", f"diodes {hot:g} degC")]
                assert hot_row["v_c_max"] > row["v_c_max"]
                pairs += 1
        assert pairs == len(rows) // 2
        model = next(a for a in d.assumptions if a.id == "assume.diode_model")
        assert f"{cold:g} degC and {hot:g} degC" in model.text


def _ledger_for_record(t_min: float = 0.0, t_max: float = 50.0):
    from docgen.trace import Ledger

    L = Ledger()
    L.given("rect.i_peak", "", 1.5, "A", "")
    L.given("env.t_min", "", t_min, "degC", "")
    L.given("env.t_max", "", t_max, "degC", "")
    return L


def test_library_part_with_two_points_is_fitted_through_both():
    from types import SimpleNamespace

    from docgen.parts.power_parts import Diode
    from docgen.spec.power_stages import Rectifier
    from docgen.stages.diodes import record_diode

    part = Diode(id="T-D2", v_rrm="100 V", i_f_avg="1 A", i_fsm="30 A", v_f="1.0 V",
                 v_f2="0.7 V", v_f2_current="20 mA")
    ctx = SimpleNamespace(spec=SimpleNamespace(rectifier=Rectifier(diode_drop="1.2 V")),
                          conflicts=[])
    L = _ledger_for_record()
    record_diode(ctx, L, part)
    for v, i in ((1.0, 1.0), (0.7, 0.02)):
        assert shockley(i, L["rect.d_is"], L["rect.d_n"], L["rect.d_rs"]) == pytest.approx(
            v, abs=FIT_TOL)
    # the file's own drop is not replaced silently: a visible note says what uses which
    assert [name for name, _ in ctx.conflicts] == ["rectifier.diode_drop"]
    assert L["rect.d_vf_hot"] < L["rect.d_vf"] < L["rect.d_vf_cold"]


def test_file_drop_is_stated_at_the_charging_peaks_unless_a_current_is_given():
    from types import SimpleNamespace

    from docgen.spec.power_stages import Rectifier
    from docgen.stages.diodes import record_diode

    for rect, i_f in ((Rectifier(), 1.5), (Rectifier(diode_drop_current="0.4 A"), 0.4)):
        L = _ledger_for_record()
        record_diode(SimpleNamespace(spec=SimpleNamespace(rectifier=rect), conflicts=[]), L, None)
        assert L["rect.d_if"] == i_f and L["rect.d_vf"] == 1.0
    # a Schottky rectifier defaults to a Schottky drop and law
    L = _ledger_for_record()
    rect = Rectifier(diode_type="schottky")
    record_diode(SimpleNamespace(spec=SimpleNamespace(rectifier=rect), conflicts=[]), L, None)
    assert L["rect.d_vf"] == 0.55 and L["rect.d_xti"] == 2.0
