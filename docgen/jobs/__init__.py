"""Jobs around the numerics: files and folders, one build, batches, incremental stamps, diffs.

Nothing in the numerics imports this package.
"""
