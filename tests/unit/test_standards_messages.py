"""A need above every standard step says which rating, how much, the largest step and what to do."""

from __future__ import annotations

import pytest

from docgen import standards
from docgen.errors import InfeasibleDesign
from docgen.trace import Equation, Ledger
from docgen.units import format_quantity


@pytest.mark.parametrize("steps", list(standards.STEP_INFO), ids=lambda s: f"{s[-1]:g}")
def test_message_names_need_limit_unit_and_remedy(steps):
    what, unit, advice = standards.STEP_INFO[steps]
    with pytest.raises(standards.NoStandardValue) as err:
        standards.next_at_or_above(steps[-1] * 1.5, steps)
    text = str(err.value)
    assert what in text and advice in text and "to fix it" in text
    assert f"({format_quantity(steps[-1], unit)})" in text
    assert f"needs {format_quantity(steps[-1] * 1.5, unit)}," in text


def test_a_value_within_the_steps_is_picked():
    assert standards.next_at_or_above(4.0, standards.ZENER_POWERS) == 5.0


def test_ledger_names_the_quantity_when_the_steps_run_out():
    L = Ledger()
    L.given("need", "P", 7.0, "W", "Power needed")
    eq = Equation("pick", "Picked", "$x", {"x": "need"}, "common practice")
    with pytest.raises(InfeasibleDesign) as err:
        L.calc("zener.p_rating", eq, "P_r", "W", "Zener power rating", {"x": "need"},
               lambda x: standards.next_at_or_above(x, standards.ZENER_POWERS))
    text = str(err.value)
    assert text.startswith("Zener power rating (zener.p_rating) needs 7 W")
    assert "largest standard zener power class (5 W)" in text
