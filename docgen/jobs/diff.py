"""What changed between two versions of a requirements file, in design terms.

Both sides are computed from scratch (load, validate, run the pipeline), then compared:
requirements (validated values, so "40 mA" and "0.04 A" are the same), computed values above a
relative threshold, bill-of-materials lines, checks that changed status or margin, cautions and
the overall status. The old side can be a file or the file's content at a git revision, read
with ``git show REV:./name`` in the file's folder; nothing is checked out.

Changes in ``[project]`` (title, revision, date, ...) are listed as document fields but do not
count as a change of the design.
"""

from __future__ import annotations

import dataclasses
import math
import os
import subprocess
import tempfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ..errors import DocgenError, InfeasibleDesign, SpecError, SpecIssue

DEFAULT_THRESHOLD = 1e-9
REPORT_MARKER = '<meta name="generator" content="docgen diff">'


class DiffUsageError(DocgenError):
    """The diff command was called with the wrong arguments."""

    exit_code = 2


# --------------------------------------------------------------------------- loading both sides

@dataclass
class Side:
    """One side of the comparison: where it came from and what it computes to."""

    label: str  # "specs/x.toml" or "specs/x.toml at HEAD~1"
    requirements: Any  # docgen.spec.Requirements
    design: Any = None  # docgen.design.Design, None when infeasible
    status: str = ""  # pass | warn | fail | infeasible
    reason: str = ""  # why it is infeasible
    notes: list[str] = field(default_factory=list)  # how the side was read, if unusual


def _compute(label: str, loaded) -> Side:
    from ..pipeline import run

    try:
        design = run(loaded)
    except InfeasibleDesign as exc:
        return Side(label, loaded.requirements, None, "infeasible", str(exc))
    return Side(label, loaded.requirements, design, design.status, design.infeasible_reason)


def load_side(path: Path) -> Side:
    from ..spec import load_requirements

    return _compute(str(path), load_requirements(path))


def _climbs(rel: str) -> int:
    """How many folders a normalised relative path climbs above its start ("../../x" -> 2)."""
    parts = rel.split("/")
    n = 0
    while n < len(parts) and parts[n] == "..":
        n += 1
    return n


def load_text_side(text: str, name: str, label: str,
                   files: list[tuple[str, bytes]] | None = None,
                   notes: list[str] | None = None) -> Side:
    """Load requirements given as text (written to a temporary folder, since the loader reads
    files), with the files it refers to (``files``: path relative to the spec's folder, bytes)
    at the same relative places; errors name ``label`` instead of the temporary file."""
    from ..spec import load_requirements

    files = files or []
    with tempfile.TemporaryDirectory(prefix="docgen-diff-") as tmp:
        root = Path(tmp)
        depth = max((_climbs(rel) for rel, _ in files), default=0)
        spec_dir = root.joinpath(*[f"level{i}" for i in range(depth)])
        spec_dir.mkdir(parents=True, exist_ok=True)
        for rel, data in files:
            target = Path(os.path.normpath(spec_dir / rel))
            target.parent.mkdir(parents=True, exist_ok=True)
            target.write_bytes(data)
        target = spec_dir / (Path(name).name or "spec.toml")
        target.write_text(text, encoding="utf-8")
        try:
            # the temporary folder stands for the project: references stay inside it
            loaded = dataclasses.replace(load_requirements(target), project_root=root)
            side = _compute(label, loaded)
        except SpecError as exc:
            # name the file the user knows, never the temporary copy (gone when this returns)
            where = exc.path
            if Path(where) == target:
                where = label
            elif Path(where).is_relative_to(root):
                rel = os.path.relpath(where, spec_dir).replace(os.sep, "/")
                where = f"{rel} (beside {label})"
            issues = [SpecIssue(i.location, i.message.replace(str(root), "<project>"))
                      for i in exc.issues]
            raise SpecError(where, issues) from None
    side.notes = list(notes or [])
    return side


def _git_blob(folder: Path, rev: str, rel: str) -> tuple[bytes | None, str]:
    """(bytes of ``rel`` at ``rev``, "") or (None, why not); ``rel`` is relative to ``folder``."""
    try:
        proc = subprocess.run(["git", "show", f"{rev}:./{rel}"], cwd=folder,
                              capture_output=True, timeout=120, check=False)
    except FileNotFoundError:
        return None, "git is not installed; expected the git command on PATH"
    except OSError as exc:
        return None, f"cannot run git ({exc.strerror})"
    except subprocess.TimeoutExpired:
        return None, "git did not answer within 120 s"
    if proc.returncode != 0:
        detail = proc.stderr.decode("utf-8", "replace").strip().splitlines()
        first = detail[0] if detail else f"git exited with status {proc.returncode}"
        return None, first.removeprefix("fatal: ")
    return proc.stdout, ""


