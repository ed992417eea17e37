"""Independent verification of every demo design: the document's engine figures against a
separate integration of the same circuit.

For each spec in specs/ the design is built in-process (docgen.pipeline.run, then
docgen.render.results_json.results_dict). The circuit the engine was given is rebuilt from the
document's own values (transformer no-load voltage and its mains corners, winding resistance,
leakage inductance, capacitance with its tolerance, ESR, zener knee and dynamic resistance,
series resistor with its tolerance, load currents, regulator bias and dropout knee) at each corner
the document names beside a check, and integrated with tests/reference/independent.py (scipy
solve_ivp, event-driven; never the project's engine). Each engine figure the document claims
must agree within 0.5 %, and each check's verdict (pass / warn / fail) must be unchanged.

The model of the design follows the production rules: zener corners at the tolerance and
temperature extremes with self-heating (zener.v_min_hot / v_max_hot; a shunt zener as its knee
V_Z - r_z I_ZT); a follower's output window with V_BE at its spread (q.v_be_min / v_be_max); a
three-terminal regulator at its output-setpoint extremes, dropping out in the circuit below the
setpoint plus its typical dropout, its output held to the input less the worst-case dropout
(reg.dropout_max) and its ripple rejection the near-dropout figure (reg.rr_low) when the trough is
within reg.rr_window of reg.v_in_floor; the switch-on as the whole transient until charged, at
least and full load; the rectifier's diode as the document fits it (rect.d_*: saturation current,
emission coefficient, series resistance) with its saturation current at the corner's junction
temperature by the ideal-junction law, at the corner's mains frequency; the fuse's operating current with the magnetising current, both rails of a
split supply.

Figures the document derives from the engine's waveform with a regulator's formula are
recomputed here from the independent waveform with the published relation:
- three-terminal: output ripple = input ripple x 10^(-RR/20) ([CP-RR]); regulator power
  (V_in,mean - V_out) I_out + V_in,mean I_Q and T_J = T_A + P x (theta chain) ([CP-THREE-TERMINAL],
  [CP-THERMAL]);
- emitter follower ([ROSCOE-6.101]): base current I_out / (beta + 1); zener current at the trough
  (V_C,min - V_Z) / R1 - I_B; resistor power the true mean of (v_C(t) - V_Z)^2 / R1; zener-node
  ripple r_z / (R1 + r_z) of the input ripple ([SEDRA-SMITH] line regulation); pass-transistor
  power (V_in,mean - V_out) I_out and its junction temperature as above;
- unregulated: the reservoir is the output.
"""

from __future__ import annotations

import itertools
import math
import time
from pathlib import Path

import pytest

from docgen.pipeline import run
from docgen.render.results_json import results_dict
from docgen.spec import load_requirements
from docgen.verify.checks import margin_of, status_of

from .independent import Point

ROOT = Path(__file__).resolve().parents[2]
SPECS = sorted((ROOT / "specs").glob("*.toml"))
TOL = 0.005  # 0.5 %

K_OVER_Q = 1.380649e-23 / 1.602176634e-19  # V/K, [CODATA-SI] exact constants


def saturation_at(v: dict, t_c: float) -> float:
    """The document's diode saturation current (stated at rect.d_t0) at junction temperature
    t_c, by the ideal-junction law Is ~ T^XTI exp(-Eg / kT) in its emission-coefficient form
    (S. M. Sze, K. K. Ng, Physics of Semiconductor Devices, 3rd ed., sections 2.3 and 3.3, from
    memory); written here, not imported from the project."""
    t, t0, n = t_c + 273.15, v["rect.d_t0"] + 273.15, v["rect.d_n"]
    return v["rect.d_is"] * (t / t0) ** (v["rect.d_xti"] / n) * math.exp(
        v["rect.d_eg"] / (n * K_OVER_Q) * (1 / t0 - 1 / t))


def test_document_states_the_diode_at_both_junction_temperatures(verified):
    # the document's saturation currents at the cold and hot corners follow the law above, and
    # the hot junction drops less than the cold one at the stated current
    for res, rails, _ in verified.values():
        for rail in rails:
            v = rail.v
            for tag in ("cold", "hot"):
                assert v[f"rect.d_is_{tag}"] == pytest.approx(
                    saturation_at(v, v[f"rect.d_t_{tag}"]), rel=1e-9)
            if v["rect.d_t_hot"] > v["rect.d_t_cold"]:
                assert v["rect.d_vf_hot"] < v["rect.d_vf_cold"]


