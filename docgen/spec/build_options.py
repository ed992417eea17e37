"""The analysis and parts sections: how the design is verified and where its parts come from."""

from __future__ import annotations

from pydantic import Field, field_validator

from ..units import show_raw
from .section import Section

MAX_SAMPLES = 10_000


class Analysis(Section):
    samples: int = Field(
        default=400, ge=0,
        description="Monte Carlo samples over the tolerances (0 turns Monte Carlo off).",
        json_schema_extra={"unit": "", "default_source": "common practice"},
    )
    seed: int = Field(
        default=1, ge=0, le=2**32 - 1,
        description="Seed of the Monte Carlo generator; the same seed repeats the same samples.",
        json_schema_extra={"unit": ""},
    )


    @field_validator("samples")
    @classmethod
    def _samples_bounded(cls, value: int) -> int:
        # Each sample is one steady-state waveform solve (about 1 ms); 10,000 already pins the
        # 1 % and 99 % points to a fraction of a percent, and keeps `docgen check` near 10 s.
        if value > MAX_SAMPLES:
            raise ValueError(f"expected at most {MAX_SAMPLES} Monte Carlo samples (about 1 ms "
                             f"each), got {show_raw(value)}")
        return value


class Parts(Section):
    library: str = Field(
        default="", max_length=400,
        description="Approved-parts library file, relative to the requirements file; when "
        "given, parts are picked from it instead of standard rating steps.",
    )
