"""Jinja templates and the report stylesheet (installed as the docgen.templates package)."""