class Rail:
    """One rail of a built design: its values and checks (prefix "neg." for a split's minus)."""

    def __init__(self, res: dict, spec, prefix: str, corner_prefix: str, index: int):
        self.res = res
        self.prefix = prefix
        self.corner_prefix = corner_prefix
        self.v = {k[len(prefix):]: d["value"] for k, d in res["values"].items()
                  if k.startswith(prefix)} if prefix else {
                      k: d["value"] for k, d in res["values"].items() if not k.startswith("neg.")}
        out = spec.output[index]
        self.kind = out.regulator
        topo = spec.rectifier.topology
        self.topology = "center-tap" if topo == "split" else topo
        self.rows = {r["name"][len(corner_prefix):]: r for r in res["corners"]
                     if r["name"].startswith(corner_prefix)}
        self.checks = [c for c in res["checks"] if c["id"].startswith(prefix + "check.")
                       or (not prefix and c["id"].startswith("check."))]
        self.cache: dict[str, dict] = {}

    # --------------------------------------------------------------- corners by their names
    def corner(self, name: str) -> dict:
        """Operating point of a corner named in the document, from the document's own values."""
        v = self.v
        parts = [p.strip() for p in name.split(",")]
        # the trailing axes: the mains frequency of a dual-frequency product, then the
        # rectifier's junction temperature
        freq = v["mains.freq"]
        if parts[-1].endswith(" Hz"):
            freq = float(parts.pop()[:-3])
        t_d = float(parts.pop().removeprefix("diodes ").removesuffix(" degC"))
        line = {"low line": 1 - v["mains.tol_low"], "nominal mains": 1.0,
                "high line": 1 + v["mains.tol_high"]}[parts[0]]
        load = {"least load": v["output.i_min_worst"], "minimum load": v["output.i_min_worst"],
                "full load": v["output.i_max"]}[parts[1]]
        tc = v["reservoir.tol"]
        c = {f"C -{tc * 100:g} %": v["reservoir.c"] * (1 - tc),
             f"C +{tc * 100:g} %": v["reservoir.c"] * (1 + tc)}[parts[2]]
        v_z, r = 0.0, 1.0
        if self.kind in ("zener", "follower"):
            # the zener voltage at its tolerance and temperature extremes, self-heating
            # included (the document's zener.v_min_hot / v_max_hot); a shunt zener enters the
            # circuit model as its knee: V_Z at the test current less r_z I_ZT ([SEDRA-SMITH]
            # zener model, piecewise linear)
            v_z = {"V_Z low": v["zener.v_min_hot"], "V_Z high": v["zener.v_max_hot"]}[parts[3]]
            if self.kind == "zener":
                v_z -= v["zener.r_z"] * v["zener.i_zt"]
            tr = v["zener.r_tol"]
            r = {f"R -{tr * 100:g} %": v["zener.r"] * (1 - tr),
                 f"R +{tr * 100:g} %": v["zener.r"] * (1 + tr)}[parts[4]]
        elif self.kind in ("three-terminal", "adjustable") and len(parts) > 3:
            # the regulator's output setpoint at its tolerance extremes
            v_z = {"V_out low": v["reg.v_out_min"], "V_out high": v["reg.v_out_max"]}[parts[3]]
        return {"line": line, "load": load, "c": c, "v_z": v_z, "r": r, "t_d": t_d, "freq": freq}

    def point(self, cp: dict) -> Point:
        v = self.v
        common = dict(topology=self.topology, v_rms=v["transformer.v_nl"] * cp["line"],
                      freq=cp["freq"], r_s=v["transformer.r_w"], l_s=v["transformer.l_s"],
                      c=cp["c"], esr=v["reservoir.esr"], diode_is=saturation_at(v, cp["t_d"]),
                      diode_n=v["rect.d_n"], diode_rs=v["rect.d_rs"], diode_t_c=cp["t_d"])
        if self.kind == "zener":
            return Point(**common, load="zener", r_series=cp["r"], v_z0=cp["v_z"],
                         r_z=v["zener.r_z"], i_out=cp["load"])
        if self.kind == "none":
            return Point(**common, load="current", i_load=cp["load"])
        if self.kind == "follower":
            # the follower's input: load current plus the base resistor's design current,
            # in dropout below the zener voltage
            return Point(**common, load="regulator", i_load=cp["load"], i_q=v["q.i_r1"],
                         knee=v["zener.v_min"])
        # a three-terminal regulator drops out below its setpoint plus its typical dropout
        return Point(**common, load="regulator", i_load=cp["load"], i_q=v["reg.i_q"],
                     knee=cp["v_z"] + v["reg.dropout"])

    def figures(self, name: str) -> dict:
        if name not in self.cache:
            cp = self.corner(name)
            f = self.point(cp).figures()
            f.update(self.derived(f, cp))
            self.cache[name] = f
        return self.cache[name]

    def theta(self, p: str) -> float:
        v = self.v
        if f"{p}.theta_sa" in v:  # heat sink: junction-case, case-sink, sink-ambient
            return v[f"{p}.theta_jc"] + v[f"{p}.theta_cs"] + v[f"{p}.theta_sa"]
        return v[f"{p}.theta_ja"]  # no heat sink [CP-THERMAL]

    def derived(self, f: dict, cp: dict) -> dict:
        v, out = self.v, {}
        out["headroom"] = f["v_c_min"] - f.get("v_out_mean", math.nan)
        if self.kind in ("three-terminal", "adjustable"):
            # [CP-RR]; near dropout (the trough within reg.rr_window of the worst-case
            # dropout floor reg.v_in_floor) the rejection is the lower near-dropout figure
            near = f["v_c_min"] < v["reg.v_in_floor"] + v["reg.rr_window"]
            rr = v["reg.rr_low"] if near else v["reg.rr"]
            out["v_out_pp"] = f["ripple_pp"] * 10 ** (-rr / 20)
            # the setpoint, or the input less the worst-case dropout when the input is lower
            out["v_out_min"] = min(cp["v_z"], f["v_c_min"] - v["reg.dropout_max"])
            out["v_out_max"] = min(cp["v_z"], f["v_c_max"] - v["reg.dropout_max"])
            p = (f["v_c_mean"] - cp["v_z"]) * cp["load"] + f["v_c_mean"] * v["reg.i_q"]
            out["t_j"] = v["env.t_max"] + p * self.theta("reg")
        elif self.kind == "follower":
            i_b = cp["load"] / (v["q.h_fe"] + 1)  # [ROSCOE-6.101]
            v_z, r = cp["v_z"], cp["r"]
            out["i_z_min"] = (f["v_c_min"] - v_z) / r - i_b
            out["p_zener"] = v_z * max((f["v_c_mean"] - v_z) / r - i_b, 0.0)
            # mean of (v(t) - V_Z)^2 / R = ((mean - V_Z)^2 + variance) / R
            out["p_r_series"] = ((f["v_c_mean"] - v_z) ** 2 + f["v_c_rms_dev"] ** 2) / r
            p_q = (f["v_c_mean"] - (v_z - v["q.v_be"])) * cp["load"]
            out["t_j"] = v["env.t_max"] + p_q * self.theta("q")
            out["v_out_pp"] = f["ripple_pp"] * v["zener.r_z"] / (r + v["zener.r_z"])
            # the base follows the zener, or the input when that is lower; V_BE at its spread
            # (largest for the lowest output, smallest for the highest)
            out["v_out_min"] = min(v_z, f["v_c_min"]) - v["q.v_be_max"]
            out["v_out_max"] = min(v_z, f["v_c_max"]) - v["q.v_be_min"]
        elif self.kind == "none":
            out.update(v_out_pp=f["ripple_pp"], v_out_max=f["v_c_max"], v_out_min=f["v_c_min"])
        return out


