"""The whole requirements file: one model over the section models."""

from __future__ import annotations

from typing import Literal

from pydantic import Field, model_validator

from .build_options import Analysis, Parts
from .conditions import Environment, Mains
from .margins import Insulation, Margins, Protection
from .output import Output
from .power_stages import Rectifier, Reservoir, Transformer
from .project import Document, Project
from .section import Section


class Requirements(Section):
    """The whole requirements file."""

    schema_: Literal[1] = Field(alias="schema", description="File format version; write 1.")
    project: Project
    document: Document = Field(default_factory=Document)
    mains: Mains = Field(default_factory=Mains)
    environment: Environment = Field(default_factory=Environment)
    transformer: Transformer = Field(default_factory=Transformer)
    rectifier: Rectifier = Field(default_factory=Rectifier)
    reservoir: Reservoir = Field(default_factory=Reservoir)
    output: list[Output] = Field(min_length=1, max_length=2,
                                 description="The output rail; two for a split supply.")
    margins: Margins = Field(default_factory=Margins)
    protection: Protection = Field(default_factory=Protection)
    analysis: Analysis = Field(default_factory=Analysis)
    parts: Parts = Field(default_factory=Parts)
    insulation: Insulation = Field(default_factory=Insulation)

    @model_validator(mode="after")
    def _rails(self) -> Requirements:
        split = self.rectifier.topology == "split"
        polarities = sorted(o.polarity for o in self.output)
        if split and polarities != ["negative", "positive"]:
            raise ValueError("a split supply needs two [[output]] tables, one with polarity = "
                             "\"positive\" and one with polarity = \"negative\"")
        if not split and len(self.output) != 1:
            raise ValueError("only a split supply (rectifier.topology = \"split\") has two "
                             "outputs; give one [[output]] table")
        if not split and polarities != ["positive"]:
            raise ValueError("a single-rail supply is drawn positive; set polarity = "
                             "\"positive\" (or use rectifier.topology = \"split\")")
        return self
