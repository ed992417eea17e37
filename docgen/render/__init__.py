"""Backends that turn a Design into files: results.json, HTML, PDF, plots."""
