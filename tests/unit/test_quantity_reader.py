"""One quantity reader for the requirements file and the parts library: the same mistake gets
the same message from both, naming the file, the field and what was expected.

The expected texts are written here by hand (what a user should read); nothing is taken from
the reader's own output.
"""

from __future__ import annotations

import pytest

from docgen.errors import SpecError
from docgen.parts.library import parse_library
from docgen.quantity_reader import DecibelReader, QuantityReader
from docgen.spec import load_requirements
from docgen.starter import starter

LIBRARY = """schema = 1
[library]
name = "test"

[[capacitor]]
id = "C1"
capacitance = "3300 uF"
tolerance = "20 %"
voltage = "35 V"
ripple_current = "2.2 A"
ripple_temperature = "105 degC"
tan_delta = 0.12
life = "5000 h"
life_temperature = "105 degC"
price = 0.45

[[regulator]]
id = "U1"
kind = "fixed"
output_voltage = "5 V"
tolerance = "4 %"
dropout = "2 V"
i_max = "1 A"
i_q = "8 mA"
ripple_rejection = "62 dB"
v_in_max = "35 V"
t_j_max = "125 degC"
r_theta_jc = "5 K/W"
r_theta_ja = "50 K/W"
"""


def spec_issue(tmp_path, old: str, new: str, kind: str = "zener") -> tuple[str, str]:
    text = starter(kind)
    assert old in text
    path = tmp_path / "supply.toml"
    path.write_text(text.replace(old, new, 1), encoding="utf-8")
    with pytest.raises(SpecError) as info:
        load_requirements(path)
    err = info.value
    assert err.path == str(path) and len(err.issues) == 1, str(err)
    assert str(err).startswith(f"{path}: {err.issues[0].location}: ")
    return err.issues[0].location, err.issues[0].message


def library_issue(old: str, new: str, part: str = "C1") -> tuple[str, str]:
    assert old in LIBRARY
    with pytest.raises(SpecError) as info:
        parse_library(LIBRARY.replace(old, new, 1), "lib.toml")
    err = info.value
    assert err.path == "lib.toml" and len(err.issues) == 1, str(err)
    message = err.issues[0].message
    suffix = f" (part {part!r})"  # the library names the part; the rest is the shared text
    assert message.endswith(suffix)
    return err.issues[0].location, message[: -len(suffix)]


def test_a_negative_voltage_reads_the_same_in_both_files(tmp_path):
    where, spec_text = spec_issue(tmp_path, 'ripple_max = "50 mV"', 'ripple_max = "-50 mV"')
    assert where == "output[0].ripple_max"
    assert spec_text == "expected a positive voltage (greater than zero), got '-50 mV'"
    where, lib_text = library_issue('voltage = "35 V"', 'voltage = "-35 V"')
    assert where == "capacitor[0].voltage"
    assert lib_text == "expected a positive voltage (greater than zero), got '-35 V'"


def test_a_wrong_unit_reads_the_same_in_both_files(tmp_path):
    _, spec_text = spec_issue(tmp_path, 'ripple_max = "50 mV"', 'ripple_max = "50 uF"')
    _, lib_text = library_issue('voltage = "35 V"', 'voltage = "35 uF"')
    expected = ("unit 'uF' is not a voltage unit; expected \"230 V\", \"9.1 V\" or a number "
                "in volts")
    assert spec_text == lib_text == expected


def test_a_negative_current_where_zero_is_allowed(tmp_path):
    where, spec_text = spec_issue(tmp_path, 'load_min = "0 mA"', 'load_min = "-4 mA"')
    assert where == "output[0].load_min"
    assert spec_text == "expected zero or a positive current (not negative), got '-4 mA'"


def test_out_of_range_names_the_limit_in_the_field_unit(tmp_path):
    where, spec_text = spec_issue(tmp_path, 'ambient_max = "40 degC"',
                                  'ambient_max = "400 degC"')
    assert where == "environment.ambient_max"
    assert spec_text == ("expected at most 300 \u00b0C, the largest temperature docgen accepts "
                         "here, got '400 degC'")
    where, lib_text = library_issue('life_temperature = "105 degC"',
                                    'life_temperature = "400 degC"')
    assert where == "capacitor[0].life_temperature"
    assert lib_text == ("expected at most 250 \u00b0C, the largest temperature docgen accepts "
                        "here, got '400 degC'")


def test_a_percentage_written_as_a_plain_number_gets_the_same_hint(tmp_path):
    # output tolerance: up to 1000 % is read; 2000 written for 2000 % is not
    _, spec_text = spec_issue(tmp_path, 'tolerance = "10 %"', "tolerance = 2000")
    assert spec_text.startswith("expected at most 1000 %, the largest ratio docgen accepts")
    assert spec_text.endswith('got 2000; if 2000 is meant in percent, write "2000 %"')
    _, lib_text = library_issue('tolerance = "20 %"', "tolerance = 20")
    assert lib_text == ('expected at most 50 %, the largest ratio docgen accepts here, got 20; '
                        'if 20 is meant in percent, write "20 %"')


