"""The project and document sections: what the cover and the review block print."""

from __future__ import annotations

from pydantic import Field

from .section import Section


class Project(Section):
    title: str = Field(min_length=1, max_length=200, description="Title printed on the cover.")
    document_id: str = Field(min_length=1, max_length=60, description="Document number.")
    revision: str = Field(default="A", max_length=20, description="Document revision.")
    author: str = Field(default="", max_length=120, description="Author or team.")
    date: str = Field(
        default="",
        max_length=40,
        description="Issue date printed on the cover (kept as written; no clock is read, "
        "so the same file gives the same document).",
    )
    description: str = Field(default="", max_length=2000, description="What the supply feeds.")
    demo: bool = Field(default=False, description="Marks the file as invented demo data.")


class Revision(Section):
    revision: str = Field(min_length=1, max_length=20, description="Revision letter or number.")
    date: str = Field(default="", max_length=40, description="Date of the revision, as written.")
    author: str = Field(default="", max_length=120, description="Who made the revision.")
    text: str = Field(default="", max_length=1000, description="What changed.")


class Document(Section):
    """Review data printed on the cover: status, sign-off and revision history. Every field is
    optional; an empty name or date is printed as a blank line to sign on."""

    status: str = Field(default="draft", max_length=40,
                        description="Document status printed on the cover (e.g. draft, for "
                        "review, released).")
    prepared_by: str = Field(default="", max_length=120, description="Name of the preparer.")
    prepared_date: str = Field(default="", max_length=40, description="Date prepared.")
    checked_by: str = Field(default="", max_length=120, description="Name of the checker.")
    checked_date: str = Field(default="", max_length=40, description="Date checked.")
    approved_by: str = Field(default="", max_length=120, description="Name of the approver.")
    approved_date: str = Field(default="", max_length=40, description="Date approved.")
    revisions: list[Revision] = Field(
        default_factory=list, max_length=200,
        description="Revision history ([[document.revisions]] tables); commits of the file in "
        "a git repository are listed beside them.")
    git_history: bool = Field(default=True, description="List the git commits that touched "
                              "the requirements file when it is in a git repository.")
