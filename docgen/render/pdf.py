"""HTML -> PDF with WeasyPrint: shipped fonts, no network, attachments with fixed dates.

WeasyPrint's own options stay at their defaults; on the demo report (WeasyPrint 70, fontTools
subsetting) none of them makes the PDF faster: embedding whole fonts (``full_fonts``) doubles the
file, ``hinting`` adds a little to it and ``uncompressed_pdf`` makes it 4.5 times larger, each
for the same time within the noise. Font subsetting costs well under a second; the time goes
into layout and into drawing the formula and plot images (see bench/build.py).
"""

from __future__ import annotations

import datetime as _dt
from pathlib import Path

from ..errors import RenderError

# The fonts come from matplotlib's own data folder (DejaVu, open licence), which every install
# of docgen has, so the PDF does not depend on the fonts of the machine.
FIXED_DATE = _dt.datetime(2000, 1, 1, tzinfo=_dt.timezone.utc)


def font_dir() -> Path:
    import matplotlib

    return Path(matplotlib.get_data_path()) / "fonts" / "ttf"


def _font_css() -> str:
    d = font_dir()
    faces = [("DejaVu Sans", "normal", "normal", "DejaVuSans.ttf"),
             ("DejaVu Sans", "bold", "normal", "DejaVuSans-Bold.ttf"),
             ("DejaVu Sans", "normal", "italic", "DejaVuSans-Oblique.ttf"),
             ("DejaVu Sans Mono", "normal", "normal", "DejaVuSansMono.ttf"),
             ("DejaVu Sans Mono", "bold", "normal", "DejaVuSansMono-Bold.ttf")]
    return "\n".join(
        f'@font-face {{ font-family: "{fam}"; font-weight: {w}; font-style: {s}; '
        f'src: url("{(d / f).as_uri()}"); }}'
        for fam, w, s, f in faces
    )


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
    css = weasyprint.CSS(string=_font_css(), url_fetcher=fetcher)
    doc = weasyprint.HTML(string=html, url_fetcher=fetcher, base_url=None)
    return doc.write_pdf(stylesheets=[css], attachments=files, pdf_identifier=b"docgen",
                         uncompressed_pdf=False)
