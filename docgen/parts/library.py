"""The approved-parts library: a TOML file of parts with their ratings, read into typed models.

File format (schema 1)
----------------------
::

    schema = 1

    [library]
    name = "Bench supplies, approved parts"
    source = "Datasheets in ../datasheets, checked 2024-05"   # where the numbers come from
    notes = "..."                                             # optional
    currency = "EUR"                                          # optional, unit of every price

    [[capacitor]]
    id = "DP-CAP-3300U35"
    capacitance = "3300 uF"
    tolerance = "20 %"
    voltage = "35 V"
    ripple_current = "2.2 A"
    ripple_temperature = "105 degC"
    ripple_frequency = "120 Hz"   # optional: frequency of that rating (100/120 Hz if absent)
    # optional: the maker's frequency multipliers (a typical table is used when absent)
    ripple_multipliers = { "50 Hz" = 0.8, "120 Hz" = 1.0, "1 kHz" = 1.35, "10 kHz" = 1.5 }
    tan_delta = 0.12              # or esr = "40 mohm"
    life = "5000 h"
    life_temperature = "105 degC"
    price = 0.45

One array of tables per kind of part: ``[[transformer]]``, ``[[diode]]``, ``[[bridge]]``,
``[[capacitor]]``, ``[[zener]]``, ``[[resistor]]``, ``[[transistor]]``, ``[[regulator]]``,
``[[fuse]]`` and ``[[heatsink]]``; the fields of each are the attributes of the model classes
below. Quantities are text with a unit ("35 V", "2.2 A", "20 %") or plain SI numbers; they
are stored as SI floats, except temperatures (kept in degrees Celsius, attribute names ending
in ``_c``) and ripple rejection (kept in dB, ``_db``). Lengths accept "mm", "cm" and "m".

Conventions that matter for the numbers:

* ``transformer.secondary_voltage`` is the rated RMS voltage at full rated load and rated
  primary voltage; for a center-tapped part it is the whole winding (2 x 12 V -> "24 V").
  ``regulation`` is (V_no_load - V_full_load) / V_full_load, the full-load convention most
  makers use ([CP-REGULATION], docs/references.md) - a figure divided by V_no_load must be
  converted. ``rated_ambient`` (optional, e.g. "40 degC") is the ambient the VA rating holds
  at, 25 degC when absent (IEC 61558-1 marks t_a only when it differs; from memory), and
  ``insulation_class`` (optional: "A", "E", "B", "F" or "H", IEC 60085) its thermal class,
  class A (105 degC) when absent. Above the rated ambient the secondary current is derated
  to I_rated sqrt((T_class - T_A) / (T_class - T_rated)) ([CP-XFMR-AMBIENT]).
* ``capacitor.ripple_current`` is quoted at ``ripple_temperature`` and ``ripple_frequency``
  (100/120 Hz when absent). It is converted to the design's ripple frequency (2 f full-wave,
  f half-wave) by the ratio of frequency multipliers, M(f_ripple) / M(f_quoted):
  ``ripple_multipliers`` (an inline table of frequency = multiplier, straight lines on a
  logarithmic frequency axis between its points, flat beyond them) when given, else a typical
  table of aluminium electrolytics: 0.8 at 50/60 Hz, 1.0 at 100/120 Hz, 1.35 at 1 kHz, 1.5 at
  10 kHz and above (from memory, typical of makers' data; [CP-RIPPLE-FREQ]).
* ``bridge.i_f_avg`` is the bridge's rated average *output* current, as bridge makers quote it;
  ``diode.i_f_avg`` is the rating of one diode. ``i_fsm`` is the single half-sine surge peak.
* ``zener.power`` is the rated power up to ``power_reference_temperature`` of the
  ``power_reference`` point ("lead" or "ambient"), and ``r_theta`` is the thermal resistance
  from the junction to that point, so the allowed power above it is (t_j_max - T) / r_theta.
  A lead-rated part's lead runs above ambient: ``r_theta_la`` (lead to ambient as mounted)
  gives the path, else the requirements file's [output.zener] lead_to_ambient is used.
* ``regulator.dropout`` is the typical figure; ``dropout_max`` the datasheet maximum, used
  when given (else the file's allowance is added to the typical figure).
* A ``[[resistor]]`` table is either one part (``resistance``) or a family (``series``, ``min``,
  ``max``): a family stands for every preferred value of its IEC 60063 series from min to max.
  A member's id is the family id, "-" and the value code, e.g. "DP-RES-E24-0W25-4K7".
* ``capacitor.life`` is the rated endurance at ``life_temperature`` (e.g. "5000 h"); a plain
  number is seconds, like every other SI number.
* ``price`` is a plain number in the library's currency; a part without a price is chosen only
  when no priced part fits.

Every problem in a file is reported at once in a :class:`~docgen.errors.SpecError` whose
locations are paths such as ``capacitor[3].voltage`` (index counted from 0 within its kind, in
file order); unknown keys get a "did you mean" suggestion.
"""

