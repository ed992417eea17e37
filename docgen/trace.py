"""Traced values: every number in the document carries the equation and inputs that produced it.

An :class:`Equation` is written once (in :mod:`docgen.equations`) with a right-hand side template
whose ``$name`` placeholders stand for its parameters. Evaluating it through a :class:`Ledger`
binds each parameter to an earlier traced value, computes the result with a Python function
written beside the template, and stores a :class:`TracedValue` holding the symbolic form, the
substituted form and the ids of the inputs. Code and formula sit side by side so they cannot
drift apart unnoticed.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from string import Template

from .errors import InfeasibleDesign
from .standards import NoStandardValue
from .units import format_quantity


@dataclass(frozen=True)
class Equation:
    """A formula written once and cited many times."""

    id: str  # "reservoir.capacitance"
    title: str
    rhs: str  # LaTeX right-hand side with $param placeholders
    params: Mapping[str, str]  # param -> generic LaTeX symbol, for the catalogue form
    source: str  # "Sedra & Smith, Microelectronic Circuits, peak rectifier" or "common practice"
    note: str = ""  # validity, assumptions

    def generic_latex(self, lhs: str) -> str:
        return f"{lhs} = " + Template(self.rhs).substitute(self.params)


@dataclass(frozen=True)
class TracedValue:
    """One number of the design with its provenance."""

    id: str  # results.json key and HTML anchor
    symbol: str  # LaTeX symbol, e.g. "V_{pk,lo}"
    value: float  # SI (temperatures in degC)
    unit: str
    title: str
    equation: str  # Equation.id, or "given" / "default" for inputs
    latex: str = ""  # symbolic form with this evaluation's symbols
    substituted: str = ""  # the same with input values filled in
    inputs: tuple[str, ...] = ()
    source: str = ""  # for inputs: "requirements file" or "default (common practice)"
    stage: str = ""


@dataclass(frozen=True)
class Assumption:
    id: str
    text: str
    source: str


@dataclass(frozen=True)
class Caution:
    id: str
    title: str
    text: str
    source: str
    triggered_by: str = ""  # value or check id for design-triggered cautions; "" if standing


def latex_number(value: float, unit: str) -> str:
    """A value with its unit for use inside LaTeX (mathtext): '207\\,\\mathrm{V}'."""
    text = format_quantity(value, unit)
    if " " in text:
        number, shown_unit = text.split(" ", 1)
    else:
        number, shown_unit = text, ""
    shown_unit = (
        shown_unit.replace("\u00b5", r"\mu ")
        .replace("\u03a9", r"\Omega")
        .replace("\u00b0C", r"^{\circ}C")
        .replace("%", r"\%")
        .replace("\u00b2", "^2")
    )
    if not shown_unit:
        return number
    return rf"{number}\,\mathrm{{{shown_unit}}}"


class TraceError(RuntimeError):
    """A programming error in a stage: unknown input id, duplicate id, non-finite result."""


class UndefinedValue(TraceError):
    """A formula has no finite value for these requirements (a division by zero, a logarithm
    of a negative ratio, a rating beyond every standard step). Carries what the user needs to
    see: which quantity, why, and the inputs it was computed from."""

    def __init__(self, value_id: str, title: str, why: str, inputs: dict[str, tuple[float, str]]):
        self.value_id = value_id
        self.title = title
        self.why = why
        self.inputs = inputs
        super().__init__(f"{title} ({value_id}): {why}")


def _why(exc: BaseException) -> str:
    """A user's reading of an arithmetic failure (no Python-internal wording)."""
    if isinstance(exc, ZeroDivisionError):
        return "a division by zero"
    if isinstance(exc, OverflowError):
        return "a number too large to compute"
    if type(exc).__name__ == "NoStandardValue":
        return "beyond the largest standard rating step"
    if isinstance(exc, ValueError) and "math domain" in str(exc):
        return "outside the domain of its formula (a logarithm or root of a negative number)"
    return "not a finite number"


