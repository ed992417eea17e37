"""Figures from finished results. No sizing maths here; matplotlib is imported lazily."""

from __future__ import annotations

import io
from typing import Any

import numpy as np

SVG_SALT = "docgen"
GRID = {"lw": 0.3, "color": "#d0d4d9"}


def _figure(width_in: float, height_in: float):
    import matplotlib

    matplotlib.rcParams["svg.hashsalt"] = SVG_SALT
    matplotlib.rcParams["font.family"] = "DejaVu Sans"
    matplotlib.rcParams["font.size"] = 8.0
    from matplotlib.figure import Figure

    return Figure(figsize=(width_in, height_in))


def figure_svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None},
                bbox_inches="tight", pad_inches=0.05)
    return buf.getvalue()


def waveform_plot(wave: dict[str, Any], title: str, limits: dict[str, float]):
    """Secondary voltage and current, capacitor voltage, diode pulses and output voltage over
    two mains periods (engine waveforms)."""
    fig = _figure(6.6, 5.2)
    ax_v, ax_i, ax_o = fig.subplots(3, 1, sharex=True,
                                    gridspec_kw={"height_ratios": [2.0, 1.4, 1.2]})
    t_ms = (wave["t"] - wave["t"][0]) * 1e3
    ax_v.plot(t_ms, np.abs(wave["v_sec"]), color="#9aa5b1", lw=0.9,
              label="|secondary voltage|")
    ax_v.plot(t_ms, wave["v_c"], color="#0b5394", lw=1.5, label="capacitor voltage")
    if "trough" in limits:
        ax_v.axhline(limits["trough"], color="#b45f06", lw=0.8, ls="--",
                     label="hand-formula trough")
    ax_v.set_ylabel("V")
    ax_v.set_title(title, fontsize=8.5, loc="left")
    ax_v.legend(loc="lower right", fontsize=6.5, frameon=False, ncol=3)
    ax_v.grid(True, **GRID)
    ax_i.plot(t_ms, wave["i_sec"] * 1e3, color="#7f6000", lw=0.9, label="secondary current")
    ax_i.plot(t_ms, wave["i_d"] * 1e3, color="#990000", lw=1.1, ls="--", label="one diode")
    ax_i.set_ylabel("mA")
    ax_i.legend(loc="upper right", fontsize=6.5, frameon=False, ncol=2)
    ax_i.grid(True, **GRID)
    ax_o.plot(t_ms, wave["v_out"], color="#38761d", lw=1.2, label="output voltage")
    for key, style in (("v_out_hi", "--"), ("v_out_lo", "--")):
        if key in limits:
            ax_o.axhline(limits[key], color="#a61b1b", lw=0.8, ls=style)
    ax_o.set_ylabel("V out")
    ax_o.set_xlabel("time (ms)")
    ax_o.grid(True, **GRID)
    fig.align_ylabels()
    return fig


def histogram_plot(samples: dict[str, np.ndarray], panels: list[dict[str, Any]]):
    """Monte Carlo distributions, one panel per quantity, with its limit marked."""
    fig = _figure(6.6, 4.2)
    axes = fig.subplots(2, 2).ravel()
    for ax, panel in zip(axes, panels, strict=False):
        vals = np.asarray(samples[panel["metric"]], dtype=float)
        vals = vals[np.isfinite(vals)] * panel.get("scale", 1.0)
        ax.hist(vals, bins=30, color="#6fa8dc", edgecolor="#0b5394", lw=0.4)
        for limit in panel.get("limits", ()):
            ax.axvline(limit * panel.get("scale", 1.0), color="#a61b1b", lw=1.0, ls="--")
        ax.set_title(panel["title"], fontsize=8, loc="left")
        ax.set_xlabel(panel["unit"])
        ax.grid(True, **GRID)
    fig.tight_layout()
    return fig
