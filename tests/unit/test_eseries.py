"""IEC 60063 preferred values: the tables and rounding to them.

The expected lists below are typed from IEC 60063:2015 as listed in docs/references.md [IEC60063]
(E6, E12, E24: confirmed against a secondary copy of the standard's table). The E96 list is from
memory of the same standard, compared with two secondary copies of its table.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from docgen.parts import eseries
from docgen.parts.eseries import is_preferred, preferred, series_values, value_code, values_between

# IEC 60063:2015, E series table ([IEC60063]).
IEC60063_E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8]
IEC60063_E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2]
IEC60063_E24 = [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
                3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1]
# IEC 60063 E96 (from memory; agrees with two secondary copies of the table), in hundredths.
IEC60063_E96_HUNDREDTHS = [
    100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150,
    154, 158, 162, 165, 169, 174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232,
    237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309, 316, 324, 332, 340, 348, 357,
    365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549,
    562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845,
    866, 887, 909, 931, 953, 976,
]


class TestTables:
    def test_e6_e12_e24_match_iec60063(self):
        assert list(series_values("E6")) == IEC60063_E6
        assert list(series_values("E12")) == IEC60063_E12
        assert list(series_values("E24")) == IEC60063_E24

    def test_e96_matches_iec60063_from_memory(self):
        assert [round(v * 100) for v in series_values("E96")] == IEC60063_E96_HUNDREDTHS
        assert series_values("E96")[0] == 1.00 and series_values("E96")[-1] == 9.76

    def test_lengths(self):
        # IEC 60063: the series name is the number of values per decade.
        for name, n in (("E6", 6), ("E12", 12), ("E24", 24), ("E48", 48), ("E96", 96)):
            assert len(series_values(name)) == n

    def test_each_series_is_every_other_member_of_the_next(self):
        # IEC 60063 ([IEC60063]): E6 = E12[::2], E12 = E24[::2].
        assert eseries.E12 == eseries.E24[::2]
        assert eseries.E6 == eseries.E12[::2]
        # E48 = E96[::2] (from memory; also stated by a secondary copy of the table).
        assert [round(v * 100) for v in eseries.E48] == IEC60063_E96_HUNDREDTHS[::2]

    def test_e24_is_not_the_rounded_geometric_series(self):
        # [IEC60063]: IEC kept historical values, e.g. 2.7 where 10**(10/24)
        # rounds to 2.6, so a generated table would be wrong.
        geometric = [round(10 ** (i / 24), 1) for i in range(24)]
        assert geometric[10] == 2.6 and eseries.E24[10] == 2.7
        assert geometric != list(eseries.E24)

    def test_e96_is_the_rounded_geometric_series(self):
        # Independent check of the typed E96 table: its values are 10**(i/96) to three
        # significant figures (from memory; also stated by a secondary copy of the table).
        assert [round(10 ** (i / 96) * 100) for i in range(96)] == IEC60063_E96_HUNDREDTHS

    def test_tables_are_strictly_ascending_within_one_decade(self):
        for name in eseries.SERIES:
            values = series_values(name)
            assert all(a < b for a, b in zip(values, values[1:], strict=False))
            assert values[0] == 1.0 and values[-1] < 10.0

    def test_series_name_is_case_insensitive_and_unknown_names_are_refused(self):
        assert series_values("e12") == eseries.E12
        with pytest.raises(ValueError, match="E6, E12, E24, E48, E96"):
            series_values("E13")


class TestPreferred:
    def test_references_derived_checks(self):
        # C-ESERIES [IEC60063], derived checks: nearest-not-above E24 for 478 ohm is
        # 470 ohm, nearest-not-below for 235 ohm is 240 ohm.
        assert preferred(478.0, "E24", "down") == 470.0
        assert preferred(235.0, "E24", "up") == 240.0

    def test_exact_member_maps_to_itself_in_every_mode(self):
        for mode in ("up", "down", "nearest"):
            assert preferred(470.0, "E12", mode) == 470.0
            assert preferred(4.7e-6, "E12", mode) == 4.7e-6
            assert preferred(1.0, "E6", mode) == 1.0

    def test_floating_noise_does_not_jump_to_the_next_value(self):
        noisy = 4.7e-6 * (1 + 1e-14)
        assert noisy != 4.7e-6
        assert preferred(noisy, "E12", "up") == 4.7e-6
        assert preferred(4.7 * 1e-6, "E12", "up") == 4.7e-6
        assert preferred(0.1 + 0.2, "E24", "up") == 0.3  # 0.30000000000000004
        assert preferred(3300e-6 * 0.999999999999, "E6", "down") == 3.3e-3

    def test_decade_edges(self):
        assert preferred(9.9, "E12", "up") == 10.0
        assert preferred(0.0995, "E12", "up") == 0.1
        assert preferred(0.0995, "E12", "down") == 0.082
        assert preferred(9.2, "E24", "up") == 10.0
        assert preferred(1.05, "E12", "down") == 1.0
        assert preferred(0.99, "E24", "down") == 0.91
        assert preferred(9.8, "E96", "up") == 10.0
        assert preferred(1.001e6, "E6", "down") == 1e6

    def test_results_equal_the_typed_literal(self):
        assert preferred(2.6e-3, "E12", "up") == 2.7e-3
        assert preferred(5.0e3, "E24", "up") == 5.1e3
        assert preferred(15.8e3, "E96", "nearest") == 15.8e3
        assert preferred(16834.2, "E96", "nearest") == 16.9e3

    def test_nearest_is_logarithmic_with_ties_up(self):
        # E12 1.0 -> 1.2: geometric midpoint sqrt(1.2) = 1.0954; 1.097 is nearer 1.2 on a log
        # scale though nearer 1.0 on a linear one.
        assert preferred(1.097, "E12", "nearest") == 1.2
        assert preferred(1.09, "E12", "nearest") == 1.0
        assert preferred(math.sqrt(1.0 * 1.2), "E12", "nearest") == 1.2

    def test_bad_input_is_refused_with_a_clear_message(self):
        for bad in (0.0, -1.0, float("nan"), float("inf")):
            with pytest.raises(ValueError, match="positive"):
                preferred(bad)
        with pytest.raises(ValueError, match="rounding mode"):
            preferred(1.0, "E24", "ceiling")
        with pytest.raises(ValueError, match="unknown E series"):
            preferred(1.0, "E7")

    @given(
        value=st.floats(min_value=1e-13, max_value=1e13, allow_nan=False, allow_infinity=False),
        series=st.sampled_from(sorted(eseries.SERIES)),
    )
    def test_up_and_down_bracket_the_value_and_are_members(self, value, series):
        up = preferred(value, series, "up")
        down = preferred(value, series, "down")
        nearest = preferred(value, series, "nearest")
        tol = eseries.REL_TOL * value
        assert up >= value - tol
        assert down <= value + tol
        assert nearest in (up, down)
        for result in (up, down, nearest):
            assert is_preferred(result, series)
            mantissa = result / 10 ** math.floor(math.log10(result) + 1e-12)
            assert any(math.isclose(mantissa, m, rel_tol=1e-9) for m in series_values(series))
        # No member of the series lies strictly between down and up other than the value.
        if up != down:
            step = series_values(series)
            ratio_limit = max(b / a for a, b in zip(step, step[1:] + (10.0,), strict=True))
            assert up / down <= ratio_limit * (1 + 1e-9)


class TestHelpers:
    def test_is_preferred(self):
        assert is_preferred(4.7e3, "E6")
        assert not is_preferred(5.1e3, "E12")
        assert is_preferred(5.1e3, "E24")
        assert not is_preferred(-4.7, "E6")

    def test_values_between_is_inclusive_and_crosses_decades(self):
        assert values_between(68.0, 150.0, "E12") == [68.0, 82.0, 100.0, 120.0, 150.0]
        assert values_between(1.0, 10.0, "E6") == [1.0, 1.5, 2.2, 3.3, 4.7, 6.8, 10.0]
        assert len(values_between(1.0, 1e6, "E24")) == 6 * 24 + 1
        assert values_between(71.0, 72.0, "E24") == []

    def test_value_code(self):
        # Letter-for-decimal-point marking on resistors (common practice, no source).
        assert value_code(0.47) == "R47"
        assert value_code(4.7) == "4R7"
        assert value_code(470.0) == "470R"
        assert value_code(4700.0) == "4K7"
        assert value_code(10e3) == "10K"
        assert value_code(1e6) == "1M"
        assert value_code(2.2e6) == "2M2"
