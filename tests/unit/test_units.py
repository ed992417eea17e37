"""Quantities at the edges: parse_quantity (text with units -> SI float) and format_quantity.

Sources for the expected values:
* SI prefixes p n u/µ m k M: BIPM, *The International System of Units (SI)*, 9th ed. 2019,
  Table 7 "SI prefixes" (from memory).
* min = 60 s, h = 3600 s: SI Brochure 9th ed., Table 8 "non-SI units accepted for use with the
  SI" (from memory).
* % = 0.01: SI Brochure 9th ed. section 5.4.7, "the symbol % represents the number 0.01"
  (from memory). ppm = 1e-6: common practice, no source (the SI Brochure discourages it).
* Julian year = 365.25 d = 31 557 600 s: IAU definition of the Julian year (from memory).
* Ohm symbol Ω, micro sign µ, degree Celsius °C, a space between number and unit:
  SI Brochure 9th ed. section 5.4.3 (space) and Table 4 (derived units) (from memory).
* Temperatures stay in degrees Celsius and ratios are fractions: docgen's own convention
  (docgen/units.py module docstring), not an outside source.
"""

from __future__ import annotations

import math

import pytest

from docgen.units import UnitError, format_quantity, parse_quantity

# SI Brochure 9th ed., Table 7 (from memory).
SI_PREFIX = {"p": 1e-12, "n": 1e-9, "u": 1e-6, "\u00b5": 1e-6, "m": 1e-3, "": 1.0, "k": 1e3,
             "M": 1e6}


# ------------------------------------------------------------------------------ parsing
@pytest.mark.parametrize(
    "text, dimension, number, prefix",
    [
        ("230 V", "voltage", 230.0, ""),
        ("50 mV", "voltage", 50.0, "m"),
        ("40 mA", "current", 40.0, "m"),
        ("5 uA", "current", 5.0, "u"),
        ("4700 uF", "capacitance", 4700.0, "u"),
        ("4700 \u00b5F", "capacitance", 4700.0, "\u00b5"),  # micro sign U+00B5
        ("100 nF", "capacitance", 100.0, "n"),
        ("22 pF", "capacitance", 22.0, "p"),
        ("3.3 mF", "capacitance", 3.3, "m"),
        ("2 mH", "inductance", 2.0, "m"),
        ("2.2 kohm", "resistance", 2.2, "k"),
        ("2.2 kOhm", "resistance", 2.2, "k"),
        ("2.2 k\u03a9", "resistance", 2.2, "k"),  # Greek capital omega
        ("1 Mohm", "resistance", 1.0, "M"),
        ("470 ohm", "resistance", 470.0, ""),
        ("250 mW", "power", 250.0, "m"),
        ("1 kVA", "apparent_power", 1.0, "k"),
        ("50 Hz", "frequency", 50.0, ""),
        ("1 MHz", "frequency", 1.0, "M"),
        ("100 ms", "time", 100.0, "m"),
        ("1.5 J", "energy", 1.5, ""),
    ],
)
def test_si_prefixes_scale_to_the_base_unit(text, dimension, number, prefix):
    # SI Brochure 9th ed., Table 7: the prefix multiplies the unit by its power of ten.
    assert parse_quantity(text, dimension) == pytest.approx(number * SI_PREFIX[prefix], rel=1e-12)


def test_greek_mu_is_read_as_micro():
    # U+03BC GREEK SMALL LETTER MU is often typed for the micro sign U+00B5 (common practice,
    # no source); both mean 1e-6 (SI Brochure Table 7, from memory).
    assert parse_quantity("4700 \u03bcF", "capacitance") == pytest.approx(4700e-6, rel=1e-12)


@pytest.mark.parametrize(
    "text, seconds",
    [
        ("20000 h", 20000 * 3600.0),  # SI Brochure Table 8: 1 h = 3600 s (from memory)
        ("5 min", 5 * 60.0),  # SI Brochure Table 8: 1 min = 60 s (from memory)
        ("2 s", 2.0),
        ("1 year", 365.25 * 86400.0),  # IAU Julian year, 365.25 d (from memory)
    ],
)
def test_time_units(text, seconds):
    assert parse_quantity(text, "time") == pytest.approx(seconds, rel=1e-12)


@pytest.mark.parametrize(
    "text, fraction",
    [
        ("10 %", 10 * 0.01),  # SI Brochure 5.4.7: % = 0.01 (from memory)
        ("10%", 10 * 0.01),
        ("0.1", 0.1),  # a plain fraction
        ("50 ppm", 50 * 1e-6),  # ppm = 1e-6, common practice, no source
    ],
)
def test_ratio_units(text, fraction):
    assert parse_quantity(text, "ratio") == pytest.approx(fraction, rel=1e-12)


