"""Typeset a LaTeX (mathtext) formula as a small standalone SVG of glyph outlines.

matplotlib's mathtext layout is used through TextPath, without a figure; no fonts are needed by
the viewer and the bytes are identical on every run. Typesetting costs 20-50 ms a formula, almost
all of it in the mathtext parser, and a report has a few hundred formulas, so results are kept

* in memory, per distinct formula, for the life of the process;
* on disk in the user's cache folder (:mod:`docgen.cache`), keyed by the formula, the font size,
  the matplotlib version, the mathtext settings, the docgen version and this module's source,
  so an entry is never reused after anything that shapes it changed.

:func:`prefetch` typesets many formulas at once, in parallel worker processes when enough of
them are missing from both caches. A cached formula gives the same bytes as a fresh one.
"""

from __future__ import annotations

import base64
import os
from collections.abc import Iterable
from functools import lru_cache

from .. import cache

FONT_SIZE = 11.0  # pt; the HTML scales the image by its intrinsic size
CACHE_NAMESPACE = "formulas"
#: Fewer missing formulas than this are typeset in this process; starting workers costs more.
PARALLEL_MIN = 24
#: The disk cache keeps about this many formulas (a few KiB each), dropping the oldest first.
CACHE_MAX_ENTRIES = 10_000

_svgs: dict[str, tuple[str, float, float]] = {}
_uris: dict[str, tuple[str, float, float]] = {}


# --------------------------------------------------------------------------- typesetting

def _path_data(vertices, codes, height: float, x0: float) -> str:
    """SVG path data of a glyph path (y flipped, x shifted by x0), two decimals per number."""
    from matplotlib.path import Path

    xs = [f"{x:.2f}" for x in (vertices[:, 0] - x0).tolist()]
    ys = [f"{y:.2f}" for y in (height - vertices[:, 1]).tolist()]
    moveto, lineto, curve3, curve4, close = (Path.MOVETO, Path.LINETO, Path.CURVE3, Path.CURVE4,
                                             Path.CLOSEPOLY)
    codes = codes.tolist()
    parts: list[str] = []
    append = parts.append
    i = 0
    n = len(codes)
    while i < n:
        code = codes[i]
        if code == moveto:
            append(f"M{xs[i]} {ys[i]}")
            i += 1
        elif code == lineto:
            append(f"L{xs[i]} {ys[i]}")
            i += 1
        elif code == curve3:
            append(f"Q{xs[i]} {ys[i]} {xs[i + 1]} {ys[i + 1]}")
            i += 2
        elif code == curve4:
            append(f"C{xs[i]} {ys[i]} {xs[i + 1]} {ys[i + 1]} {xs[i + 2]} {ys[i + 2]}")
            i += 3
        elif code == close:
            append("Z")
            i += 1
        else:  # STOP or unknown
            i += 1
    return "".join(parts)


def _extents(path) -> tuple[float, float, float, float]:
    """(x0, y0, x1, y1) of a glyph path, equal to matplotlib's ``Path.get_extents()`` to the
    last bit but much cheaper (that walks every curve in Python, which costs more than the
    typesetting). The end points of all segments are taken at once; a quadratic curve can reach
    beyond them only when its control point lies outside (or on the edge of) their box, and
    only those few curves are evaluated, with matplotlib's own arithmetic."""
    import numpy as np
    from matplotlib.bezier import BezierSegment
    from matplotlib.path import Path

    verts = np.asarray(path.vertices, dtype=float)
    codes = path.codes
    if codes is None or len(verts) == 0 or (codes == Path.CURVE4).any():
        e = path.get_extents()
        return e.x0, e.y0, e.x1, e.y1
    quad = np.flatnonzero(codes == Path.CURVE3)
    # CURVE3 vertices come in (control, end) pairs; a run of them holds several curves.
    run_start = np.ones(len(quad), dtype=bool)
    run_start[1:] = np.diff(quad) != 1
    first = np.maximum.accumulate(np.where(run_start, np.arange(len(quad)), 0))
    ctrl = quad[(np.arange(len(quad)) - first) % 2 == 0]
    ends = np.ones(len(verts), dtype=bool)
    ends[ctrl] = False
    ends[codes == Path.CLOSEPOLY] = False
    ends[codes == Path.STOP] = False
    end_points = verts[ends]
    lo = end_points.min(axis=0)
    hi = end_points.max(axis=0)
    c = verts[ctrl]
    beyond = ((c <= lo) | (c >= hi)).any(axis=1)
    points = [lo[None, :], hi[None, :]]
    for k in np.flatnonzero(beyond).tolist():
        i = int(ctrl[k])
        curve = BezierSegment(np.array([verts[i - 1], verts[i], verts[i + 1]]))
        _, dzeros = curve.axis_aligned_extrema()
        points.append(curve([0, *dzeros, 1]))
    allp = np.concatenate(points)
    lo = allp.min(axis=0)
    hi = allp.max(axis=0)
    return float(lo[0]), float(lo[1]), float(hi[0]), float(hi[1])


