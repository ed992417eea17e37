"""Insulation between the mains and the output: the facts a safety reviewer starts from.

The working voltage across the barrier is computed (a conservative bound: the mains and the
winding voltage added, the output's common taken as earthed). The insulation it needs follows
from the protection class and whether the output is an extra-low-voltage circuit; the
overvoltage category, pollution degree and material group are stated from the requirements file
or its defaults. Creepage and clearance distances are not computed: docgen holds no table whose
source it can name, so the document says what to look them up with.
"""

from __future__ import annotations

import math
from typing import Any

from .. import equations as eq
from ..cautions import SELV_AC_LIMIT, SELV_DC_LIMIT
from ..trace import Ledger
from .context import SizingContext

WRITES = ("insulation.",)
TITLE = "Insulation, mains to output"
INTRO = ("The working voltage across the barrier between the mains and the output circuit, for "
         "the safety review. It is an upper bound: the mains voltage and the winding's no-load "
         "voltage added, with the output's common taken as earthed. The insulation section "
         "states what the barrier needs and how to find its distances.")

# Where the insulation rules of this module come from (docs/references.md: [IEC61140],
# [IEC60664-1], [IEC62368-1]).
CLASS_SOURCE = "IEC 61140 protective provisions (from memory)"
CONDITIONS_SOURCE = "IEC 60664-1 insulation coordination (from memory)"
STANDARDS = "IEC 62368-1 or IEC 60664-1"


def record_insulation(ctx: SizingContext, L: Ledger) -> None:
    L.calc("insulation.v_work_rms", eq.WORKING_RMS, r"U_{w,rms}", "V",
           "Working voltage, mains to output (RMS, nominal mains, no load)",
           {"m": "mains.v_nom", "s": "transformer.v_nl"}, lambda m, s: m + s)
    L.calc("insulation.v_work_peak", eq.WORKING_PEAK, r"U_{w,pk}", "V",
           "Peak working voltage, mains to output (high line, no load)",
           {"m": "mains.v_high", "s": "transformer.v_high_nl"},
           lambda m, s: math.sqrt(2.0) * (m + s))


def output_is_elv(values: dict[str, Any]) -> bool:
    """True when the output side stays within the extra-low-voltage limits the cautions use."""
    return (values["reservoir.v_max"].value <= SELV_DC_LIMIT
            and values["transformer.v_high_nl"].value <= SELV_AC_LIMIT)


def barrier_facts(spec, values: dict[str, Any]) -> dict[str, Any]:
    """What the barrier needs, in words (no numbers: those are the traced values)."""
    ins = spec.insulation
    given = ins.model_fields_set
    elv = output_is_elv(values)
    cls = ins.equipment_class
    if elv and cls == "II":
        need = "double or reinforced"
        why = ("Class II equipment with an extra-low-voltage output that may be touched needs "
               "double or reinforced insulation between the mains and the output circuit, "
               "without reliance on protective earth.")
    elif elv:
        need = "double or reinforced, or basic with protective earthing"
        why = ("Class I equipment with an extra-low-voltage output needs double or reinforced "
               "insulation between the mains and the output circuit, or basic insulation with "
               "an earthed screen between the windings or the output circuit bonded to "
               "protective earth.")
    else:
        need = "double or reinforced" if cls == "II" else "basic with protective earthing"
        why = ("The output side exceeds the extra-low-voltage limits, so it is itself "
               f"hazardous: besides {need} insulation between the mains and the output "
               "circuit, the output must be guarded against contact like the mains side.")
    fields = type(ins).model_fields
    basis = {name: ("requirements file" if name in given else
                    "assumed (default): " + fields[name].json_schema_extra["default_source"])
             for name in ("equipment_class", "overvoltage_category", "pollution_degree",
                          "material_group")}
    return {
        "basis": basis,
        "equipment_class": cls,
        "equipment_class_given": "equipment_class" in given,
        "output_elv": elv,
        "insulation_needed": need,
        "insulation_reason": why,
        "insulation_source": CLASS_SOURCE,
        "overvoltage_category": ins.overvoltage_category,
        "overvoltage_category_given": "overvoltage_category" in given,
        "pollution_degree": ins.pollution_degree,
        "pollution_degree_given": "pollution_degree" in given,
        "material_group": ins.material_group,
        "material_group_given": "material_group" in given,
        "conditions_source": CONDITIONS_SOURCE,
        "distances_computed": False,
        "distances_standard": STANDARDS,
        "working_voltage_ids": ["insulation.v_work_rms", "insulation.v_work_peak"],
    }


def barrier_facts_basis(spec) -> str:
    """One sentence stating the conditions the insulation is looked up under, and their basis."""
    ins = spec.insulation
    given = ins.model_fields_set
    parts = [f"protection class {ins.equipment_class}",
             f"overvoltage category {ins.overvoltage_category}",
             f"pollution degree {ins.pollution_degree}", f"material group {ins.material_group}"]
    names = ("equipment_class", "overvoltage_category", "pollution_degree", "material_group")
    stated = [p for p, n in zip(parts, names, strict=True) if n in given]
    assumed = [p for p, n in zip(parts, names, strict=True) if n not in given]
    text = "The insulation is looked up for " + ", ".join(parts) + "."
    if stated:
        text += " Stated in the requirements file: " + ", ".join(stated) + "."
    if assumed:
        text += (" Assumed by default (common practice; state them in [insulation] when they "
                 "differ): " + ", ".join(assumed) + ".")
    return text
