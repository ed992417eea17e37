"""Verification of a sized design: corners and Monte Carlo through the engine, checks, and the
refine loop that raises floors where a sized part falls short. Takes the requirements and the
ledger; returns data and never writes into another module's objects."""
