"""The commented starter requirements file printed by ``docgen new``. It builds as it is."""

STARTER = '''\
# docgen requirements file. Quantities take units ("230 V", "40 mA", "4700 uF", "10 %",
# "45 degC") or plain SI numbers. Lines starting with # are comments; a commented-out key
# takes the default shown. Field reference: docs/requirements.md.
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
# diode_drop = "1.0 V"                # per diode at the charging peaks

# [reservoir]                         # give capacitance + voltage_rating to fix the part
# tolerance = "20 %"
# ripple_fraction = "10 %"

[[output]]
name = "main rail"
voltage = "5.1 V"
tolerance = "10 %"
load_min = "0 mA"
load_max = "20 mA"
load_can_disconnect = true
ripple_max = "50 mV"                  # peak to peak
regulator = "zener"
# headroom = "3 V"                    # drop across the series resistor at the ripple trough

# [output.zener]
# tolerance = "5 %"
# knee_current = "1 mA"
# dynamic_resistance = "10 ohm"
# tempco = "0.06 %/degC"

# [margins]                           # derating: highest stress as a fraction of the rating
# capacitor_voltage_derating = "80 %"
# zener_power_derating = "50 %"
# resistor_power_derating = "50 %"
# diode_voltage_derating = "50 %"
# diode_current_derating = "50 %"
# warn_band = "5 %"
'''