from __future__ import annotations

import difflib
import hashlib
import re
from collections.abc import Iterator, Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from ..errors import SpecError, SpecIssue
from ..input_words import missing_key, unknown_key
from ..textfile import decode, parse_toml, read_bounded

# the part models below are re-exported (__all__): the library is their public face
from .kinds import _MODELS, KINDS, Part
from .part_base import LibraryInfo, _PartBase
from .power_parts import Bridge, Capacitor, Diode, Fuse, Transformer
from .readers import _show_raw
from .regulation_parts import Heatsink, Regulator, Resistor, ResistorFamily, Transistor, Zener

__all__ = [
    "SCHEMA",
    "KINDS",
    "Part",
    "Transformer",
    "Diode",
    "Bridge",
    "Capacitor",
    "Zener",
    "Resistor",
    "ResistorFamily",
    "Transistor",
    "Regulator",
    "Fuse",
    "Heatsink",
    "LibraryInfo",
    "PartsLibrary",
    "load_library",
    "parse_library",
]

SCHEMA = 1
MAX_BYTES = 2_000_000  # a library of a few thousand parts; far larger is a mistake

# --------------------------------------------------------------------------------------------
# Field readers. Each is a callable object used as a pydantic BeforeValidator; ``expects`` is
# the text shown when the field is missing.


# --------------------------------------------------------------------------------------------
# The library


@dataclass(frozen=True)
class PartsLibrary:
    """A validated parts library; every rating SI (temperatures degC)."""

    info: LibraryInfo
    path: str
    sha256: str  # of the file's bytes, so a build can tell the library changed
    transformers: tuple[Transformer, ...] = ()
    diodes: tuple[Diode, ...] = ()
    bridges: tuple[Bridge, ...] = ()
    capacitors: tuple[Capacitor, ...] = ()
    zeners: tuple[Zener, ...] = ()
    resistors: tuple[Resistor | ResistorFamily, ...] = ()
    transistors: tuple[Transistor, ...] = ()
    regulators: tuple[Regulator, ...] = ()
    fuses: tuple[Fuse, ...] = ()
    heatsinks: tuple[Heatsink, ...] = ()

    @property
    def name(self) -> str:
        return self.info.name

    def parts(self, kind: str) -> tuple[Part, ...]:
        """All parts of one kind ("capacitor", ...), in file order."""
        if kind not in _MODELS:
            raise ValueError(f"unknown part kind {kind!r}; expected one of {', '.join(KINDS)}")
        return getattr(self, _PLURAL[kind])

    def __iter__(self) -> Iterator[Part]:
        for kind in KINDS:
            yield from self.parts(kind)

    def get(self, part_id: str) -> Part:
        """The part with this id; a resistor family member id ("<family>-4K7") also works.

        Raises KeyError with a "did you mean" suggestion.
        """
        for part in self:
            if part.id == part_id:
                return part
        family_id, _, code = part_id.rpartition("-")
        for part in self.resistors:
            if isinstance(part, ResistorFamily) and part.id == family_id:
                value = _value_from_code(code)
                if value is not None and part.offers(value):
                    return part.member(value)
        ids = [p.id for p in self]
        close = difflib.get_close_matches(part_id, ids, n=1)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        raise KeyError(f"no part {part_id!r} in library {self.info.name!r}{hint}")


