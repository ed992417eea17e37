"""Sizing stages, one module per block. Each is a small function (spec, ledger) -> values.

Stages run in the order listed in docgen.pipeline; a stage reads only values recorded by
earlier stages, so the flow stays one-directional and every number has a trace.
"""