# check id -> the independent figure it compares
METRIC = {
    "check.headroom": "headroom", "check.zener_current": "i_z_min",
    "check.zener_power": "p_zener", "check.resistor_power": "p_r_series",
    "check.output_ripple": "v_out_pp", "check.output_high": "v_out_max",
    "check.output_low": "v_out_min", "check.transformer_current": "i_sec_rms",
    "check.bridge_current": "i_dc", "check.cap_ripple_current": "i_c_rms",
    "check.dropout": "v_c_min", "check.regulator_junction": "t_j",
    "check.transistor_junction": "t_j",
}
# nominal-corner figures of the summary (engine.i_sec_nominal, the largest over the nominal
# full-load corners, is compared separately)
NOMINAL = {"engine.p_in_nominal": "p_in", "engine.va_nominal": "va_sec",
           "engine.i_d_peak_nominal": "i_d_peak"}


def rails_of(spec_path: Path):
    loaded = load_requirements(spec_path)
    design = run(loaded, samples=0)
    res = results_dict(design)
    spec = loaded.requirements
    if spec.rectifier.topology == "split":
        ipos = next(i for i, o in enumerate(spec.output) if o.polarity == "positive")
        return res, [Rail(res, spec, "", "+ rail: ", ipos),
                     Rail(res, spec, "neg.", "- rail: ", 1 - ipos)]
    return res, [Rail(res, spec, "", "", 0)]


