"""Requirements file: models and loader."""

from .loader import LoadedSpec, load_requirements
from .requirements import Requirements

__all__ = ["LoadedSpec", "Requirements", "load_requirements"]