def _check_rev(spec: Path, rev: str) -> None:
    if not rev or rev.startswith("-") or any(c in rev for c in "\n\0"):
        raise SpecError(str(spec), [SpecIssue(
            f"--rev {rev}", "expected a git revision such as HEAD, HEAD~1, a tag or a commit id")])


def git_show(spec: Path, rev: str) -> str:
    """The content of ``spec`` at git revision ``rev`` (``git show REV:./name`` in its folder)."""
    _check_rev(spec, rev)
    folder = spec.parent if str(spec.parent) else Path(".")
    data, why = _git_blob(folder, rev, spec.name)
    if data is None:
        raise SpecError(str(spec), [SpecIssue(
            f"--rev {rev}", f"git cannot read the file at that revision ({why}); expected a "
            "revision of the file's repository in which the file exists")])
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise SpecError(f"{spec} at {rev}", [SpecIssue(
            "", f"not UTF-8 text (byte {exc.start}); expected a TOML text file")]) from None


def load_rev_side(spec: Path, rev: str) -> Side:
    """The spec as it was at ``rev``, with the files it refers to (a parts library) as they were
    at ``rev`` too; a referenced file that git does not hold is taken from the disk, with a note."""
    from .incremental import extra_inputs

    _check_rev(spec, rev)
    if not spec.is_file():
        # the working copy is loaded first so a missing file is reported in the usual way
        from ..spec import load_requirements

        load_requirements(spec)
    text = git_show(spec, rev)
    folder = spec.parent if str(spec.parent) else Path(".")
    files: list[tuple[str, bytes]] = []
    notes: list[str] = []
    from ..parts.library import MAX_BYTES
    from ..parts.location import confine
    from ..textfile import read_bounded

    base = spec.resolve().parent
    for role, ref in extra_inputs(Path(spec.name), text.encode("utf-8")):
        # The same confinement as the working copy's: the revision's spec may name any path,
        # and reading it would echo the key names of whatever file it is.
        try:
            target = confine(spec, str(ref))
        except SpecError as exc:
            raise SpecError(f"{spec} at {rev}", exc.issues) from None
        rel = os.path.relpath(target, base).replace(os.sep, "/")
        data, why = _git_blob(folder, rev, rel)
        if data is None:
            if not target.is_file():
                notes.append(f"{role} {rel}: neither in git at {rev} ({why}) nor on disk")
                continue
            data = read_bounded(target, MAX_BYTES, "a parts library .toml file")
            notes.append(f"{role} {rel}: not in git at {rev} ({why}); the file on disk was used")
        elif len(data) > MAX_BYTES:
            raise SpecError(f"{rel} at {rev}", [SpecIssue(
                "", f"file is {len(data)} bytes; expected at most {MAX_BYTES}")])
        files.append((rel, data))
    return load_text_side(text, spec.name, f"{spec} at {rev}", files, notes)


# --------------------------------------------------------------------------- comparison rows

@dataclass
class FieldChange:
    path: str  # "output[0].load_max"
    old: str  # display text with unit, "" when the field is absent on that side
    new: str


@dataclass
class ValueChange:
    id: str
    title: str
    old: str
    new: str
    percent: float | None  # change relative to the old value; None when new/removed/old = 0


@dataclass
class PartChange:
    ref: str
    kind: str
    old: str  # short text: value, part id, origin; "" when the line is new
    new: str  # "" when the line is gone
    old_detail: str = ""  # the description (requirement text or library description)
    new_detail: str = ""


@dataclass
class CheckChange:
    id: str
    title: str
    old_status: str  # "" when the check is new
    new_status: str  # "" when the check is gone
    old_margin: float | None
    new_margin: float | None

    @property
    def flipped(self) -> bool:
        return self.old_status != self.new_status


@dataclass
class CautionChange:
    id: str
    title: str
    change: str  # "added" | "removed"


