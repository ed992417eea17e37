"""Worst-case corners, Monte Carlo and the checks built on them."""

from __future__ import annotations

import numpy as np
import pytest

from docgen.pipeline import run
from docgen.spec import load_requirements
from docgen.verify.evaluate import LIFE_CAP, capacitor_life

from ..conftest import DATA, DEMO_STANDALONE

HOUR = 3600.0


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    path = tmp_path_factory.mktemp("wc") / "demo.toml"
    path.write_text(DEMO_STANDALONE.replace("samples = 400", "samples = 600"))
    return run(load_requirements(path))


def _corner(design, key):
    return np.array([r[key] for r in design.corners if r[key] is not None])


@pytest.mark.parametrize(("key", "worst"), [("v_out_max", max), ("v_out_pp", max),
                                            ("v_c_min", min), ("i_sec_rms", max)])
def test_no_monte_carlo_sample_is_worse_than_the_worst_corner(demo, key, worst):
    # These quantities are monotonic in each tolerance (mains, load, capacitance, zener voltage,
    # resistor) over the bands drawn, so the corners bound every sample (property of the
    # corner method; common practice). A 0.5 % allowance covers the engine's own accuracy.
    corners = _corner(demo, key)
    if key not in demo.samples:
        pytest.skip(f"{key} not kept for samples")
    samples = np.asarray(demo.samples[key])
    samples = samples[np.isfinite(samples)]
    if worst is max:
        assert samples.max() <= corners.max() * 1.005
        assert corners.min() <= samples.min() * 1.005  # and the best corner bounds from below
    else:
        assert samples.min() >= corners.min() * 0.995
        assert samples.max() <= corners.max() * 1.005


def test_same_file_and_seed_repeat_exactly_and_another_seed_differs(tmp_path):
    path = tmp_path / "demo.toml"
    path.write_text(DEMO_STANDALONE)
    a = run(load_requirements(path))
    b = run(load_requirements(path))
    assert a.monte_carlo == b.monte_carlo
    assert [c.value for c in a.checks] == [c.value for c in b.checks]
    other = tmp_path / "other.toml"
    other.write_text(DEMO_STANDALONE.replace("seed = 42", "seed = 7"))
    c = run(load_requirements(other))
    assert c.monte_carlo["quantities"] != a.monte_carlo["quantities"]


def _ripple_check(text, tmp_path, limit):
    path = tmp_path / f"r{limit}.toml"
    path.write_text(text.replace('ripple_max = "100 mV"', f'ripple_max = "{limit}"'))
    design = run(load_requirements(path), samples=0)
    return next(c for c in design.checks if c.id == "check.output_ripple")


def test_tightening_a_requirement_flips_its_check_and_relaxing_flips_it_back(tmp_path):
    # A fixed capacitor, so the sizing cannot follow the tighter limit.
    text = (DATA / "all-pass.toml").read_text() + '\n[reservoir]\ncapacitance = "470 uF"\n' \
        'voltage_rating = "35 V"\n'
    loose = _ripple_check(text, tmp_path, "100 mV")
    assert loose.status == "pass"
    tight = _ripple_check(text, tmp_path, f"{loose.value * 1e3 * 0.5:.4f} mV")
    assert tight.status == "fail" and tight.value == pytest.approx(loose.value)
    again = _ripple_check(text, tmp_path, "100 mV")
    assert again.status == "pass"


def test_capacitor_life_follows_the_ten_degree_rule():
    # C-LIFE check [derived] from the 10-degree rule stated in makers' application
    # guides (common practice): 2000 h at 105 degC -> 32 000 h at 65 degC, 128 000 h at 45 degC.
    assert capacitor_life(2000 * HOUR, 105, 65, LIFE_CAP) == pytest.approx(32000 * HOUR)
    assert capacitor_life(2000 * HOUR, 105, 45, LIFE_CAP) == pytest.approx(128000 * HOUR)
    # ... and the extrapolation stops at about 15 years (common practice, [CP-10-DEGREE])
    assert capacitor_life(2000 * HOUR, 105, 35, LIFE_CAP) == LIFE_CAP
    assert LIFE_CAP / HOUR == pytest.approx(131490, rel=1e-3)


def test_derating_defaults_are_the_documented_ones():
    # Common practice, no single source ([CP-CAP-VOLTAGE], [CP-ZENER], [CP-SELECTION-TABLES]):
    # capacitor voltage at most 80 % of rating, zener and resistor power at most 50 %, diode
    # V_RRM at least 2 x PIV.
    from docgen.spec.margins import Margins

    m = Margins()
    assert (m.capacitor_voltage_derating, m.zener_power_derating, m.resistor_power_derating,
            m.diode_voltage_derating) == (0.8, 0.5, 0.5, 0.5)
    assert m.junction_max == 110.0  # common practice: 100-110 degC for margin ([CP-THERMAL])


def test_every_check_names_its_corner(demo):
    corner_names = {r["name"] for r in demo.corners}
    engine = [c for c in demo.checks if c.value_id.startswith("engine.")
              and c.id not in ("check.bridge_surge", "check.engine_converged")]
    assert engine
    for c in engine:
        # a regulation check compares two corners: "highest against lowest"
        names = c.corner.split(" against ") if c.id.endswith("_regulation") else [c.corner]
        assert all(n in corner_names for n in names), c.id
