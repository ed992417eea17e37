"""Figures from finished results. No sizing maths here; matplotlib is imported lazily."""

from __future__ import annotations

import io
from typing import Any

SVG_SALT = "docgen"


def _pyplot_free_figure(width_in: float, height_in: float):
    import matplotlib

    matplotlib.rcParams["svg.hashsalt"] = SVG_SALT
    matplotlib.rcParams["font.family"] = "DejaVu Sans"
    matplotlib.rcParams["font.size"] = 8.5
    from matplotlib.figure import Figure

    return Figure(figsize=(width_in, height_in))


def figure_svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None},
                bbox_inches="tight", pad_inches=0.05)
    return buf.getvalue()


def capacitor_voltage_plot(wave: dict[str, Any], title: str, valley: float, v_z: float):
    """Capacitor voltage and charging current over two mains periods."""
    fig = _pyplot_free_figure(6.4, 3.4)
    ax, ax_i = fig.subplots(2, 1, sharex=True, gridspec_kw={"height_ratios": [2.2, 1]})
    t_ms = wave["t"] * 1e3
    ax.plot(t_ms, wave["source"], color="#9aa5b1", lw=0.9, label="rectified secondary less 2 V_F")
    ax.plot(t_ms, wave["v_c"], color="#0b5394", lw=1.6, label="capacitor voltage")
    ax.axhline(valley, color="#b45f06", lw=0.9, ls="--", label="trough used in the checks")
    ax.axhline(v_z, color="#38761d", lw=0.9, ls=":", label="highest zener voltage")
    lo = min(v_z, wave["v_c"].min()) * 0.9
    ax.set_ylim(lo, wave["source"].max() * 1.05)
    ax.set_ylabel("V")
    ax.set_title(title, fontsize=9, loc="left")
    ax.legend(loc="lower right", fontsize=7, frameon=False, ncol=2)
    ax.grid(True, lw=0.3, color="#d0d4d9")
    ax_i.plot(t_ms, wave["i_charge"] * 1e3, color="#990000", lw=1.1)
    ax_i.set_ylabel("charging mA")
    ax_i.set_xlabel("time (ms)")
    ax_i.grid(True, lw=0.3, color="#d0d4d9")
    fig.align_ylabels()
    return fig
