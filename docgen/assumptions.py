"""The assumptions a document states, written from the design they describe."""

from __future__ import annotations

from .trace import Assumption


def design_assumptions(reg, n_corners: int, raised: dict[str, str],
                       conflicts: list[tuple[str, str]] = (), values=None) -> list[Assumption]:
    """Assumptions of one rail: the engine's model of this regulator kind at its own number of
    corners, the transformer, diode and capacitor models, the mains frequencies, and every
    floor the engine raised. ``values``: the design's ledger (or a mapping of its values)."""
    out = [
        Assumption("assume.engine",
                   f"Ratings and checks come from the waveform engine at {n_corners} worst-case "
                   "corners: exponential diodes with series resistance, the transformer as an "
                   "EMF behind its winding resistance and leakage inductance, the capacitor "
                   f"with its ESR, {reg.load_model}. The hand formulas are the initial sizing "
                   "(initial estimates); where the engine verifies the same stress its figure "
                   "is shown beside them.",
                   "docgen waveform engine, verified against scipy.integrate.solve_ivp"),
        Assumption("assume.transformer_model",
                   "The transformer's EMF is its no-load voltage; its regulation is taken as a "
                   "resistive drop at rated current (winding resistance), plus an estimated "
                   "leakage inductance unless the file gives one.", "common practice"),
        Assumption("assume.no_load_peak",
                   "Voltage ratings (capacitor, diode reverse voltage) use the no-load peak at "
                   "high line with the diode drop neglected (conservative).", "common practice"),
    ]
    if values is not None and "rect.d_is" in values:
        out += _diode_and_frequency(values)
    if "zener voltage" in reg.corner_axis_names:
        out.append(Assumption(
            "assume.zener_model",
            "The zener conducts above its knee voltage (the rated voltage at its tolerance "
            "and temperature extremes, plus its self-heating at the initial-estimate "
            "(hand formula) dissipation: alpha V_Z P_Z R_thJA) with its dynamic resistance.",
            "A. S. Sedra, K. C. Smith, Microelectronic Circuits (from memory)"))
    axes = ", ".join(("mains range", "capacitance", *reg.corner_axis_names, "load"))
    out += [
        Assumption("assume.monte_carlo",
                   "Monte Carlo draws each tolerance independently and uniformly within its "
                   f"band ({axes}).", "common practice when the distributions are unknown"),
        Assumption("assume.fuse",
                   "The fuse rules check the rating against the primary current (the engine's "
                   "rectifier current referred to the primary plus an estimated magnetising "
                   "current) and the switch-on I2t (the engine's charging transient until the "
                   "reservoir is full, plus an estimated magnetising inrush, added as if "
                   "coincident) against a derated share of the melting I2t. Not covered: the "
                   "fuse maker's pulse-derating curve (switchings against I2t share) and "
                   "melting I2t for pulses shorter than 10 ms (without a library part the least "
                   "I2t the IEC 60127-2 gate at 10 I_N allows is used), ambient derating of the "
                   "fuse rating, breaking capacity against the installation's prospective "
                   "short-circuit current, and the transformer's real magnetising current and "
                   "inrush (measure them, or use the maker's figures; the maker's stated fuse "
                   "takes precedence).", "common practice"),
        Assumption("assume.not_covered",
                   "Creepage and clearance distances are not computed; the insulation section "
                   "gives the working voltage and the conditions to look them up with in the "
                   "applicable standard.", "scope of this version"),
    ]
    if reg.not_covered:
        out.append(Assumption("assume.not_covered.regulator",
                              "Not covered for the " + (reg.title or reg.kind).lower() + ": "
                              + " ".join(reg.not_covered), "scope of this version"))
    out += [Assumption(f"assume.raised.{name}", "Raised after an earlier verification pass of "
                       f"the sizing loop, where {reason}. The figures of the final design are "
                       "those of the checks.", "docgen pipeline")
            for name, reason in raised.items()]
    out += [Assumption(f"assume.conflict.{name}", text, "requirements file and parts library")
            for name, text in dict(conflicts).items()]
    return out


def _diode_and_frequency(v) -> list[Assumption]:
    """The engine's diode as fitted, its junction temperatures, and both mains frequencies."""
    cold, hot = v["rect.d_t_cold"], v["rect.d_t_hot"]
    temps = (f"{cold:g} degC and {hot:g} degC (the lowest and highest ambient)" if hot != cold
             else f"{cold:g} degC (the ambient)")
    out = [Assumption(
        "assume.diode_model",
        f"Each rectifier diode is an exponential junction with series resistance (n = "
        f"{v['rect.d_n']:.3g}, r_s = {v['rect.d_rs']:.3g} ohm) fitted to its stated forward "
        f"point, {v['rect.d_vf']:.3g} V at {v['rect.d_if']:.3g} A and {v['rect.d_t0']:g} degC. "
        f"Its saturation current follows the junction temperature, so its drop falls as it "
        f"warms; the corners put the junction at {temps}, where it drops "
        f"{v['rect.d_vf_cold']:.3g} V and {v['rect.d_vf_hot']:.3g} V at that current. Not covered: the rectifier's own self-heating (a warmer "
        f"junction drops a little less again, raising the highest voltages slightly) and the "
        f"temperature dependence of r_s.",
        "S. M. Sze, K. K. Ng, Physics of Semiconductor Devices, 3rd ed., sections 2.3 and 3.3 "
        "(temperature law; from memory); forward point from the part or the requirements file")]
    if "mains.freq_also" in v:
        lo, hi = sorted((v["mains.freq_given"], v["mains.freq_also"]))
        out.append(Assumption(
            "assume.dual_frequency",
            f"The product runs from {lo:g} Hz and {hi:g} Hz mains. The parts are sized at "
            f"{lo:g} Hz (the larger ripple), and every worst-case corner is simulated at both "
            f"frequencies, so each worst-case figure and check is the worse of the two (the "
            f"corner names say which).", "common practice"))
    return out


def requirement_assumptions(spec, reg) -> list[Assumption]:
    """Assumptions that come with optional requirements: the insulation conditions always, the
    hold-up model and what the kind's regulation figures leave out when they are asked for."""
    from .stages.insulation import barrier_facts_basis

    out = [Assumption("assume.insulation", barrier_facts_basis(spec), "IEC 60664-1 "
                      "insulation coordination and IEC 61140 protection classes (from memory)")]
    out_spec = spec.output[0]
    if out_spec.hold_up is not None:
        out.append(Assumption(
            "assume.holdup",
            "Hold-up is taken from a mains dropout at the capacitor's trough (the worst "
            "phase: no charging pulse follows), discharging through the regulator's load law "
            f"with the capacitor's ESR down to {reg.holdup_stop}. The transformer's and the "
            "load's own stored energy, and any dip shallower than a full dropout, are not "
            "counted (conservative).", "charge balance of the capacitor (common practice)"))
    if reg.regulation_note and (out_spec.line_regulation is not None
                                or out_spec.load_regulation is not None):
        out.append(Assumption("assume.regulation.model", reg.regulation_note,
                              "scope of this version"))
    return out
