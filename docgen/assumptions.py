"""The assumptions a document states, written from the design they describe."""

from __future__ import annotations

from .trace import Assumption


def design_assumptions(reg, n_corners: int, raised: dict[str, str],
                       conflicts: list[tuple[str, str]] = ()) -> list[Assumption]:
    """Assumptions of one rail: the engine's model of this regulator kind at its own number of
    corners, the transformer and capacitor models, and every floor the engine raised."""
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
                   "Creepage and clearance distances are not computed; the safety section "
                   "lists what to check by hand.", "scope of this version"),
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
