"""Jobs around the numerics: files and folders, one build, batches, incremental stamps, diffs.

build.py (one spec -> its output folder), output.py (atomic writes, locks, safe names),
incremental.py (stamps: skip a build whose inputs are unchanged), batch.py (several specs in
worker processes), diff_sides.py (the two computed sides, a file or a git revision),
diff_changes.py (what changed), diff_file.py (the HTML change report, written safely).
Nothing in the numerics imports this package.
"""
