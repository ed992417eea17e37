"""docgen: design documents for small mains-powered linear DC power supplies.

The public surface is small: load a requirements file, run the pipeline, render the outputs.
Heavy libraries (matplotlib, WeasyPrint, scipy) are imported only where they are used.
"""

__version__ = "0.1.0"

__all__ = ["__version__"]