_PLURAL = {
    "transformer": "transformers",
    "diode": "diodes",
    "bridge": "bridges",
    "capacitor": "capacitors",
    "zener": "zeners",
    "resistor": "resistors",
    "transistor": "transistors",
    "regulator": "regulators",
    "fuse": "fuses",
    "heatsink": "heatsinks",
}


def _value_from_code(code: str) -> float | None:
    m = re.fullmatch(r"([0-9]*)([RKMG])([0-9]*)", code)
    if not m or not (m.group(1) or m.group(3)):
        return None
    factor = {"R": 1.0, "K": 1e3, "M": 1e6, "G": 1e9}[m.group(2)]
    return float(f"{m.group(1) or '0'}.{m.group(3) or '0'}") * factor


# --------------------------------------------------------------------------------------------
# Loading

_TOP_KEYS = ("schema", "library", *KINDS)


def _did_you_mean(word: str, choices: list[str] | tuple[str, ...]) -> str:
    close = difflib.get_close_matches(word, list(choices), n=1, cutoff=0.6)
    return f"; did you mean {close[0]!r}?" if close else ""


def _field_keys(model: type[BaseModel]) -> list[str]:
    return [info.alias or name for name, info in model.model_fields.items()]


def _expects(model: type[BaseModel], key: str) -> str:
    for name, info in model.model_fields.items():
        if (info.alias or name) == key:
            for meta in info.metadata:
                expects = getattr(getattr(meta, "func", None), "expects", None)
                if isinstance(expects, str):
                    return expects
    return "a value"


def _path(prefix: str, loc: tuple[Any, ...]) -> str:
    text = prefix
    for item in loc:
        if isinstance(item, int):
            text += f"[{item}]"
        else:
            text = f"{text}.{item}" if text else str(item)
    return text


def _issues_from(error: ValidationError, model: type[BaseModel], prefix: str,
                 part_id: str | None) -> list[SpecIssue]:
    issues = []
    suffix = f" (part {part_id!r})" if part_id else ""
    for err in error.errors(include_url=False):
        loc = tuple(err["loc"])
        kind = err["type"]
        if kind == "value_error":
            message = str(err["ctx"]["error"]) if "ctx" in err else err["msg"]
        elif kind == "missing":
            key = str(loc[-1]) if loc else ""
            message = missing_key(_expects(model, key))
        elif kind == "extra_forbidden":
            key = str(loc[-1]) if loc else ""
            message = unknown_key(key, _field_keys(model))
        else:
            message = err["msg"]
        issues.append(SpecIssue(_path(prefix, loc), message + suffix))
    return issues


def _resistor_model(raw: Mapping[str, Any]) -> type[_PartBase]:
    return ResistorFamily if any(k in raw for k in ("series", "min", "max")) else Resistor