@pytest.fixture(scope="module")
def verified():
    """Per spec: (results.json dict, its rails, build time). The designs are built without Monte
    Carlo samples (samples=0), which change no sized value, so every check names a corner (a
    sample worse than every corner would otherwise stand in for one)."""
    out = {}
    for path in SPECS:
        start = time.perf_counter()
        res, rails = rails_of(path)
        out[path.stem] = (res, rails, time.perf_counter() - start)
    return out


def _verdict(value: float, check: dict, band: float) -> str:
    return status_of(margin_of(value, check["limit"], check["sense"]), band)


@pytest.mark.slow
@pytest.mark.parametrize("spec", [p.stem for p in SPECS])
def test_engine_figures_and_verdicts_hold_under_an_independent_integration(verified, spec):
    res, rails, _ = verified[spec]
    band = res["values"]["margins.warn_band"]["value"]
    compared = 0
    problems = []
    for rail in rails:
        for check in rail.checks:
            cid = check["id"][len(rail.prefix):]
            if not check["value_id"].startswith(rail.prefix + "engine.") or cid not in METRIC:
                continue
            # the corner the document names, its parameters as the document lists them
            name = check["corner"]
            row = rail.rows[name]
            cp = rail.corner(name)
            assert row["line_factor"] == pytest.approx(cp["line"], rel=1e-12)
            assert row["load"] == pytest.approx(cp["load"], rel=1e-12, abs=1e-15)
            assert row["c"] == pytest.approx(cp["c"], rel=1e-12)
            assert row["r"] == pytest.approx(cp["r"], rel=1e-12)
            assert row["v_z"] == pytest.approx(cp["v_z"], rel=1e-12, abs=1e-15)
            mine = rail.figures(name)[METRIC[cid]]
            compared += 1
            if mine != pytest.approx(check["value"], rel=TOL):
                problems.append(f"{check['id']} at {name}: document {check['value']:.6g}, "
                                f"independent {mine:.6g}")
            if _verdict(mine, check, band) != check["status"]:
                problems.append(f"{check['id']}: verdict {check['status']} becomes "
                                f"{_verdict(mine, check, band)}")
        # the summary's nominal figures at the nominal corner the engine reports them for
        nominal = next(n for n in rail.rows if n.startswith("nominal mains, full load, C -"))
        for vid, metric in NOMINAL.items():
            claimed = rail.v[vid]
            mine = rail.figures(nominal)[metric]
            compared += 1
            if mine != pytest.approx(claimed, rel=TOL):
                problems.append(f"{vid}: document {claimed:.6g}, independent {mine:.6g}")
        claimed = rail.v["engine.i_sec_nominal"]
        mine = _largest_nominal_half_winding_current(rail)
        compared += 1
        if mine != pytest.approx(claimed, rel=TOL):
            problems.append(f"engine.i_sec_nominal: document {claimed:.6g}, independent "
                            f"{mine:.6g}")
    assert compared >= 6
    assert not problems, "\n".join(problems)


