"""The figures of a converged pulse period: the SteadyState record, its metrics and the kept
waveforms (full-wave circuits: one pulse, half a mains period, mirrored)."""

from __future__ import annotations

from dataclasses import dataclass, field, fields

import numpy as np

from .circuit import Params
from .loads import Load, zener_node

CONDUCTION_THRESHOLD = 0.01  # current / peak that counts as conducting for conduction_angle


@dataclass
class SteadyState:
    """Periodic steady-state figures, one array entry per operating point (SI units).

    Per-diode figures refer to one diode (bridge: one diode of the conducting pair). Voltages
    ``v_c_*`` are at the capacitor terminals (including the ESR drop). NaN where ``converged`` is
    False; ``status`` says why (see ``STATUS_TEXT``). ``iterations`` counts period-map
    evaluations (full-wave: half-period passes). ``waveforms`` maps a point index to arrays over
    two mains periods on the (non-uniform) time grid of the simulation.
    """

    v_c_max: np.ndarray
    v_c_min: np.ndarray
    v_c_mean: np.ndarray
    ripple_pp: np.ndarray
    ripple_freq: np.ndarray
    conduction_angle: np.ndarray
    i_d_peak: np.ndarray
    i_d_avg: np.ndarray
    i_d_rms: np.ndarray
    i_sec_rms: np.ndarray
    va_sec: np.ndarray
    i_c_rms: np.ndarray
    p_source: np.ndarray
    p_diodes: np.ndarray
    p_esr: np.ndarray
    p_load: np.ndarray
    p_r_series: np.ndarray
    p_zener: np.ndarray
    p_out: np.ndarray
    p_in: np.ndarray
    v_out_max: np.ndarray
    v_out_min: np.ndarray
    v_out_mean: np.ndarray
    v_out_pp: np.ndarray
    i_z_min: np.ndarray
    i_z_max: np.ndarray
    converged: np.ndarray
    status: np.ndarray
    iterations: np.ndarray
    waveforms: dict[int, dict[str, np.ndarray]] = field(default_factory=dict)

    def take(self, start: int, stop: int) -> SteadyState:
        """Points start..stop-1 as a SteadyState of their own (waveform keys renumbered)."""
        sub = {f.name: getattr(self, f.name)[start:stop] for f in fields(self)
               if f.name != "waveforms"}
        waves = {k - start: w for k, w in self.waveforms.items() if start <= k < stop}
        return SteadyState(**sub, waveforms=waves)

    def point(self, k: int) -> dict[str, float]:
        """All scalar figures of operating point k."""
        out: dict[str, float] = {}
        for f in fields(self):
            if f.name == "waveforms":
                continue
            v = getattr(self, f.name)[k]
            if f.name == "converged":
                out[f.name] = bool(v)
            elif f.name in ("status", "iterations"):
                out[f.name] = int(v)
            else:
                out[f.name] = float(v)
        return out


_NOT_METRICS = ("converged", "status", "iterations", "waveforms")
METRICS = [f.name for f in fields(SteadyState) if f.name not in _NOT_METRICS]