@pytest.mark.parametrize("text, celsius", [("45 degC", 45.0), ("-5 \u00b0C", -5.0), ("45 C", 45.0)])
def test_temperature_stays_in_celsius(text, celsius):
    # docgen convention: temperatures are kept in degC, not converted to kelvin.
    assert parse_quantity(text, "temperature") == celsius


def test_tempco_percent_per_degree():
    # 0.05 %/degC = 0.05 * 0.01 per kelvin (SI Brochure 5.4.7, % = 0.01, from memory);
    # a temperature *difference* of 1 degC equals 1 K (SI Brochure section 2.3.1, from memory).
    assert parse_quantity("0.05 %/degC", "tempco") == pytest.approx(0.05 * 0.01, rel=1e-12)
    assert parse_quantity("0.05 %/K", "tempco") == pytest.approx(0.05 * 0.01, rel=1e-12)


def test_voltage_tempco_with_prefix_in_kelvin():
    # "5 mV/K": milli prefix (SI Brochure Table 7) on V/K.
    assert parse_quantity("5 mV/K", "voltage_tempco") == pytest.approx(5e-3, rel=1e-12)


def test_voltage_tempco_example_from_the_error_message_is_accepted():
    # Regression: "5 mV/degC" is the example expected_text('voltage_tempco') offers; it was
    # rejected while _NO_PREFIX listed "V/degC" (fixed in b27e2ed).
    # SI Brochure Table 7 (milli) and 1 degC difference = 1 K (section 2.3.1), from memory.
    assert parse_quantity("5 mV/degC", "voltage_tempco") == pytest.approx(5e-3, rel=1e-12)


@pytest.mark.parametrize(
    "text, volts",
    [("  9.1V ", 9.1), (".5 V", 0.5), ("5. V", 5.0), ("+5 V", 5.0), ("1E3 mV", 1.0),
     ("-2.5e-1 V", -0.25)],
)
def test_number_forms(text, volts):
    # Decimal and exponent notation as in Python's float() (the parser's own grammar).
    assert parse_quantity(text, "voltage") == pytest.approx(volts, rel=1e-12)


def test_plain_numbers_are_taken_as_si():
    assert parse_quantity(230, "voltage") == 230.0
    assert isinstance(parse_quantity(230, "voltage"), float)
    assert parse_quantity(0.0047, "capacitance") == 0.0047


# ------------------------------------------------------------------------------ rejection
@pytest.mark.parametrize(
    "text, dimension, expected_form",
    [
        ("20 V", "current", '"40 mA"'),
        ("4700 uV", "capacitance", '"4700 uF"'),
        ("10 VA", "voltage", '"230 V"'),  # apparent power is not a voltage
        ("470 F", "resistance", '"470 ohm"'),
        ("50 V", "frequency", '"50 Hz"'),
        ("45 K", "temperature", '"45 degC"'),
        ("1 mmin", "time", '"100 ms"'),  # "min" takes no prefix
        ("1 kh", "time", '"20000 h"'),  # nor does "h"
        ("1 k%", "ratio", '"10 %"'),  # nor does "%"
        ("5 mdegC", "temperature", '"45 degC"'),
        ("1 k", "ratio", '"10 %"'),  # a bare prefix is not a unit
        ("9,1 V", "voltage", '"230 V"'),  # decimal comma
        ("230", "voltage", '"230 V"'),  # text without a unit is ambiguous for a voltage
    ],
)
def test_wrong_unit_names_the_expected_form(text, dimension, expected_form):
    with pytest.raises(UnitError) as info:
        parse_quantity(text, dimension)
    message = str(info.value)
    assert expected_form in message
    assert "expected" in message


@pytest.mark.parametrize("text", ["V", "", "   ", "abc V", "inf V", "nan V", "1.2.3 V"])
def test_text_without_a_number_is_rejected(text):
    with pytest.raises(UnitError, match='expected "230 V"'):
        parse_quantity(text, "voltage")


@pytest.mark.parametrize("raw", [float("inf"), float("-inf"), float("nan"), "1e400 V",
                                 "1e308 kV"])
def test_non_finite_is_rejected(raw):
    # 1e400 and 1e308 * 1e3 overflow an IEEE 754 double (max about 1.8e308).
    with pytest.raises(UnitError, match="finite"):
        parse_quantity(raw, "voltage")