@pytest.mark.slow
@pytest.mark.parametrize("spec", [p.stem for p in SPECS])
def test_switch_on_surge_holds_under_an_independent_integration(verified, spec):
    # The document's switch-on: closed at the crest with the capacitor empty, at high line and
    # C +tol (zener kinds: V_Z low, R -tol; three-terminal: V_out low), the rectifier junction
    # hot (the least drop), with the least and with the full load, at each mains frequency of a
    # dual-frequency product; the whole transient until the capacitor is charged (the stop rule of
    # docgen/engine/inrush.py, applied here to the independent integration with its own
    # steady-state repetitive peak). The document claims the larger peak and the larger I^2 t
    # of the two, and the first pulse's I^2 t of the transient with the larger I^2 t.
    res, rails, _ = verified[spec]
    band = res["values"]["margins.warn_band"]["value"]
    for rail in rails:
        check = next(c for c in rail.checks if c["id"] == rail.prefix + "check.bridge_surge")
        tc, tr = rail.v["reservoir.tol"], rail.v.get("zener.r_tol", 0.0)
        least = "least" if rail.v["output.i_min_worst"] == 0 else "minimum"
        got = []
        v = rail.v
        freqs = [""] if "mains.freq_also" not in v else [
            f", {f:g} Hz" for f in sorted({v["mains.freq_given"], v["mains.freq_also"]})]
        for load, freq in itertools.product((f"{least} load", "full load"), freqs):
            name = f"high line, {load}, C +{tc * 100:g} %"
            if rail.kind in ("zener", "follower"):
                name += f", V_Z low, R -{tr * 100:g} %"
            elif rail.kind in ("three-terminal", "adjustable"):
                name += ", V_out low"
            name += f", diodes {v['rect.d_t_hot']:g} degC{freq}"
            steady = rail.figures(name)["i_d_peak"]
            got.append(rail.point(rail.corner(name)).switch_on(settle_peak=steady))
        peak = max(g["i_peak"] for g in got)
        worst = max(got, key=lambda g: g["i2t"])
        assert peak == pytest.approx(rail.v["engine.surge_peak"], rel=TOL)
        assert worst["i2t"] == pytest.approx(rail.v["engine.surge_i2t"], rel=TOL)
        assert worst["first_i2t"] == pytest.approx(rail.v["engine.surge_i2t_first"], rel=TOL)
        # the whole transient is no smaller than its first pulse (a sanity bound on the model)
        assert worst["i2t"] >= worst["first_i2t"]
        assert _verdict(peak, check, band) == check["status"]


def _nominal_primary_load_current(rail: Rail) -> float:
    # Ideal transformer [ALEXANDER-SADIKU]: I_pri = I_sec N2/N1 = I_sec V_NL / V_mains at
    # nominal mains; a center-tapped winding's two halves each carry one pulse train, so the
    # primary carries sqrt(2) x the half-winding RMS current [DERIVED-RMS].
    v = rail.v
    k_w = math.sqrt(2) if rail.topology == "center-tap" else 1.0
    return k_w * _largest_nominal_half_winding_current(rail) * v["transformer.v_nl"] / \
        v["mains.v_nom"]


@pytest.mark.slow
@pytest.mark.parametrize("spec", [p.stem for p in SPECS])
def test_fuse_operating_current_from_the_independent_secondary_current(verified, spec):
    # The operating primary current: the rectifier load's (referred from the independent
    # secondary current; a split supply's two rails both, their primary currents adding at most
    # linearly) plus the magnetising current I_pri,rated x k_mag, I_pri,rated = VA / V_mains;
    # the RMS of a sum is at most the sum of the RMS values (Minkowski), the bound the fuse is
    # sized for. k_mag is the document's input (the file's or the typical no-load current).
    res, rails, _ = verified[spec]
    v = rails[0].v
    check = next(c for c in rails[0].checks if c["id"] == "check.fuse_operating")
    i_load = sum(_nominal_primary_load_current(rail) for rail in rails)
    i_mag = v["fuse.k_mag"] * v["transformer.va"] / v["mains.v_nom"]
    assert v["fuse.i_mag"] == pytest.approx(i_mag, rel=1e-9)
    i_pri = i_load + i_mag
    assert v["fuse.i_pri_margin"] == pytest.approx(v["fuse.k"] * i_pri, rel=TOL)
    band = res["values"]["margins.warn_band"]["value"]
    assert _verdict(v["fuse.k"] * i_pri, check, band) == check["status"]


