"""The views of a diff report: terminal text and the HTML change report (diff.html.j2).

They take a :class:`docgen.jobs.diff_changes.DiffReport` and compute nothing but display text.
"""

from __future__ import annotations

import math
from typing import Any

REPORT_MARKER = '<meta name="generator" content="docgen diff">'


def margin_text(status: str, margin: float | None) -> str:
    if not status:
        return "(none)"
    if margin is None or not math.isfinite(margin):
        return status.upper()
    return f"{status.upper()} {margin * 100:+.1f} %"


def percent_text(pct: float | None) -> str:
    return "" if pct is None else f"{pct:+.3g} %"


def side_status(side: Any) -> str:
    text = side.status.upper()
    return f"{text} ({side.reason})" if side.status == "infeasible" else text


def _table(rows: list[tuple[str, ...]], indent: str = "  ") -> list[str]:
    if not rows:
        return []
    widths = [max(len(r[k]) for r in rows) for k in range(len(rows[0]))]
    return [(indent + "  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True))).rstrip()
            for r in rows]


def _arrow(old: str, new: str) -> str:
    return f"{old or '(none)'} -> {new or '(none)'}"


def terminal_text(report: Any) -> str:
    r = report
    lines = [f"old: {r.old.label}"] + [f"  note: {n}" for n in r.old.notes]
    lines += [f"new: {r.new.label}"] + [f"  note: {n}" for n in r.new.notes]
    lines.append(f"status: {side_status(r.old)} -> {side_status(r.new)}")
    if not r.compared:
        which = [s for s, side in (("old", r.old), ("new", r.new)) if side.design is None]
        who = "both designs are" if len(which) == 2 else f"the {which[0]} design is"
        lines.append(f"{who} infeasible: values, parts and checks not compared")

    def section(title: str, rows: list[tuple[str, ...]]) -> None:
        if rows:
            lines.append("")
            head, _, note = title.partition(" (")
            lines.append(f"{head}: {len(rows)}" + (f" ({note}" if note else ""))
            lines.extend(_table(rows))

    section("requirements changed", [(c.path, _arrow(c.old, c.new)) for c in r.requirements])
    section("document fields changed (not counted as a design change)",
            [(c.path, _arrow(c.old, c.new)) for c in r.document])
    section(f"values changed (more than {r.threshold:g} relative)",
            [(v.id, v.title, _arrow(v.old, v.new), percent_text(v.percent)) for v in r.values])
    section("parts changed", [(f"{p.ref} ({p.kind})", _arrow(p.old, p.new)) for p in r.parts])
    section("checks that changed status",
            [(c.id, c.title, margin_text(c.old_status, c.old_margin) + " -> "
              + margin_text(c.new_status, c.new_margin)) for c in r.flipped])
    section("check margins moved",
            [(c.id, c.title, margin_text(c.old_status, c.old_margin) + " -> "
              + margin_text(c.new_status, c.new_margin)) for c in r.moved])
    section("cautions changed",
            [("+" if c.change == "added" else "-", c.id, c.title) for c in r.cautions])
    lines.append("")
    if r.changed:
        lines.append(f"{r.count()} changes")
    else:
        lines.append("no changes to requirements, values, parts, checks or cautions")
    return "\n".join(lines) + "\n"


def render_html(report: Any) -> str:
    from importlib import resources

    import jinja2

    env = jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(resources.files("docgen.templates"))),
        autoescape=True,
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
    )
    r = report
    from markupsafe import Markup

    context = {
        # the marker is our own fixed text; everything else is escaped by the template
        "marker": Markup(REPORT_MARKER),
        "old": r.old, "new": r.new,
        "old_status": side_status(r.old), "new_status": side_status(r.new),
        "status_changed": r.status_changed, "compared": r.compared,
        "changed": r.changed, "count": r.count(), "threshold": f"{r.threshold:g}",
        "requirements": r.requirements, "document": r.document,
        "values": [(v, percent_text(v.percent)) for v in r.values],
        "parts": r.parts,
        "flipped": [(c, margin_text(c.old_status, c.old_margin),
                     margin_text(c.new_status, c.new_margin)) for c in r.flipped],
        "moved": [(c, margin_text(c.old_status, c.old_margin),
                   margin_text(c.new_status, c.new_margin)) for c in r.moved],
        "cautions": r.cautions,
    }
    return env.get_template("diff.html.j2").render(**context)
