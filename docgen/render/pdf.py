"""HTML -> PDF with WeasyPrint: shipped fonts, no network, attachments with fixed dates.

WeasyPrint's own options stay at their defaults; on the demo report (WeasyPrint 70, fontTools
subsetting) none of them makes the PDF faster: embedding whole fonts (``full_fonts``) doubles the
file, ``hinting`` adds a little to it and ``uncompressed_pdf`` makes it 4.5 times larger, each
for the same time within the noise. Font subsetting costs well under a second; the time goes
into layout and into drawing the formula and plot images (see bench/build.py).
"""

from __future__ import annotations

import contextlib
import datetime as _dt
import os
from pathlib import Path

from ..errors import RenderError

# The fonts come from matplotlib's own data folder (DejaVu, open licence), which every install
# of docgen has, so the PDF does not depend on the fonts of the machine.
FIXED_DATE = _dt.datetime(2000, 1, 1, tzinfo=_dt.timezone.utc)


def font_dir() -> Path:
    import matplotlib

    return Path(matplotlib.get_data_path()) / "fonts" / "ttf"


# Family names of our own: under the fonts' real names fontconfig may prefer a copy installed on
# the machine (another version), and the PDF would depend on the machine again.
SANS, MONO = "docgen DejaVu Sans", "docgen DejaVu Sans Mono"


def _font_css() -> str:
    d = font_dir()
    faces = [(SANS, "normal", "normal", "DejaVuSans.ttf"),
             (SANS, "bold", "normal", "DejaVuSans-Bold.ttf"),
             (SANS, "normal", "italic", "DejaVuSans-Oblique.ttf"),
             (SANS, "bold", "italic", "DejaVuSans-BoldOblique.ttf"),
             (MONO, "normal", "normal", "DejaVuSansMono.ttf"),
             (MONO, "bold", "normal", "DejaVuSansMono-Bold.ttf")]
    rules = [
        f'@font-face {{ font-family: "{fam}"; font-weight: {w}; font-style: {s}; '
        f'src: url("{(d / f).as_uri()}"); }}'
        for fam, w, s, f in faces
    ]
    # WeasyPrint applies these as user rules, which lose to the report's own (author) rules
    # unless important.
    rules.append(f'html {{ font-family: "{SANS}" !important; }}')
    rules.append(f'.mono, .vid, .eqid, pre, code, kbd, samp {{ font-family: "{MONO}" '
                 '!important; }')
    return "\n".join(rules)


def _fetcher():
    import weasyprint

    allowed_root = font_dir().resolve()

    class LocalOnlyFetcher(weasyprint.URLFetcher):
        """Fetches data: URIs and the shipped fonts only; nothing from the network."""

        def fetch(self, url, headers=None):
            if url.startswith("data:"):
                return super().fetch(url, headers)
            if url.startswith("file:"):
                from urllib.parse import unquote, urlparse

                path = Path(unquote(urlparse(url).path)).resolve()
                if path.is_relative_to(allowed_root):
                    return super().fetch(url, headers)
            raise ValueError(f"docgen renders offline and refuses the resource {url!r}")

    return LocalOnlyFetcher()


@contextlib.contextmanager
def _fixed_font_timestamps():
    """Subset fonts carry a "modified" time; fontTools takes it from SOURCE_DATE_EPOCH when set
    (the reproducible-builds convention), else from the clock, which would make every PDF differ.
    A value the caller set is kept."""
    if "SOURCE_DATE_EPOCH" in os.environ:
        yield
        return
    os.environ["SOURCE_DATE_EPOCH"] = str(int(FIXED_DATE.timestamp()))
    try:
        yield
    finally:
        os.environ.pop("SOURCE_DATE_EPOCH", None)


def render_pdf(html: str, attachments: dict[str, bytes], title: str) -> bytes:
    try:
        import weasyprint
    except ImportError as exc:  # pragma: no cover - weasyprint is a dependency
        raise RenderError(f"WeasyPrint is not available: {exc}") from None
    fetcher = _fetcher()
    files = [
        weasyprint.Attachment(string=data, name=name, url_fetcher=fetcher,
                              created=FIXED_DATE, modified=FIXED_DATE,
                              description=name, relationship="Source")
        for name, data in attachments.items()
    ]
    from weasyprint.text.fonts import FontConfiguration

    # @font-face rules apply only through a font configuration given to both the stylesheet
    # and the writer; without it WeasyPrint silently takes the machine's fonts of that name.
    fonts = FontConfiguration()
    css = weasyprint.CSS(string=_font_css(), url_fetcher=fetcher, font_config=fonts)
    doc = weasyprint.HTML(string=html, url_fetcher=fetcher, base_url=None)
    import warnings

    with warnings.catch_warnings(), _fixed_font_timestamps():
        # WeasyPrint 70 opens its sRGB profile for the PDF/A output intent and leaves the file
        # to the garbage collector; that ResourceWarning is WeasyPrint's, not ours.
        warnings.simplefilter("ignore", ResourceWarning)
        return doc.write_pdf(stylesheets=[css], attachments=files, pdf_identifier=b"docgen",
                             uncompressed_pdf=False, font_config=fonts, **PDF_OPTIONS)


# Tagged PDF (structure for screen readers and reflow) as PDF/A-3b, the archival variant that
# keeps attachments (the requirements file and results.json travel inside the report).
PDF_OPTIONS = {"pdf_variant": "pdf/a-3b", "pdf_tags": True}