def _split(verified):
    split = [k for k, (_, rails, _) in verified.items() if len(rails) == 2]
    assert split, "no split-supply demo spec"
    return verified[split[0]]


def _largest_nominal_half_winding_current(rail: Rail) -> float:
    # the rail's worst nominal-mains, full-load corner (both capacitance corners integrated)
    names = [n for n in rail.rows if n.startswith("nominal mains, full load")]
    assert len(names) >= 2  # at least C -tol and C +tol
    return max(rail.figures(n)["i_sec_rms"] for n in names)


@pytest.mark.slow
def test_split_half_winding_current_adds_both_rails(verified):
    # Each half winding carries the + rail's pulses in one half-cycle and the - rail's in the
    # other, so the RMS currents add in quadrature [DERIVED-RMS]; each rail's current comes from
    # the independent integration at the corner the rail's own check names (the worst over
    # every line, high line included).
    res, (pos, neg), _ = _split(verified)
    v = res["values"]
    i_p, i_n = (rail.figures(v[vid]["source"].split("worst corner: ", 1)[1])["i_sec_rms"]
                for rail, vid in ((pos, "split.i_pos"), (neg, "split.i_neg")))
    assert v["split.i_sec_rms"]["value"] == pytest.approx(math.hypot(i_p, i_n), rel=TOL)
    check = next(c for c in res["checks"] if c["value_id"] == "split.i_sec_rms")
    band = v["margins.warn_band"]["value"]
    assert _verdict(math.hypot(i_p, i_n), check, band) == check["status"]


@pytest.mark.slow
def test_split_fuse_operating_current_covers_both_rails(verified):
    # Ideal transformer [ALEXANDER-SADIKU]: in each half-cycle one half winding charges the
    # + rail and the other the - rail, both adding ampere-turns in the same sense, so the
    # primary current is (N_half / N_pri)(i_+ + i_-) and its mean square is at least the sum of
    # the two rails' (the cross term is not negative) over the two half-cycles: I_pri >=
    # sqrt(2) hypot(I_+, I_-) V_NL / V_mains [DERIVED-RMS].
    res, (pos, neg), _ = _split(verified)
    v = pos.v
    i_p = _largest_nominal_half_winding_current(pos)
    i_n = _largest_nominal_half_winding_current(neg)
    bound = math.sqrt(2) * math.hypot(i_p, i_n) * v["transformer.v_nl"] / v["mains.v_nom"]
    assert v["fuse.i_pri"] >= bound * (1 - TOL)


@pytest.mark.slow
def test_capacitor_life_from_the_independent_ripple_current(verified):
    # [CP-10-DEGREE]: core temperature T = T_A,max + I_C,rms^2 ESR R_th, life L0 2^((T0 - T)/10),
    # capped; I_C,rms from the independent integration at the worst ripple-current corner. Every
    # demo design with a life requirement.
    checked = 0
    for res, rails, _ in verified.values():
        rail = rails[0]
        life = next((c for c in rail.checks if c["id"] == "check.cap_life"), None)
        if life is None:
            continue
        v = rail.v
        worst = next(c for c in rail.checks if c["id"] == "check.cap_ripple_current")
        i_c = rail.figures(worst["corner"])["i_c_rms"]
        assert v["engine.i_c_rms_max"] == pytest.approx(i_c, rel=TOL)
        t_core = v["env.t_max"] + i_c**2 * v["reservoir.esr"] * v["reservoir.r_th"]
        assert v["reservoir.t_core"] == pytest.approx(t_core, rel=TOL)
        hours = min(v["reservoir.life_rated"] * 2 ** ((v["reservoir.life_temp"] - t_core) / 10),
                    v["reservoir.life_cap"])
        assert v["reservoir.life"] == pytest.approx(hours, rel=TOL)
        band = res["values"]["margins.warn_band"]["value"]
        assert _verdict(hours, life, band) == life["status"]
        checked += 1
    assert checked >= 1