def test_decibels_read_the_same_in_both_files(tmp_path):
    spec_line = '# ripple_rejection = "60 dB"'
    where, spec_text = spec_issue(tmp_path, spec_line, 'ripple_rejection = "sixty"',
                                  "three-terminal")
    assert where == "output[0].linear.ripple_rejection"
    where, lib_text = library_issue('ripple_rejection = "62 dB"', 'ripple_rejection = "sixty"',
                                    "U1")
    assert where == "regulator[0].ripple_rejection"
    assert spec_text == lib_text == ('expected "60 dB" or a number of decibels, got \'sixty\'')
    _, spec_text = spec_issue(tmp_path, spec_line, 'ripple_rejection = "130 dB"',
                              "three-terminal")
    assert spec_text == ("expected at most 120 dB, the largest level docgen accepts here, "
                         "got '130 dB'")
    _, lib_text = library_issue('ripple_rejection = "62 dB"', 'ripple_rejection = "-6 dB"', "U1")
    assert lib_text == "expected a positive level in dB (greater than zero), got '-6 dB'"


class TestDecibelReader:
    @pytest.mark.parametrize("raw, value", [("60 dB", 60.0), ("60dB", 60.0), (" 0.5 ", 0.5),
                                            (60, 60.0), ("1e1 dB", 10.0)])
    def test_reads(self, raw, value):
        assert DecibelReader(sign="non-negative", high=120.0)(raw) == value

    @pytest.mark.parametrize("raw", ["60 db", "inf", "nan dB", "\uff16\uff10 dB", True, "6 0 dB"])
    def test_refuses(self, raw):
        with pytest.raises(ValueError, match="expected"):
            DecibelReader()(raw)

    def test_zero_only_where_allowed(self):
        assert DecibelReader(sign="non-negative")("0 dB") == 0.0
        with pytest.raises(ValueError, match="greater than zero"):
            DecibelReader()("0 dB")


class TestReader:
    def test_reads_text_and_plain_si_numbers(self):
        read = QuantityReader("capacitance", "F")
        assert read("4700 uF") == pytest.approx(4.7e-3, rel=1e-12)
        assert read(0.0047) == pytest.approx(4.7e-3, rel=1e-12)

    @pytest.mark.parametrize("sign, value, ok", [
        ("positive", "0 V", False), ("positive", "1 mV", True),
        ("non-negative", "0 V", True), ("non-negative", "-1 mV", False),
        ("any", "-5 V", True),
    ])
    def test_sign(self, sign, value, ok):
        read = QuantityReader("voltage", "V", sign=sign)
        if ok:
            read(value)
        else:
            with pytest.raises(ValueError, match="expected"):
                read(value)

    def test_bounds_are_inclusive_and_shown_in_the_field_unit(self):
        read = QuantityReader("tempco", "1/K", sign="any", low=-0.01, high=0.01)
        assert read("1 %/K") == pytest.approx(0.01)
        with pytest.raises(ValueError) as info:
            read("-2 %/K")
        assert str(info.value).startswith("expected at least -1 %/K, the smallest tempco")

    def test_a_hint_follows_the_given_value(self):
        read = QuantityReader("power", "W", high=1.0, hint=" (a note)")
        with pytest.raises(ValueError) as info:
            read("2 W")
        assert str(info.value).endswith("got '2 W' (a note)")

    def test_expects_is_the_shared_example_text(self):
        assert QuantityReader("current", "A").expects == ('"40 mA", "1.2 A" or a number in '
                                                          "amperes")

    def test_unknown_sign_is_refused(self):
        with pytest.raises(ValueError, match="sign"):
            QuantityReader("voltage", "V", sign="negative")


def test_a_misspelt_key_reads_the_same_in_both_files(tmp_path):
    """Both files name the unknown key and the nearest real one, in the same words."""
    _, spec_text = spec_issue(tmp_path, 'tolerance = "10 %"', 'tolerence = "10 %"')
    with pytest.raises(SpecError) as info:
        parse_library(LIBRARY.replace('tolerance = "20 %"', 'tolerence = "20 %"', 1), "lib.toml")
    lib_texts = [i.message for i in info.value.issues]
    assert spec_text == "unknown key 'tolerence'; did you mean 'tolerance'?"
    assert "unknown key 'tolerence'; did you mean 'tolerance'? (part 'C1')" in lib_texts


def test_a_missing_key_reads_the_same_in_both_files(tmp_path):
    """A required key left out: "required but missing" in both, the library adding what it takes."""
    where, spec_text = spec_issue(tmp_path, 'ripple_max = "50 mV"', "")
    assert (where, spec_text) == ("output[0].ripple_max", "required but missing")
    with pytest.raises(SpecError) as info:
        parse_library(LIBRARY.replace('voltage = "35 V"\n', "", 1), "lib.toml")
    (issue,) = info.value.issues
    assert issue.message.startswith("required but missing; expected ")
    assert issue.message.endswith("(part 'C1')")