@dataclass
class DiffReport:
    old: Side
    new: Side
    threshold: float
    requirements: list[FieldChange] = field(default_factory=list)
    document: list[FieldChange] = field(default_factory=list)  # [project] fields
    values: list[ValueChange] = field(default_factory=list)
    parts: list[PartChange] = field(default_factory=list)
    checks: list[CheckChange] = field(default_factory=list)
    cautions: list[CautionChange] = field(default_factory=list)
    compared: bool = True  # False when either side is infeasible (no design to compare)

    @property
    def flipped(self) -> list[CheckChange]:
        return [c for c in self.checks if c.flipped]

    @property
    def moved(self) -> list[CheckChange]:
        return [c for c in self.checks if not c.flipped]

    @property
    def status_changed(self) -> bool:
        return (self.old.status, self.old.reason) != (self.new.status, self.new.reason)

    @property
    def changed(self) -> bool:
        """True when anything that matters changed (not [project] fields alone)."""
        return bool(self.requirements or self.values or self.parts or self.checks
                    or self.cautions or self.status_changed)

    def count(self) -> int:
        return (len(self.requirements) + len(self.values) + len(self.parts) + len(self.checks)
                + len(self.cautions) + (1 if self.status_changed else 0))


def moved(old: float, new: float, threshold: float) -> bool:
    """True when ``new`` differs from ``old`` by more than ``threshold`` relative."""
    if old == new:
        return False
    if not (math.isfinite(old) and math.isfinite(new)):
        return True
    return abs(new - old) > threshold * max(abs(old), abs(new))


def _field_text(value: Any, unit: str) -> str:
    from ..units import format_quantity

    if value is None:
        return "not set"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float) and unit:
        return format_quantity(value, unit)
    if isinstance(value, (int, float)):
        return f"{value:g}"
    return str(value)


def flatten(model: Any, prefix: str = "") -> dict[str, tuple[Any, str]]:
    """A validated model -> {TOML path: (value, unit)} for every leaf field."""
    from pydantic import BaseModel

    out: dict[str, tuple[Any, str]] = {}
    for name, info in type(model).model_fields.items():
        key = info.alias or name
        if key == "schema":
            continue
        path = f"{prefix}.{key}" if prefix else key
        value = getattr(model, name)
        extra = info.json_schema_extra if isinstance(info.json_schema_extra, dict) else {}
        unit = str(extra.get("unit", ""))
        if isinstance(value, BaseModel):
            out.update(flatten(value, path))
        elif isinstance(value, (list, tuple)) and value and isinstance(value[0], BaseModel):
            for i, item in enumerate(value):
                out.update(flatten(item, f"{path}[{i}]"))
        else:
            out[path] = (value, unit)
    return out


def _same_field(a: Any, b: Any, threshold: float) -> bool:
    if isinstance(a, float) and isinstance(b, float):
        return not moved(a, b, threshold)
    return a == b


def compare_requirements(old: Any, new: Any, threshold: float = 1e-12) -> list[FieldChange]:
    """Every field whose validated value differs; ``threshold`` only absorbs the rounding of
    unit conversion ("40 mA" vs "0.04 A"), it is not the user's value threshold."""
    a, b = flatten(old), flatten(new)
    rows = []
    for path in list(a) + [p for p in b if p not in a]:
        if path in a and path in b and _same_field(a[path][0], b[path][0], threshold):
            continue
        rows.append(FieldChange(
            path,
            _field_text(*a[path]) if path in a else "",
            _field_text(*b[path]) if path in b else ""))
    return rows


def _value_rows(old: Any, new: Any, threshold: float) -> list[ValueChange]:
    from ..units import format_quantity as fq

    rows = []
    for vid, nv in new.values.items():
        ov = old.values.get(vid)
        if ov is None:
            rows.append(ValueChange(vid, nv.title, "", fq(nv.value, nv.unit), None))
        elif ov.unit != nv.unit or moved(ov.value, nv.value, threshold):
            pct = (nv.value - ov.value) / abs(ov.value) * 100.0 if ov.value != 0 else None
            rows.append(ValueChange(vid, nv.title, fq(ov.value, ov.unit), fq(nv.value, nv.unit),
                                    pct))
    for vid, ov in old.values.items():
        if vid not in new.values:
            rows.append(ValueChange(vid, ov.title, fq(ov.value, ov.unit), "", None))
    return rows


def _part_text(p: Any) -> str:
    text = p.value_text
    if p.part_id:
        text += f" [{p.part_id}]"
    if p.origin != "sized":
        text += f" ({p.origin})"
    return text


