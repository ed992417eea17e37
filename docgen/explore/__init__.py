"""Design-space search: every combination of approved parts, verified by the waveform engine.

The greedy sizing of docgen.pipeline picks, stage by stage, the cheapest part that meets the
hand estimate and raises floors where the engine finds it short. This package instead
enumerates the library's combinations of transformer, rectifier, capacitor and regulator parts
(``space``), drops those that fail a cheap necessary condition (``bounds``), sizes the rest with
the pipeline's own stages and verifies them at their worst corners in one engine call per batch
(``batch``), and ranks the feasible ones (``objectives``, ``search``). The greedy design is
always a candidate, so the search never returns a worse design than ``docgen build``.
The command line is docgen/cli/explore.py; nothing heavy is imported here, so the CLI starts fast.
"""

DEFAULT_BUDGET = 2000  # candidates verified by the engine at most
