"""The document's references: the publications a design's equations, cautions and assumptions
actually cite, numbered in order of first use.

The basis of a step is a publication only when one is named; definitions, identities, textbook
laws ("Ohm's law"), our own algebra and common practice are labelled as such where they are used
and get no reference entry. The keys match docs/references.md, where each source's trust and
check values are listed.
"""

from __future__ import annotations

import re
from typing import Any

# (key, citation printed in the document, pattern that finds it in a source text)
PUBLICATIONS: tuple[tuple[str, str, str], ...] = (
    ("SEDRA-SMITH", "A. S. Sedra, K. C. Smith, Microelectronic Circuits, rectifier and zener "
     "sections (Ch. 3 in the 5th ed. 2004; Ch. 4 in the 6th and 7th eds.)", r"Sedra"),
    ("SCHADE-1943", "O. H. Schade, \"Analysis of Rectifier Operation\", Proceedings of the "
     "I.R.E., vol. 31, no. 7, 1943", r"Schade"),
    ("ROSCOE-6.101", "R. Roscoe, 6.101 Introductory Analog Electronics Laboratory, MIT "
     "OpenCourseWare, 2007, sec. 10.2.3", r"Roscoe|6\.101"),
    ("HOROWITZ-HILL", "P. Horowitz, W. Hill, The Art of Electronics, 2nd ed. 1989 and 3rd ed. "
     "2015", r"Horowitz, W\. Hill|Art of Electronics"),
    ("IEC60038", "IEC 60038:2009, IEC standard voltages", r"IEC 60038"),
    ("ANSI-C84.1", "ANSI C84.1, Electric Power Systems and Equipment - Voltage Ratings (60 Hz)",
     r"ANSI C84\.1"),
    ("BSI-WES", "BSI, World Electricity Supplies, 5th ed., 1989", r"BSI World|World Electricity"),
    ("IEC60063", "IEC 60063:2015, Preferred number series for resistors and capacitors",
     r"IEC 60063"),
    ("IEC60127-2", "IEC 60127-2, Miniature fuses - Part 2: Cartridge fuse-links",
     r"IEC 60127"),
    ("IEC61558-2-6", "IEC 61558-2-6:2021, Safety of transformers - Part 2-6: safety isolating "
     "transformers", r"IEC 61558"),
    ("IEC62368-1", "IEC 62368-1:2018, Audio/video, information and communication technology "
     "equipment - Part 1: Safety requirements", r"IEC 62368"),
    ("IEC60950-1", "IEC 60950-1:2005, Information technology equipment - Safety", r"IEC 60950"),
    ("IEC60204-1", "IEC 60204-1, Safety of machinery - Electrical equipment of machines",
     r"IEC 60204"),
    ("IEC61140", "IEC 61140, Protection against electric shock - Common aspects for "
     "installation and equipment (from memory)", r"IEC 61140"),
    ("EN50160", "EN 50160, Voltage characteristics of electricity supplied by public "
     "distribution networks", r"EN 50160"),
)

_COMPILED = [(key, text, re.compile(pattern)) for key, text, pattern in PUBLICATIONS]


def cited_keys(source: str) -> list[str]:
    """Keys of the publications a source text names, in the order of the table."""
    return [key for key, _, rx in _COMPILED if rx.search(source or "")]


def basis_word(source: str) -> str:
    """A short label for a basis that is not a publication."""
    s = (source or "").lower()
    if "waveform engine" in s:
        return "waveform engine"
    if s.startswith("derived"):
        return "derived"
    if "common practice" in s:
        return "common practice"
    if any(w in s for w in ("definition", "identity", "'s law", "inequality", "any circuits",
                            "any physics")):
        return "definition"
    return "common practice" if not cited_keys(source) else ""


class Citations:
    """Numbers references in order of first use and remembers which were used."""

    def __init__(self) -> None:
        self.order: list[str] = []

    def cite(self, source: str) -> list[int]:
        numbers = []
        for key in cited_keys(source):
            if key not in self.order:
                self.order.append(key)
            numbers.append(self.order.index(key) + 1)
        return numbers

    def entries(self) -> list[dict[str, Any]]:
        texts = {key: text for key, text, _ in PUBLICATIONS}
        return [{"n": i + 1, "key": key, "text": texts[key]} for i, key in enumerate(self.order)]
