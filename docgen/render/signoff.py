"""The cover's review data: the sign-off block and the revision history.

Names and dates come from the requirements file ([document]); an absent one stays a blank line
to sign on, never a guess. The history joins the revisions written in the file with the git
commits that touched the file, when it lies in a git repository and git is installed; without
git the file's own revisions stand alone and the build goes on.
"""

from __future__ import annotations

import subprocess
from pathlib import Path
from typing import Any

GIT_TIMEOUT_S = 5.0
GIT_MAX_COMMITS = 30
_SEP = "\x1f"


def signoff_rows(spec: Any) -> list[dict[str, str]]:
    doc = spec.document
    return [{"role": role, "name": name, "date": date}
            for role, name, date in (("Prepared", doc.prepared_by, doc.prepared_date),
                                     ("Checked", doc.checked_by, doc.checked_date),
                                     ("Approved", doc.approved_by, doc.approved_date))]


def git_commits(spec_path: str | Path) -> list[dict[str, str]]:
    """Commits that touched the file, newest first; empty when git or a repository is absent."""
    path = Path(spec_path)
    if not path.is_file():
        return []
    cmd = ["git", "log", "--follow", f"--max-count={GIT_MAX_COMMITS}", "--date=short",
           f"--format=%h{_SEP}%ad{_SEP}%an{_SEP}%s", "--", path.name]
    try:
        proc = subprocess.run(cmd, cwd=path.parent, capture_output=True, text=True,
                              timeout=GIT_TIMEOUT_S, check=False)
    except (OSError, subprocess.SubprocessError):  # git not installed, or it hung
        return []
    if proc.returncode != 0:  # not a repository, or the file is not tracked
        return []
    out = []
    for line in proc.stdout.splitlines():
        fields = line.split(_SEP)
        if len(fields) == 4:
            out.append({"commit": fields[0], "date": fields[1], "author": fields[2],
                        "text": fields[3]})
    return out


def revision_history(spec: Any, spec_path: str | Path) -> dict[str, list[dict[str, str]]]:
    """The file's own revisions (as written) and the git commits of the file."""
    revisions = [{"revision": r.revision, "date": r.date, "author": r.author, "text": r.text}
                 for r in spec.document.revisions]
    commits = git_commits(spec_path) if spec.document.git_history else []
    return {"revisions": revisions, "commits": commits}