def period_metrics(p: Params, load: Load, phase, i, v_p) -> dict[str, np.ndarray]:
    """Figures of one converged pulse period (full-wave: half a mains period, mirrored)."""
    # Trapezoid weights of the samples, normalised to an average over the pulse period.
    wts = np.zeros_like(phase)
    dph = np.diff(phase, axis=0) * (0.5 / p.span)
    wts[:-1] += dph
    wts[1:] += dph

    def avg(f):
        return np.einsum("ij,ij->j", f, wts)

    i_load = load.current(v_p)
    i_c = i - i_load
    e = p.vpk * np.sin(phase)
    # Junction voltage from the diode law; in reverse bias it is clipped near -700 mvt, which
    # changes the (nA-level) reverse-current loss only.
    junction = p.mvt * np.log(np.maximum(1.0 + i / p.isat, 1e-300))
    i2 = avg(i * i)
    share = 0.5 if p.full_wave else 1.0  # one diode conducts in one of the two half periods
    out = {
        "v_c_max": v_p.max(axis=0),
        "v_c_min": v_p.min(axis=0),
        "v_c_mean": avg(v_p),
        "i_d_peak": i.max(axis=0),
        "i_d_avg": share * avg(i),
        "i_d_rms": np.sqrt(share * i2),
        "i_c_rms": np.sqrt(avg(i_c * i_c)),
        "p_source": p.r_s * i2,
        "p_diodes": avg(i * (junction + p.m * p.diode_rs * i)),
        "p_esr": p.esr * avg(i_c * i_c),
        "p_load": avg(v_p * i_load),
        "p_in": avg(e * i),
    }
    out["ripple_pp"] = out["v_c_max"] - out["v_c_min"]
    if p.topology == "bridge":
        out["i_sec_rms"] = np.sqrt(i2)
        out["va_sec"] = p.v_rms * out["i_sec_rms"]
    else:
        out["i_sec_rms"] = out["i_d_rms"]
        out["va_sec"] = (2.0 if p.full_wave else 1.0) * p.v_rms * out["i_sec_rms"]
    out["conduction_angle"] = _time_above(phase, i, CONDUCTION_THRESHOLD * out["i_d_peak"])
    if p.load == "zener":
        z = zener_node(p, v_p)
        v_out = z["v_n"]
        out["p_r_series"] = p.r_series * avg(z["i_r"] ** 2)
        out["p_zener"] = avg(z["v_n"] * z["i_z"])
        out["p_out"] = avg(z["v_n"] * z["i_out"])
        out["i_z_min"] = z["i_z"].min(axis=0)
        out["i_z_max"] = z["i_z"].max(axis=0)
    else:
        v_out = v_p
        nan = np.full(p.n, np.nan)
        out.update(p_r_series=nan, p_zener=nan, p_out=nan, i_z_min=nan, i_z_max=nan.copy())
    out["v_out_max"] = v_out.max(axis=0)
    out["v_out_min"] = v_out.min(axis=0)
    out["v_out_mean"] = avg(v_out)
    out["v_out_pp"] = out["v_out_max"] - out["v_out_min"]
    return out


def _time_above(phase: np.ndarray, f: np.ndarray, level: np.ndarray) -> np.ndarray:
    """Phase span where f > level, with linear interpolation at the crossings."""
    u = f - level
    u0, u1 = u[:-1], u[1:]
    # Share of each step above the level: 1 if both ends are above, 0 if neither, else linear.
    frac = np.clip(np.maximum(u0, u1) / np.maximum(np.abs(u1 - u0), 1e-300), 0.0, 1.0)
    frac[(u0 > 0) & (u1 > 0)] = 1.0
    return np.einsum("ij,ij->j", frac, np.diff(phase, axis=0))


def period_waveforms(p: Params, load: Load, phase, i, v_p) -> dict[str, np.ndarray]:
    """Two mains periods of one point, assembled from its pulse period (mirrored for full-wave)."""
    copies = 4 if p.full_wave else 2
    period = p.span / p.omega[0]
    t_pulse = phase / p.omega[0]
    i_load = load.current(v_p[:, None])[:, 0]
    i_c = i - i_load
    v_out = zener_node(p, v_p[:, None])["v_n"][:, 0] if p.load == "zener" else v_p
    off = np.full_like(i, i[0])
    parts = {k: [] for k in ("t", "i_sec", "v_c", "v_out", "i_d", "i_c")}
    for k in range(copies):
        sl = slice(0 if k == 0 else 1, None)
        second = k % 2 == 1 and p.full_wave
        parts["t"].append(t_pulse[sl] + k * period)
        if p.topology == "bridge":
            parts["i_sec"].append((-i if second else i)[sl])
        else:
            parts["i_sec"].append((off if second else i)[sl])
        parts["i_d"].append((off if second else i)[sl])
        parts["v_c"].append(v_p[sl])
        parts["v_out"].append(v_out[sl])
        parts["i_c"].append(i_c[sl])
    w = {k: np.concatenate(v) for k, v in parts.items()}
    w["v_sec"] = p.vpk[0] * np.sin(p.omega[0] * w["t"])
    return w