def parse_library(data: bytes | str, path: str | Path = "<parts library>") -> PartsLibrary:
    """Read a parts library from the file's bytes (or text); ``path`` is used in messages.

    Raises SpecError listing every problem found.
    """
    raw_bytes = data.encode("utf-8") if isinstance(data, str) else bytes(data)
    where = str(path)
    digest = hashlib.sha256(raw_bytes).hexdigest()
    if len(raw_bytes) > MAX_BYTES:
        raise SpecError(where, [SpecIssue("", f"file is {len(raw_bytes)} bytes; expected at most "
                                              f"{MAX_BYTES}")])
    doc = parse_toml(where, decode(where, raw_bytes))

    issues: list[SpecIssue] = []

    schema = doc.get("schema")
    if "schema" not in doc:
        issues.append(SpecIssue("schema", f"missing; expected schema = {SCHEMA} at the top"))
    elif isinstance(schema, bool) or schema != SCHEMA:
        issues.append(SpecIssue("schema", f"expected {SCHEMA} (the only format this docgen "
                                          f"reads), got {_show_raw(schema)}"))

    info: LibraryInfo | None = None
    header = doc.get("library")
    if header is None:
        issues.append(SpecIssue("library", 'missing; expected a [library] table with name = "..."'))
    elif not isinstance(header, dict):
        issues.append(SpecIssue("library", 'expected a [library] table with name = "..."'))
    else:
        try:
            info = LibraryInfo.model_validate(header)
        except ValidationError as exc:
            issues.extend(_issues_from(exc, LibraryInfo, "library", None))

    for key in doc:
        if key not in _TOP_KEYS:
            hint = _did_you_mean(key, _TOP_KEYS)
            issues.append(SpecIssue(key, "unknown table or key" + (
                hint or f"; known: {', '.join(_TOP_KEYS)}")))

    parts: dict[str, list[Any]] = {kind: [] for kind in KINDS}
    first_seen: dict[str, str] = {}
    for kind in [key for key in doc if key in _MODELS]:  # file order
        tables = doc[kind]
        if not isinstance(tables, list):
            issues.append(SpecIssue(kind, f"expected an array of tables written [[{kind}]], "
                                          f"got {_show_raw(tables)}"))
            continue
        for index, table in enumerate(tables):
            prefix = f"{kind}[{index}]"
            if not isinstance(table, dict):
                issues.append(SpecIssue(prefix, f"expected a table written [[{kind}]], "
                                                f"got {_show_raw(table)}"))
                continue
            part_id = table.get("id") if isinstance(table.get("id"), str) else None
            model = _MODELS[kind]
            if kind == "resistor":
                model = _resistor_model(table)
                if model is ResistorFamily and "resistance" in table:
                    issues.append(SpecIssue(
                        f"{prefix}.resistance",
                        "a [[resistor]] is either one part (resistance) or a family (series, "
                        "min, max), not both" + (f" (part {part_id!r})" if part_id else "")))
                    continue
            try:
                part = model.model_validate(table)
            except ValidationError as exc:
                found = _issues_from(exc, model, prefix, part_id)
                if all(issue.location != prefix for issue in found):
                    # Field errors stop pydantic before the cross-field rules; check them here
                    # on the raw keys so they are reported in the same pass.
                    suffix = f" (part {part_id!r})" if part_id else ""
                    found += [SpecIssue(prefix, problem + suffix)
                              for problem in model._group_problems(table)]
                issues.extend(found)
            else:
                parts[kind].append(part)
            if part_id is not None:
                if part_id in first_seen:
                    issues.append(SpecIssue(f"{prefix}.id", f"duplicate id {part_id!r}; first "
                                                            f"used at {first_seen[part_id]}.id"))
                else:
                    first_seen[part_id] = prefix

    if issues:
        raise SpecError(where, issues)
    assert info is not None
    return PartsLibrary(
        info=info,
        path=where,
        sha256=digest,
        **{_PLURAL[kind]: tuple(items) for kind, items in parts.items()},
    )


def load_library(path: str | Path) -> PartsLibrary:
    """Read and validate the parts library at ``path``. Raises SpecError listing every problem."""
    try:
        data = read_bounded(Path(path), MAX_BYTES, "a parts library .toml file")
    except SpecError as exc:
        issues = [SpecIssue(i.location, f"cannot read the parts library: {i.message}")
                  for i in exc.issues]
        raise SpecError(exc.path, issues) from None
    return parse_library(data, path)
