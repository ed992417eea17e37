"""Monte Carlo summary: yield over the engine checks, failing counts and percentiles."""

from __future__ import annotations

import numpy as np

from ..trace import Ledger
from .corners import CornerResult

SUMMARY_METRICS = ("v_out_mean", "v_out_pp", "p_zener", "p_r_series", "i_sec_rms", "i_z_min",
                   "i_c_rms", "v_c_min", "t_j")
HISTOGRAM_METRICS = ("v_out_max", "v_out_min", "v_out_pp", "p_zener", "i_z_min", "i_sec_rms",
                     "t_j", "v_c_min")


def summarise(L: Ledger, cr: CornerResult, engine_checks: tuple, seed: int) -> dict:
    """Yield, failing counts per check and percentiles of the figures (empty without samples)."""
    if cr.samples is None:
        return {}
    n = len(cr.samples)
    ok = cr.converged[cr.n_corners:].copy()
    failing: dict[str, int] = {}
    for chk in engine_checks:
        if chk.limit_id not in L:
            continue
        vals = cr.sample_metric(chk.metric)
        limit = L[chk.limit_id]
        if chk.nominal_line_only:
            continue  # a rating at nominal mains; samples span the whole mains range
        bad = ~(vals <= limit) if chk.sense == "max" else ~(vals >= limit)
        failing[chk.id] = int(np.sum(bad))
        ok &= ~bad
    summary = {}
    for metric in SUMMARY_METRICS:
        if metric not in cr.metrics:
            continue
        vals = cr.sample_metric(metric)
        vals = vals[np.isfinite(vals)]
        if vals.size:
            summary[metric] = {
                "min": float(vals.min()), "p1": float(np.percentile(vals, 1)),
                "median": float(np.median(vals)), "p99": float(np.percentile(vals, 99)),
                "max": float(vals.max()),
            }
    return {
        "samples": n,
        "seed": seed,
        "converged": int(np.sum(cr.converged[cr.n_corners:])),
        "yield": float(np.sum(ok)) / n,
        "failing": failing,
        "quantities": summary,
    }


def histogram_samples(cr: CornerResult) -> dict[str, np.ndarray]:
    """Per-sample figures the report draws as histograms."""
    if cr.samples is None:
        return {}
    return {m: cr.sample_metric(m) for m in HISTOGRAM_METRICS if m in cr.metrics}
