"""The parts-library file: loading, SI conversion and the error report for bad files."""

from __future__ import annotations

import hashlib
import math
from pathlib import Path

import pytest

from docgen.errors import SpecError
from docgen.parts import eseries
from docgen.parts.library import (
    Bridge,
    Capacitor,
    Resistor,
    ResistorFamily,
    load_library,
    parse_library,
)

DEMO = Path(__file__).resolve().parents[2] / "specs" / "parts" / "demo-parts.toml"

HEADER = 'schema = 1\n[library]\nname = "test"\n'

CAPACITOR = """
[[capacitor]]
id = "C-3300U35"
capacitance = "3300 uF"
tolerance = "20 %"
voltage = "35 V"
ripple_current = "2.2 A"
ripple_temperature = "105 degC"
tan_delta = 0.12
life = "5000 h"
life_temperature = "105 degC"
price = 0.45
"""


def problems(text: str, name: str = "lib.toml") -> SpecError:
    with pytest.raises(SpecError) as info:
        parse_library(text, name)
    return info.value


def locations(error: SpecError) -> list[str]:
    return [issue.location for issue in error.issues]


class TestDemoLibrary:
    def test_loads_with_every_kind(self):
        lib = load_library(DEMO)
        counts = {kind: len(lib.parts(kind)) for kind in
                  ("transformer", "diode", "bridge", "capacitor", "zener", "resistor",
                   "transistor", "regulator", "fuse", "heatsink")}
        assert all(n >= 3 for n in counts.values()), counts
        assert counts["capacitor"] >= 14 and counts["zener"] >= 10 and counts["fuse"] >= 8

    def test_header_marks_demo_data(self):
        text = DEMO.read_text(encoding="utf-8")
        assert text.startswith("# DEMO DATA: invented part ids and typical ratings, "
                               "not real products")
        assert "DEMO DATA" in load_library(DEMO).info.source

    def test_sha256_is_of_the_file_bytes(self):
        lib = load_library(DEMO)
        assert lib.sha256 == hashlib.sha256(DEMO.read_bytes()).hexdigest()
        changed = parse_library(DEMO.read_bytes() + b"\n# edited\n", DEMO)
        assert changed.sha256 != lib.sha256

    def test_ids_are_unique(self):
        ids = [part.id for part in load_library(DEMO)]
        assert len(ids) == len(set(ids))

    def test_center_tapped_parts_state_the_whole_winding(self):
        lib = load_library(DEMO)
        part = lib.get("DP-TRF-10VA-2x12V")
        assert part.center_tapped and part.secondary_voltage == 24.0 and part.half_voltage == 12.0

    def test_family_member_lookup(self):
        lib = load_library(DEMO)
        member = lib.get("DP-RES-E24-0W25-4K7")
        assert isinstance(member, Resistor)
        assert member.resistance == 4700.0 and member.family == "DP-RES-E24-0W25"
        with pytest.raises(KeyError, match="did you mean"):
            lib.get("DP-RES-E24-0W25-4K8")  # 4.8 k is not an E24 value
        with pytest.raises(KeyError, match="DP-CAP-3300U35"):
            lib.get("DP-CAP-3300U53")


