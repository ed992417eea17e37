"""The trade-off plot of a design-space search: every feasible candidate on two objectives,
the Pareto front, the greedy design and the chosen one marked. Figures only, no search here."""

from __future__ import annotations

import math

from .plots import GRID, _figure, figure_svg

LABELS = {"cost": "total part cost", "dissipation": "worst-case heat (W)",
          "life": "capacitor life (h)", "hold-up": "hold-up time (s)"}


def tradeoff_svg(points: list[tuple[float, float]], front: list[tuple[float, float]],
                 greedy: tuple[float, float] | None, chosen: tuple[float, float] | None, *,
                 x: str = "cost", y: str = "dissipation", currency: str = "",
                 infeasible: list[tuple[float, float]] = ()) -> str:
    """SVG of the feasible ``points`` (x, y), the ``front`` and the two marked designs."""
    fig = _figure(6.2, 4.0)
    ax = fig.subplots()
    if infeasible:
        ax.scatter([p[0] for p in infeasible], [p[1] for p in infeasible], s=6, marker="x",
                   color="#c9cdd2", lw=0.6, label="verified, fails a check")
    ax.scatter([p[0] for p in points], [p[1] for p in points], s=10, color="#6f8fae",
               label="feasible candidate")
    if front:
        ax.step([p[0] for p in front], [p[1] for p in front], where="post", color="#0b5394",
                lw=1.0, label="Pareto front (no candidate better on both)")
    if greedy is not None and all(math.isfinite(v) for v in greedy):
        ax.scatter([greedy[0]], [greedy[1]], s=70, facecolors="none", edgecolors="#b45f06",
                   lw=1.4, marker="s", label="greedy design (docgen build)")
    if chosen is not None:
        ax.scatter([chosen[0]], [chosen[1]], s=90, color="#38761d", marker="*",
                   label="chosen design (search best)")
    xl = LABELS.get(x, x)
    ax.set_xlabel(f"{xl} ({currency})" if x == "cost" and currency else xl)
    yl = LABELS.get(y, y)
    ax.set_ylabel(f"{yl} ({currency})" if y == "cost" and currency else yl)
    ax.grid(True, **GRID)
    ax.legend(loc="best", fontsize=6.5, framealpha=0.85)
    return figure_svg(fig)
