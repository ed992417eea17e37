"""The commented starter requirements file printed by ``docgen new``, one per regulator kind.

Each starter checks as it is (tests/e2e/test_cli_formats.py checks every kind): the output block
shows the fields that matter for that regulator, the rest of the file is shared.
"""

from __future__ import annotations

from .regulators import KINDS

REGULATORS = tuple(KINDS)  # every kind of the registry has a starter (a test holds it to that)

_HEAD = '''\
# docgen requirements file. Quantities take units ("230 V", "40 mA", "4700 uF", "10 %",
# "45 degC", "5 K/W", "60 dB") or plain SI numbers. Lines starting with # are comments; a
# commented-out key takes the default shown. Field reference: docs/requirements.md.
# Editors with a TOML language server can check this file against
# docs/schema/requirements.schema.json (see the README, "Editor support").
schema = 1

[project]
title = "New supply"                  # printed on the cover
document_id = "PSU-0001"
revision = "A"
# author = ""
# date = "2026-01-31"                 # printed as written; no clock is read

[mains]
nominal = "230 V"                     # RMS
frequency = "50 Hz"
# tolerance_low = "10 %"              # IEC 60038 supply range
# tolerance_high = "10 %"

[environment]
# ambient_min = "0 degC"
ambient_max = "40 degC"

# [transformer]                       # give secondary + va to analyse a transformer you have
# secondary = "12 V"                  # rated RMS at rated load
# va = "5 VA"
# regulation = "20 %"                 # (V_no-load - V_full-load) / V_full-load

[rectifier]
topology = "bridge"
# diode_type = "silicon"              # or "schottky" (sets the engine diode's defaults)
# diode_drop = "1.0 V"                # per diode at the charging peaks

# [reservoir]                         # give capacitance + voltage_rating to fix the part
# tolerance = "20 %"
# ripple_fraction = "10 %"
'''

_OUTPUTS = {
    "zener": '''
[[output]]
name = "main rail"
voltage = "5.1 V"
tolerance = "10 %"
load_min = "0 mA"
load_max = "20 mA"
load_can_disconnect = true
ripple_max = "50 mV"                  # peak to peak
regulator = "zener"                   # shunt zener fed through a series resistor
# headroom = "3 V"                    # drop across the series resistor at the ripple trough

[output.zener]
tolerance = "2 %"                     # a 2 % grade keeps a 10 % rail inside its limits
tempco = "0.01 %/degC"                # near zero around 5 V (the default suits zeners above 6 V)
# knee_current = "1 mA"
# dynamic_resistance = "10 ohm"
''',
    "follower": '''
[[output]]
name = "main rail"
voltage = "12 V"
tolerance = "10 %"
load_min = "20 mA"
load_max = "500 mA"
load_can_disconnect = false
ripple_max = "100 mV"                 # peak to peak
regulator = "follower"                # zener-referenced emitter follower
headroom = "2.5 V"                    # collector-emitter drop at the ripple trough

[output.zener]                        # the reference zener
tolerance = "2 %"                     # a 5 % part with its tempco and self-heating leaves no
tempco = "0.05 %/degC"                # room in a 10 % window at 12 V
# dynamic_resistance = "10 ohm"

[output.transistor]                   # the NPN pass transistor
h_fe_min = 40                         # least current gain at the load current
# v_be = "0.7 V"
# t_j_max = "150 degC"
# theta_jc = "3 K/W"
# theta_ja = "62.5 K/W"               # without a heat sink
# theta_cs = "0.5 K/W"
''',
    "three-terminal": '''
[[output]]
name = "main rail"
voltage = "5 V"
tolerance = "8 %"
load_min = "0 mA"
load_max = "150 mA"
load_can_disconnect = true
ripple_max = "10 mV"                  # peak to peak
regulator = "three-terminal"          # fixed-voltage three-terminal regulator

[output.linear]
dropout = "2 V"
tolerance = "4 %"
# ripple_rejection = "60 dB"
# v_in_max = "35 V"
# quiescent_current = "6 mA"
# t_j_max = "125 degC"
# theta_jc = "5 K/W"
# theta_ja = "50 K/W"                 # without a heat sink
''',
    "adjustable": '''
[[output]]
name = "main rail"
voltage = "9 V"
tolerance = "8 %"
load_min = "0 mA"
load_max = "150 mA"
load_can_disconnect = true
ripple_max = "10 mV"                  # peak to peak
regulator = "adjustable"              # adjustable regulator set by a resistor divider

[output.linear]
reference = "1.25 V"                  # between output and adjust pins
tolerance = "4 %"                     # of the reference
# adjust_current = "50 uA"
# min_load = "5 mA"                   # taken by the divider
# dropout = "2 V"
# ripple_rejection = "60 dB"
# theta_ja = "50 K/W"
''',
    "dropper": '''
[[output]]
name = "main rail"
voltage = "12 V"                      # at full load
tolerance = "40 %"                    # the output follows the mains and the reservoir ripple
load_min = "90 mA"                    # a nearly constant load (relay coils, LEDs, a fan)
load_max = "100 mA"
load_can_disconnect = false
ripple_max = "1.5 V"                  # peak to peak
regulator = "dropper"                 # a series resistor drops the reservoir voltage
headroom = "2 V"                      # least drop across the resistor at the ripple trough
''',
    "none": '''
[[output]]
name = "main rail"
voltage = "12 V"                      # nominal reservoir voltage at full load
tolerance = "40 %"                    # an unregulated rail moves with the mains and the load
load_min = "60 mA"
load_max = "100 mA"
load_can_disconnect = false
ripple_max = "2 V"                    # peak to peak, straight from the reservoir
regulator = "none"                    # the reservoir voltage is the output
''',
}

_TAIL = '''
# [margins]                           # derating: highest stress as a fraction of the rating
# capacitor_voltage_derating = "80 %"
# zener_power_derating = "50 %"
# resistor_power_derating = "50 %"
# diode_voltage_derating = "50 %"
# diode_current_derating = "50 %"
# warn_band = "5 %"
'''


def starter(regulator: str = "zener") -> str:
    """The starter file for one regulator kind (see REGULATORS)."""
    if regulator not in _OUTPUTS:
        raise ValueError(f"unknown regulator kind {regulator!r}; expected one of "
                         f"{', '.join(REGULATORS)}")
    return _HEAD + _OUTPUTS[regulator] + _TAIL


STARTER = starter("zener")