def _part_rows(old: Any, new: Any) -> list[PartChange]:
    a = {p.ref: p for p in old.parts}
    b = {p.ref: p for p in new.parts}
    rows = []
    for ref in list(b) + [r for r in a if r not in b]:
        pa, pb = a.get(ref), b.get(ref)
        ta = _part_text(pa) if pa else ""
        tb = _part_text(pb) if pb else ""
        da = pa.description if pa else ""
        db = pb.description if pb else ""
        if (ta, da, pa and pa.kind) != (tb, db, pb and pb.kind):
            rows.append(PartChange(ref, (pb or pa).kind, ta, tb, da, db))
    return rows


def _check_rows(old: Any, new: Any, threshold: float) -> list[CheckChange]:
    a = {c.id: c for c in old.checks}
    b = {c.id: c for c in new.checks}
    rows = []
    for cid in list(b) + [c for c in a if c not in b]:
        ca, cb = a.get(cid), b.get(cid)
        if ca and cb and ca.status == cb.status and not moved(ca.margin, cb.margin, threshold):
            continue
        rows.append(CheckChange(
            cid, (cb or ca).title, ca.status if ca else "", cb.status if cb else "",
            ca.margin if ca else None, cb.margin if cb else None))
    return rows


def _caution_rows(old: Any, new: Any) -> list[CautionChange]:
    a = {c.id: c for c in old.cautions}
    b = {c.id: c for c in new.cautions}
    rows = [CautionChange(cid, c.title, "added") for cid, c in b.items() if cid not in a]
    rows += [CautionChange(cid, c.title, "removed") for cid, c in a.items() if cid not in b]
    return rows


def compare(old: Side, new: Side, threshold: float = DEFAULT_THRESHOLD) -> DiffReport:
    report = DiffReport(old, new, threshold)
    everything = compare_requirements(old.requirements, new.requirements)
    report.document = [c for c in everything if c.path.startswith("project.")]
    report.requirements = [c for c in everything if not c.path.startswith("project.")]
    if old.design is None or new.design is None:
        report.compared = False
        return report
    report.values = _value_rows(old.design, new.design, threshold)
    report.parts = _part_rows(old.design, new.design)
    report.checks = _check_rows(old.design, new.design, threshold)
    report.cautions = _caution_rows(old.design, new.design)
    return report


# --------------------------------------------------------------------------- presentation

def margin_text(status: str, margin: float | None) -> str:
    if not status:
        return "(none)"
    if margin is None or not math.isfinite(margin):
        return status.upper()
    return f"{status.upper()} {margin * 100:+.1f} %"


def percent_text(pct: float | None) -> str:
    return "" if pct is None else f"{pct:+.3g} %"


def side_status(side: Side) -> str:
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


def terminal_text(report: DiffReport) -> str:
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


def render_html(report: DiffReport) -> str:
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


def check_html_target(target: Path, inputs: list[Path]) -> None:
    """Refuse, before any work, to write the report over an input or over a file that is not
    an earlier change report."""
    from ..errors import RenderError

    for p in inputs:
        try:
            if target.exists() and target.resolve() == p.resolve():
                raise RenderError(f"{target}: is an input of this comparison; expected a new "
                                  "file name for the HTML change report")
        except OSError:
            pass
    if target.is_dir():
        raise RenderError(f"{target}: is a folder; expected a file name for the HTML report")
    if target.exists() and not target.is_file():  # a FIFO would block the read below
        raise RenderError(f"{target}: is not a regular file (a device, pipe or socket); "
                          "expected a file name for the HTML report")
    if target.exists():
        try:
            with open(target, "rb") as fh:
                head = fh.read(4096).decode("utf-8", "replace")
        except OSError as exc:
            raise RenderError(f"{target}: cannot read the existing file ({exc.strerror})") from None
        if REPORT_MARKER not in head:
            raise RenderError(f"{target}: exists and is not a docgen change report; expected a "
                              "new file name (docgen diff overwrites only its own reports)")


def write_html(report: DiffReport, target: Path, inputs: list[Path]) -> None:
    """Write the change report atomically (see :func:`check_html_target`)."""
    from .output import prepare_dir, write_atomic

    check_html_target(target, inputs)
    prepare_dir(target.parent if str(target.parent) else Path("."))
    write_atomic(target, render_html(report))