class TestSIValues:
    def test_capacitor(self):
        cap = parse_library(HEADER + CAPACITOR).capacitors[0]
        assert isinstance(cap, Capacitor)
        assert math.isclose(cap.capacitance, 3300e-6, rel_tol=1e-12)
        assert cap.tolerance == pytest.approx(0.20)
        assert cap.voltage == 35.0 and cap.ripple_current == 2.2
        assert cap.ripple_temperature_c == 105.0 and cap.life_temperature_c == 105.0
        assert cap.life == 5000 * 3600.0  # hours are stored as seconds
        # ESR from the dissipation factor: tan d / (2 pi f C) (common practice, no source;
        # [CP-ESR] check C-ESR, docs/references.md: 0.10, 120 Hz, 4700 uF -> 28.2 mohm).
        check = cap.model_copy(update={"tan_delta": 0.10, "capacitance": 4700e-6})
        assert check.esr_at(120.0) == pytest.approx(0.0282, abs=0.00005)

    def test_plain_numbers_are_si(self):
        text = CAPACITOR.replace('"3300 uF"', "0.0033").replace('"35 V"', "35")
        cap = parse_library(HEADER + text).capacitors[0]
        assert cap.capacitance == 0.0033 and cap.voltage == 35.0

    def test_every_kind_in_si(self):
        lib = load_library(DEMO)
        trf = lib.get("DP-TRF-15VA-12V")
        assert (trf.secondary_voltage, trf.va, trf.regulation) == (12.0, 15.0, 0.16)
        # Full-load regulation convention ([CP-REGULATION]): V_NL = V_FL (1 + Reg).
        assert trf.no_load_voltage == pytest.approx(12.0 * 1.16)
        assert trf.rated_current == pytest.approx(1.25)
        toroid = lib.get("DP-TRF-30VA-24V")
        assert toroid.regulation is None and toroid.winding_resistance == 2.2
        bridge = lib.get("DP-BR-1A-100V")
        assert isinstance(bridge, Bridge)
        assert (bridge.v_rrm, bridge.i_f_avg, bridge.i_fsm, bridge.v_f, bridge.i2t) == (
            100.0, 1.0, 30.0, 1.0, 3.7)
        zener = lib.get("DP-Z-12V-1W3")
        assert zener.tempco == pytest.approx(0.075e-2)
        assert zener.knee_current == pytest.approx(0.25e-3)
        assert zener.power_reference == "lead" and zener.t_j_max_c == 175.0
        fam = lib.get("DP-RES-E12-2W")
        assert isinstance(fam, ResistorFamily)
        assert fam.minimum == 1.0 and fam.maximum == 470e3 and fam.series == "E12"
        # 1 ohm .. 470 kohm in E12: five whole decades (60 values) + 100k..470k (9 values).
        assert len(fam.values()) == 5 * 12 + 9
        assert all(eseries.is_preferred(v, "E12") for v in fam.values())
        q = lib.get("DP-Q-NPN-60V-3A")
        assert (q.v_ceo, q.i_c_max, q.p_tot, q.h_fe_min, q.r_theta_jc) == (60.0, 3.0, 40.0, 25, 3.1)
        reg = lib.get("DP-REG-PADJ-1A5")
        assert reg.type == "adjustable" and reg.reference_voltage == 1.25
        assert reg.adjust_current == pytest.approx(100e-6) and reg.ripple_rejection_db == 65.0
        neg = lib.get("DP-REG-N12-1A")
        assert neg.polarity == "negative" and neg.output_voltage == 12.0
        fuse = lib.get("DP-F-T160MA")
        assert fuse.current == pytest.approx(0.16) and fuse.characteristic == "T"
        assert lib.get("DP-HS-7KW").r_theta_sa == 7.0
        cap = lib.get("DP-CAP-2200U25")
        assert cap.diameter == pytest.approx(0.0125) and cap.height == pytest.approx(0.025)

    def test_zener_power_derating(self):
        # W6 of docs/references.md ([CP-ZENER], derived, illustrative inputs): R_thJL = 80 K/W,
        # T_J,max = 175 degC,
        # full power to T_L = 95 degC -> 1.00 W; at T_L = 135 degC -> 0.50 W.
        text = HEADER + """
[[zener]]
id = "Z1"
voltage = "10 V"
tolerance = "5 %"
power = "1 W"
power_reference = "lead"
power_reference_temperature = "95 degC"
t_j_max = "175 degC"
r_theta = "80 K/W"
knee_current = "1 mA"
test_current = "25 mA"
dynamic_resistance = "7 ohm"
tempco = "0.05 %/K"
"""
        z = parse_library(text).zeners[0]
        assert z.power_at(95.0) == pytest.approx(1.00)
        assert z.power_at(135.0) == pytest.approx(0.50)
        assert z.power_at(25.0) == 1.0  # never above the rated power
        assert z.power_at(200.0) == 0.0


class TestErrors:
    def test_wrong_unit_names_file_field_and_expectation(self):
        err = problems(HEADER + CAPACITOR.replace('"35 V"', '"35 uF"'), "my-parts.toml")
        assert locations(err) == ["capacitor[0].voltage"]
        text = str(err)
        assert text.startswith("my-parts.toml: capacitor[0].voltage:")
        assert "'uF' is not a voltage unit" in text and "volts" in text
        assert "C-3300U35" in text

    def test_negative_value(self):
        err = problems(HEADER + CAPACITOR.replace('"2.2 A"', '"-2.2 A"'))
        assert locations(err) == ["capacitor[0].ripple_current"]
        assert "positive current" in str(err)

    def test_unknown_key_gets_a_suggestion(self):
        err = problems(HEADER + CAPACITOR.replace("ripple_current", "ripple_curent"))
        assert "capacitor[0].ripple_curent" in locations(err)
        assert "did you mean 'ripple_current'?" in str(err)
        # The real field is then missing, and said so in the same report.
        assert "capacitor[0].ripple_current" in locations(err)

    def test_unknown_table_gets_a_suggestion(self):
        err = problems(HEADER + CAPACITOR.replace("[[capacitor]]", "[[capacitors]]"))
        assert locations(err) == ["capacitors"]
        assert "did you mean 'capacitor'?" in str(err)

    def test_missing_field_says_what_is_expected(self):
        err = problems(HEADER + CAPACITOR.replace('voltage = "35 V"\n', ""))
        assert locations(err) == ["capacitor[0].voltage"]
        assert "missing" in str(err) and "volts" in str(err)

    def test_duplicate_id(self):
        err = problems(HEADER + CAPACITOR + CAPACITOR)
        assert locations(err) == ["capacitor[1].id"]
        assert "duplicate id 'C-3300U35'" in str(err) and "capacitor[0].id" in str(err)

    def test_all_problems_are_reported_together(self):
        text = (HEADER
                + CAPACITOR.replace('"35 V"', '"35 uF"').replace("tan_delta", "tan_delat")
                + CAPACITOR.replace('"3300 uF"', '"-1 uF"')
                + '[[fuse]]\nid = "F1"\ncharacteristic = "slow"\ncurrent = "1 A"\n'
                  'voltage = "250 V"\ni2t = "6 A2s"\n'
                + "[[heatsink]]\nid = \"HS\"\n")
        err = problems(text)
        locs = locations(err)
        assert "capacitor[0].voltage" in locs
        assert "capacitor[0].tan_delat" in locs
        assert "capacitor[0]" in locs  # then neither esr nor tan_delta is given
        assert "capacitor[1].capacitance" in locs and "capacitor[1].id" in locs
        assert "fuse[0].characteristic" in locs
        assert "heatsink[0].r_theta_sa" in locs
        assert str(err).startswith(f"lib.toml: {len(locs)} problems")

    def test_percent_written_as_a_plain_number(self):
        err = problems(HEADER + CAPACITOR.replace('"20 %"', "20"))
        assert locations(err) == ["capacitor[0].tolerance"]
        assert 'write "20 %"' in str(err)

    def test_choice_gets_a_suggestion(self):
        text = HEADER + """
[[regulator]]
id = "U1"
kind = "fixd"
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
        err = problems(text)
        assert locations(err) == ["regulator[0].kind"]
        assert "did you mean 'fixed'?" in str(err)

    def test_cross_field_rules(self):
        text = HEADER + """