def typeset(latex: str) -> tuple[str, float, float]:
    """Typeset one formula now, bypassing every cache: (svg text, width pt, height pt)."""
    from matplotlib.font_manager import FontProperties
    from matplotlib.textpath import TextPath

    prop = FontProperties(family="DejaVu Sans", size=FONT_SIZE)
    # Display-style fractions: mathtext's inline \frac shrinks numbers below reading size.
    tp = TextPath((0, 0), "$" + latex.replace(r"\frac", r"\dfrac") + "$", prop=prop)
    ex0, ey0, ex1, ey1 = _extents(tp)
    pad = 1.0
    y_min = min(ey0, 0.0) - pad
    y_max = max(ey1, FONT_SIZE * 0.75) + pad
    height = y_max - y_min
    width = ex1 - ex0 + 2 * pad
    vertices = tp.vertices.copy()
    vertices[:, 1] -= y_min
    d = _path_data(vertices, tp.codes, height, ex0 - pad)
    svg = (
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{width:.2f}pt" height="{height:.2f}pt" '
        f'viewBox="0 0 {width:.2f} {height:.2f}"><path d="{d}" fill="#1a1a1a"/></svg>'
    )
    return svg, width, height


# --------------------------------------------------------------------------- caches

@lru_cache(maxsize=1)
def _settings_digest() -> str:
    """Everything besides the formula that shapes the SVG bytes."""
    from pathlib import Path

    import matplotlib

    from .. import __version__

    mathtext = sorted((k, repr(v)) for k, v in matplotlib.rcParams.items()
                      if k.startswith("mathtext.") or k.startswith("text.hinting")
                      or k == "text.kerning_factor")
    try:
        source = Path(__file__).read_bytes()
    except OSError:
        source = b"unreadable"
    return cache.digest("formula-svg", repr(FONT_SIZE), matplotlib.__version__, repr(mathtext),
                        __version__, source)


def cache_key(latex: str) -> str:
    return cache.digest(_settings_digest(), latex)


def _encode(entry: tuple[str, float, float]) -> bytes:
    svg, w, h = entry
    return f"{w!r} {h!r}\n{svg}".encode()


def _decode(payload: bytes) -> tuple[str, float, float] | None:
    try:
        head, svg = payload.decode("utf-8").split("\n", 1)
        w_text, h_text = head.split(" ")
        entry = (svg, float(w_text), float(h_text))
    except (UnicodeDecodeError, ValueError):
        return None
    return entry if svg.startswith("<svg ") and svg.endswith("</svg>") else None


def _from_disk(latex: str) -> tuple[str, float, float] | None:
    payload = cache.get(CACHE_NAMESPACE, cache_key(latex))
    return None if payload is None else _decode(payload)


_trimmed = False


def _store(latex: str, entry: tuple[str, float, float]) -> None:
    global _trimmed
    _svgs[latex] = entry
    key = cache_key(latex)
    if cache.put(CACHE_NAMESPACE, key, _encode(entry)) and not _trimmed:
        _trimmed = True  # once a process is enough
        cache.trim(CACHE_NAMESPACE, CACHE_MAX_ENTRIES, key)


def formula_svg(latex: str) -> tuple[str, float, float]:
    """Return (svg text, width pt, height pt) for a mathtext formula (without the $ signs)."""
    entry = _svgs.get(latex)
    if entry is not None:
        return entry
    entry = _from_disk(latex)
    if entry is not None:
        _svgs[latex] = entry
        return entry
    entry = typeset(latex)
    _store(latex, entry)
    return entry


