"""Requirements file: models and loader."""

from .loader import LoadedSpec, load_requirements
from .output import Requirements

__all__ = ["LoadedSpec", "Requirements", "load_requirements"]