[[regulator]]
id = "U1"
kind = "adjustable"
tolerance = "4 %"
dropout = "3 V"
i_max = "1.5 A"
ripple_rejection = 65
t_j_max = "125 degC"
r_theta_jc = "5 K/W"
r_theta_ja = "50 K/W"

[[transformer]]
id = "T1"
secondary_voltage = "12 V"
va = "10 VA"
"""
        err = problems(text)
        assert locations(err) == ["regulator[0]", "transformer[0]"]
        text = str(err)
        assert "reference_voltage" in text and "adjust_current" in text and "v_in_max" in text
        assert "regulation" in text and "winding_resistance" in text

    def test_resistor_family_rules(self):
        family = ('[[resistor]]\nid = "RF"\nseries = "E24"\nmin = "10 ohm"\nmax = "1 ohm"\n'
                  'tolerance = "1 %"\npower = "0.25 W"\nmax_voltage = "250 V"\n')
        err = problems(HEADER + family)
        assert locations(err) == ["resistor[0]"] and "below min" in str(err)
        err = problems(HEADER + family.replace('"E24"', '"E25"'))
        assert locations(err) == ["resistor[0].series"]
        both = family.replace('min = "10 ohm"', 'resistance = "10 ohm"\nmin = "1 ohm"')
        err = problems(HEADER + both)
        assert "either one part" in str(err)

    def test_header_problems(self):
        err = problems('schema = 2\n[library]\nnam = "x"\n')
        assert locations(err) == ["schema", "library.name", "library.nam"]
        assert "did you mean 'name'?" in str(err)
        err = problems(CAPACITOR)
        assert locations(err) == ["schema", "library"]

    def test_not_an_array_of_tables(self):
        err = problems(HEADER + CAPACITOR.replace("[[capacitor]]", "[capacitor]"))
        assert locations(err) == ["capacitor"] and "[[capacitor]]" in str(err)

    def test_bad_toml_and_missing_file(self, tmp_path):
        err = problems(HEADER + "voltage = = 3\n", "broken.toml")
        assert str(err).startswith("broken.toml: not valid TOML")
        with pytest.raises(SpecError, match="cannot read the parts library"):
            load_library(tmp_path / "nope.toml")

    def test_quoted_flag_is_refused(self):
        text = HEADER + """
[[transformer]]
id = "T1"
secondary_voltage = "24 V"
center_tapped = "yes"
va = "10 VA"
regulation = "20 %"
"""
        err = problems(text)
        assert locations(err) == ["transformer[0].center_tapped"]
        assert "true or false" in str(err)

    def test_out_of_range_values_are_shown_in_the_field_unit(self):
        text = HEADER + """
[[zener]]
id = "Z1"
voltage = "5.1 V"
tolerance = "5 %"
power = "0.5 W"
power_reference = "leads"
power_reference_temperature = "25 degC"
t_j_max = "900 degC"
r_theta = "300 K/W"
knee_current = "1 mA"
test_current = "5 mA"
dynamic_resistance = "40 ohm"
tempco = "5 %/K"
"""
        err = problems(text)
        assert locations(err) == ["zener[0].power_reference", "zener[0].t_j_max",
                                  "zener[0].tempco"]
        text = str(err)
        assert "did you mean 'lead'?" in text
        assert "at most 250 °C" in text and "at most 1 %/K" in text