def formula_data_uri(latex: str) -> tuple[str, float, float]:
    hit = _uris.get(latex)
    if hit is not None:
        return hit
    svg, w, h = formula_svg(latex)
    encoded = base64.b64encode(svg.encode("utf-8")).decode("ascii")
    _uris[latex] = (f"data:image/svg+xml;base64,{encoded}", w, h)
    return _uris[latex]


def clear_memory() -> None:
    """Forget the formulas held in this process (the disk cache stays)."""
    _svgs.clear()
    _uris.clear()


# --------------------------------------------------------------------------- many at once

def _typeset_chunk(formulas: list[str]) -> list[tuple[str, float, float]]:
    return [typeset(latex) for latex in formulas]


def _fresh_font_state() -> bool:
    """In a forked worker: drop every font and parsed formula inherited from the parent.

    A forked child shares the parent's open font files, file offsets included, so reading glyphs
    through an inherited font object while the parent reads too can load the wrong bytes (seen
    as a wrong outline or a FreeType error). matplotlib drops its font cache in a forked child
    itself; its cache of parsed formulas also holds font objects and is dropped here. Returns
    False when these caches are not where this code expects them (then nothing is forked)."""
    try:
        from matplotlib import font_manager
        from matplotlib.mathtext import MathTextParser

        font_manager._get_font.cache_clear()
        MathTextParser._parse_cached.cache_clear()
    except (ImportError, AttributeError):
        return False
    return True


def _parallel_workers(missing: int) -> int:
    """Worker processes worth starting for ``missing`` formulas; 0 means typeset here."""
    import multiprocessing
    import threading

    if missing < PARALLEL_MIN:
        return 0
    if multiprocessing.parent_process() is not None:
        return 0  # already a worker (e.g. of a batch build): do not multiply processes
    # Forked workers only: a fresh interpreter per worker costs more than it saves and would
    # re-run an unguarded __main__ script of a program that calls docgen.
    if "fork" not in multiprocessing.get_all_start_methods() or threading.active_count() > 1:
        return 0
    if not _fresh_font_state():  # (harmless in this process: the caches refill on use)
        return 0
    try:
        cpus = len(os.sched_getaffinity(0))
    except (AttributeError, OSError):
        cpus = os.cpu_count() or 1
    return min(cpus, missing // (PARALLEL_MIN // 2)) if cpus > 1 else 0


def _worker_start() -> None:
    if not _fresh_font_state():  # pragma: no cover - checked before forking
        raise RuntimeError("cannot reset the inherited font state")


def prefetch(formulas: Iterable[str]) -> int:
    """Make every formula ready (memory, then disk cache, then typesetting, in parallel worker
    processes when many are missing). Returns how many had to be typeset. Results are the same
    bytes as :func:`formula_svg` gives one by one."""
    missing: list[str] = []
    for latex in dict.fromkeys(formulas):
        if latex in _svgs:
            continue
        entry = _from_disk(latex)
        if entry is not None:
            _svgs[latex] = entry
        else:
            missing.append(latex)
    workers = _parallel_workers(len(missing))
    results: list[tuple[str, float, float]] | None = None
    if workers > 1:
        results = _typeset_in_workers(missing, workers)
    if results is None:
        results = _typeset_chunk(missing)
    for latex, entry in zip(missing, results, strict=True):
        _store(latex, entry)
    return len(missing)


def _typeset_in_workers(missing: list[str], workers: int):
    """Typeset ``missing`` split over this process and ``workers - 1`` forked children."""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor

    # The first formula here, before forking: the children inherit a ready parser (they reopen
    # the font files themselves, see _fresh_font_state).
    first = typeset(missing[0])
    rest = missing[1:]
    # Interleaved chunks: long and short formulas are spread evenly; chunk 0 stays here.
    chunks = [rest[k::workers] for k in range(workers)]
    try:
        with ProcessPoolExecutor(max_workers=workers - 1, initializer=_worker_start,
                                 mp_context=multiprocessing.get_context("fork")) as pool:
            futures = [pool.submit(_typeset_chunk, chunk) for chunk in chunks[1:]]
            done = [_typeset_chunk(chunks[0])] + [f.result() for f in futures]
    except (OSError, RuntimeError):  # no processes to be had: typeset here instead
        return None
    results: list[tuple[str, float, float] | None] = [None] * len(rest)
    for k, chunk in enumerate(done):
        results[k::workers] = chunk
    return [first, *results]