@pytest.mark.parametrize("raw", [True, False])
def test_bools_are_rejected_not_read_as_one_and_zero(raw):
    # bool is a subclass of int in Python; a TOML true must not become 1 V.
    with pytest.raises(UnitError, match="true/false"):
        parse_quantity(raw, "voltage")


@pytest.mark.parametrize("raw", [None, [1.0], {"value": 1.0}, b"5 V"])
def test_other_types_are_rejected_with_the_type_name(raw):
    with pytest.raises(UnitError) as info:
        parse_quantity(raw, "voltage")
    assert type(raw).__name__ in str(info.value)
    assert '"230 V"' in str(info.value)


def test_unit_error_is_a_value_error():
    # pydantic turns ValueError raised in validators into field errors; the spec relies on it.
    assert issubclass(UnitError, ValueError)


# ------------------------------------------------------------------------------ formatting
@pytest.mark.parametrize(
    "value, unit, text",
    [
        (207.0, "V", "207 V"),
        # C-MAINS [SEDRA-SMITH]: 325.27 V, 4 significant digits
        (math.sqrt(2) * 230.0, "V", "325.3 V"),
        (0.045, "A", "45 mA"),
        (-0.005, "A", "-5 mA"),
        (0.112, "W", "112 mW"),  # W2 [SEDRA-SMITH]: P_Z,max = 112 mW
        (470.0, "ohm", "470 \u03a9"),
        (2200.0, "ohm", "2.2 k\u03a9"),
        (1e6, "ohm", "1 M\u03a9"),
        (76.32254, "ohm", "76.32 \u03a9"),
        (100.0, "Hz", "100 Hz"),
        (3.0, "VA", "3 VA"),
        (1e-7, "F", "100 nF"),
        (1.5, "F", "1.5 F"),
        (0.0, "V", "0 V"),
    ],
)
def test_format_with_engineering_prefix(value, unit, text):
    assert format_quantity(value, unit) == text


@pytest.mark.parametrize("value, text", [(0.0047, "4700 \u00b5F"), (4.7e-6, "4.7 \u00b5F"),
                                         (2.2e-3, "2200 \u00b5F")])
def test_capacitance_between_1_uF_and_1_F_is_shown_in_microfarads(value, text):
    # Electrolytics are marked in uF (common practice, no source); format_quantity's docstring
    # states this rule.
    assert format_quantity(value, "F") == text


@pytest.mark.parametrize(
    "value, unit, text",
    [
        (0.1, "%", "10 %"),
        (0.0006, "%/degC", "0.06 %/\u00b0C"),
        (45.0, "degC", "45 \u00b0C"),
        (7200.0, "h", "2 h"),  # 7200 s = 2 h (SI Brochure Table 8, from memory)
        (20.0, "K", "20 K"),
        (1.8, "", "1.8"),
        (3.75, "A2s", "3.75 A\u00b2s"),
    ],
)
def test_format_units_without_prefix(value, unit, text):
    assert format_quantity(value, unit) == text


def test_format_radians_adds_degrees():
    # C-RIPPLE ([SEDRA-SMITH], derived): arccos(0.98) = 0.2003 rad; 0.2003 rad * 180/pi = 11.5
    # degrees.
    theta = math.acos(1 - 2.0 / 100.0)
    assert format_quantity(theta, "rad") == f"0.2003 rad ({round(theta * 180 / math.pi, 1)}\u00b0)"


@pytest.mark.parametrize(
    "value, unit, text",
    [(0.99996, "V", "1 V"), (999.96, "V", "1 kV"), (999.4, "V", "999.4 V"),
     (0.9994, "V", "999.4 mV")],
)
def test_rounding_carries_into_the_next_prefix(value, unit, text):
    # At 4 significant digits 999.96 rounds to 1000, which must read "1 kV", not "1000 V".
    assert format_quantity(value, unit) == text


def test_format_none_is_a_dash():
    assert format_quantity(None, "V") == "\u2014"


@pytest.mark.parametrize(
    "text, dimension, unit",
    [("4.7 mF", "capacitance", "F"), ("2.2 kohm", "resistance", "ohm"), ("40 mA", "current", "A"),
     ("12.5 V", "voltage", "V"), ("250 mW", "power", "W")],
)
def test_format_then_parse_round_trips(text, dimension, unit):
    value = parse_quantity(text, dimension)
    shown = format_quantity(value, unit).replace("\u03a9", "ohm")
    assert parse_quantity(shown, dimension) == pytest.approx(value, rel=1e-12)