@dataclass
class Ledger:
    """Collects the traced values of one design in the order they were computed."""

    values: dict[str, TracedValue] = field(default_factory=dict)
    equations: dict[str, Equation] = field(default_factory=dict)
    stage: str = ""
    # (stage, id) of every read, in order: what the ledger test checks the stages against
    reads: list[tuple[str, str]] = field(default_factory=list)

    def __getitem__(self, value_id: str) -> float:
        self.reads.append((self.stage, value_id))
        return self.values[value_id].value

    def __contains__(self, value_id: str) -> bool:
        return value_id in self.values

    def _store(self, tv: TracedValue) -> float:
        if tv.id in self.values:
            raise TraceError(f"value id {tv.id!r} computed twice")
        if not (isinstance(tv.value, float) and math.isfinite(tv.value)):
            raise TraceError(f"value {tv.id!r} is not a finite float: {tv.value!r}")
        self.values[tv.id] = tv
        return tv.value

    def given(
        self,
        value_id: str,
        symbol: str,
        value: float,
        unit: str,
        title: str,
        *,
        defaulted: bool = False,
        source: str = "",
    ) -> float:
        """Record an input taken from the requirements file (or its documented default)."""
        return self._store(
            TracedValue(
                id=value_id,
                symbol=symbol,
                value=float(value),
                unit=unit,
                title=title,
                equation="default" if defaulted else "given",
                source=source or ("default" if defaulted else "requirements file"),
                stage=self.stage,
            )
        )

    def calc(
        self,
        value_id: str,
        equation: Equation,
        symbol: str,
        unit: str,
        title: str,
        inputs: Mapping[str, str],
        fn: Callable[..., float],
    ) -> float:
        """Evaluate ``fn`` on the values of ``inputs`` and record the result with its trace.

        ``inputs`` maps each equation parameter to the id of an earlier traced value.
        """
        if set(inputs) != set(equation.params):
            raise TraceError(
                f"{value_id}: inputs {sorted(inputs)} do not match parameters of "
                f"{equation.id} {sorted(equation.params)}"
            )
        missing = [vid for vid in inputs.values() if vid not in self.values]
        if missing:
            raise TraceError(f"{value_id}: unknown input ids {missing}")
        self.equations.setdefault(equation.id, equation)
        self.reads += [(self.stage, vid) for vid in inputs.values()]
        args = {p: self.values[vid].value for p, vid in inputs.items()}
        try:
            result = float(fn(**args))
        except NoStandardValue as exc:
            # name the quantity, the limit and what to change, not just two bare numbers
            raise InfeasibleDesign(f"{title} ({value_id}) {exc}") from None
        except (ArithmeticError, ValueError) as exc:
            raise UndefinedValue(value_id, title, _why(exc), {
                vid: (self.values[vid].value, self.values[vid].unit)
                for vid in inputs.values()}) from None
        if not math.isfinite(result):
            raise UndefinedValue(value_id, title, "not a finite number", {
                vid: (self.values[vid].value, self.values[vid].unit)
                for vid in inputs.values()})
        rhs = Template(equation.rhs)
        symbolic = rhs.substitute({p: self.values[vid].symbol for p, vid in inputs.items()})
        # A value with a unit raised to a power needs brackets: (930 mA)^2, not 930 mA^2.
        powered = Template(re.sub(r"\$(\w+)\^", r"\\left($\1\\right)^", equation.rhs))
        substituted = powered.substitute(
            {p: latex_number(self.values[vid].value, self.values[vid].unit)
             for p, vid in inputs.items()}
        )
        return self._store(
            TracedValue(
                id=value_id,
                symbol=symbol,
                value=result,
                unit=unit,
                title=title,
                equation=equation.id,
                latex=f"{symbol} = {symbolic}",
                substituted=f"{symbol} = {substituted} = {latex_number(result, unit)}",
                inputs=tuple(dict.fromkeys(inputs.values())),
                source=equation.source,
                stage=self.stage,
            )
        )

    def measured(
        self,
        value_id: str,
        equation: Equation,
        symbol: str,
        value: float,
        unit: str,
        title: str,
        inputs: tuple[str, ...],
        where: str,
    ) -> float:
        """Record a value computed numerically (waveform engine) rather than by a formula.

        ``where`` names the operating point (corner) the value belongs to; the substituted form
        shows the result and the corner, and ``inputs`` lists the traced values the simulation
        was built from.
        """
        missing = [vid for vid in inputs if vid not in self.values]
        if missing:
            raise TraceError(f"{value_id}: unknown input ids {missing}")
        self.equations.setdefault(equation.id, equation)
        return self._store(
            TracedValue(
                id=value_id,
                symbol=symbol,
                value=float(value),
                unit=unit,
                title=title,
                equation=equation.id,
                latex=f"{symbol} = {equation.rhs}",
                substituted=f"{symbol} = {latex_number(float(value), unit)}"
                + r"\quad\mathrm{(" + where.replace(" ", r"\ ").replace("%", r"\%") + ")}",
                inputs=tuple(dict.fromkeys(inputs)),
                source=equation.source,
                stage=self.stage,
            )
        )

    def ids_for_stage(self, stage: str) -> list[str]:
        return [v.id for v in self.values.values() if v.stage == stage]
