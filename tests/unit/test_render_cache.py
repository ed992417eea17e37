"""The formula cache (memory, disk, parallel typesetting) never changes a byte of the output."""

from __future__ import annotations

import os
import stat
from pathlib import Path

import pytest
from markupsafe import escape

from docgen import cache
from docgen.render import mathsvg

FORMULAS = [
    "V_{sec}",
    r"\eta",
    r"\alpha_Z",
    r"V_{path,lo} = \frac{V_{path,pk,lo}}{\sqrt{2}}",
    r"V_{path,lo} = \frac{16.08\,\mathrm{V}}{\sqrt{2}} = 11.37\,\mathrm{V}",
    r"T_{core} = 45\,\mathrm{^{\circ}C} + \left(151\,\mathrm{mA}\right)^2 \cdot "
    r"60\,\mathrm{m\Omega} \cdot 25\,\mathrm{K/W} = 45.03\,\mathrm{^{\circ}C}",
    r"L_C = \min\left(L_0 \cdot 2^{(T_0 - T_{core})/10\,\mathrm{K}},\ L_{cap}\right)",
    r"I_{C,rms} = 151\,\mathrm{mA}\quad\mathrm{(worst\ corner)}",
]


@pytest.fixture
def cache_dir(tmp_path, monkeypatch):
    folder = tmp_path / "cache"
    monkeypatch.setenv("DOCGEN_CACHE_DIR", str(folder))
    monkeypatch.delenv("DOCGEN_NO_CACHE", raising=False)
    mathsvg.clear_memory()
    yield folder
    mathsvg.clear_memory()


def _entries(folder: Path) -> list[Path]:
    return sorted(p for p in folder.rglob("*") if p.is_file()) if folder.exists() else []


# --------------------------------------------------------------------------- docgen.cache

def test_cache_folder_follows_the_environment(tmp_path, monkeypatch):
    monkeypatch.delenv("DOCGEN_NO_CACHE", raising=False)
    monkeypatch.setenv("DOCGEN_CACHE_DIR", str(tmp_path / "explicit"))
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "xdg"))
    assert cache.cache_root() == tmp_path / "explicit"
    monkeypatch.delenv("DOCGEN_CACHE_DIR")
    assert cache.cache_root() == tmp_path / "xdg" / "docgen"
    monkeypatch.delenv("XDG_CACHE_HOME")
    monkeypatch.setenv("HOME", str(tmp_path / "home"))
    assert cache.cache_root() == tmp_path / "home" / ".cache" / "docgen"
    monkeypatch.setenv("DOCGEN_NO_CACHE", "1")
    assert cache.cache_root() is None


def test_put_then_get_returns_the_same_bytes(cache_dir):
    payload = bytes(range(256)) * 3
    assert cache.put("ns", cache.digest("a"), payload)
    assert cache.get("ns", cache.digest("a")) == payload
    assert cache.get("ns", cache.digest("b")) is None
    # No temporary files are left behind by the atomic write.
    assert [p.name for p in _entries(cache_dir)] == [cache.digest("a")]


def test_digest_parts_do_not_run_together():
    assert cache.digest("ab", "c") != cache.digest("a", "bc")
    assert cache.digest("x") == cache.digest(b"x")


def test_damaged_entry_is_ignored_and_replaced(cache_dir):
    key = cache.digest("damaged")
    cache.put("ns", key, b"good payload")
    (entry,) = _entries(cache_dir)
    entry.write_bytes(entry.read_bytes()[:-3])  # truncated
    assert cache.get("ns", key) is None
    entry.write_bytes(b"not a cache entry at all")
    assert cache.get("ns", key) is None
    cache.put("ns", key, b"good payload")
    assert cache.get("ns", key) == b"good payload"


def test_no_cache_switch_reads_and_writes_nothing(cache_dir, monkeypatch):
    monkeypatch.setenv("DOCGEN_NO_CACHE", "1")
    assert not cache.put("ns", cache.digest("k"), b"data")
    assert cache.get("ns", cache.digest("k")) is None
    assert mathsvg.formula_svg("V_{sec}")[0].startswith("<svg ")
    assert _entries(cache_dir) == []


@pytest.mark.skipif(os.name != "posix" or os.geteuid() == 0,
                    reason="needs a user that file permissions apply to")
def test_unwritable_cache_folder_never_breaks_typesetting(tmp_path, monkeypatch):
    folder = tmp_path / "locked"
    folder.mkdir()
    folder.chmod(stat.S_IRUSR | stat.S_IXUSR)
    monkeypatch.setenv("DOCGEN_CACHE_DIR", str(folder))
    monkeypatch.delenv("DOCGEN_NO_CACHE", raising=False)
    mathsvg.clear_memory()
    try:
        assert mathsvg.formula_svg("V_{sec}") == mathsvg.typeset("V_{sec}")
    finally:
        folder.chmod(stat.S_IRWXU)
        mathsvg.clear_memory()


def test_cache_path_that_is_a_file_never_breaks_typesetting(tmp_path, monkeypatch):
    # Works for every user, root included: nothing can be created below a regular file.
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("x")
    monkeypatch.setenv("DOCGEN_CACHE_DIR", str(blocker))
    monkeypatch.delenv("DOCGEN_NO_CACHE", raising=False)
    mathsvg.clear_memory()
    try:
        assert not cache.put("ns", cache.digest("k"), b"data")
        assert cache.get("ns", cache.digest("k")) is None
        assert mathsvg.formula_svg(r"\eta") == mathsvg.typeset(r"\eta")
        mathsvg.prefetch(FORMULAS[:3])
        assert mathsvg.formula_svg(r"\alpha_Z") == mathsvg.typeset(r"\alpha_Z")
    finally:
        mathsvg.clear_memory()


def test_trim_drops_the_oldest_entries(cache_dir):
    # Keys of one bucket (same first two characters), so the cheap bucket count sees them all.
    keys = [f"aa{n:062d}" for n in range(40)]
    for n, key in enumerate(keys):
        cache.put("ns", key, b"x")
        path = cache_dir / "ns" / key[:2] / key
        os.utime(path, ns=(n * 10**9, n * 10**9))
    removed = cache.trim("ns", 10, keys[-1])
    assert removed == 40 - 8
    left = {p.name for p in _entries(cache_dir)}
    assert left == set(keys[-8:])


# --------------------------------------------------------------------------- formulas

def test_extents_equal_matplotlib_to_the_last_bit():
    from matplotlib.font_manager import FontProperties
    from matplotlib.textpath import TextPath

    prop = FontProperties(family="DejaVu Sans", size=mathsvg.FONT_SIZE)
    for latex in FORMULAS:
        tp = TextPath((0, 0), "$" + latex.replace(r"\frac", r"\dfrac") + "$", prop=prop)
        e = tp.get_extents()
        assert mathsvg._extents(tp) == (e.x0, e.y0, e.x1, e.y1), latex


def test_cached_formulas_are_identical_to_fresh_ones(cache_dir, monkeypatch):
    monkeypatch.setenv("DOCGEN_NO_CACHE", "1")
    fresh = {f: mathsvg.formula_data_uri(f) for f in FORMULAS}
    assert _entries(cache_dir) == []

    monkeypatch.delenv("DOCGEN_NO_CACHE")
    for _ in range(2):  # first fills the disk cache, second reads it back
        mathsvg.clear_memory()
        assert {f: mathsvg.formula_data_uri(f) for f in FORMULAS} == fresh
        assert len(_entries(cache_dir)) == len(FORMULAS)
    # The second round was served from disk: a damaged typesetter would not be called.
    mathsvg.clear_memory()
    monkeypatch.setattr(mathsvg, "typeset", lambda latex: pytest.fail(f"typeset {latex!r}"))
    assert {f: mathsvg.formula_data_uri(f) for f in FORMULAS} == fresh


def test_key_changes_with_the_formula_and_settings():
    assert mathsvg.cache_key("a") != mathsvg.cache_key("b")
    assert mathsvg.cache_key("a") == mathsvg.cache_key("a")


def test_prefetch_in_worker_processes_gives_the_same_bytes(cache_dir, monkeypatch):
    # 40 distinct formulas; mathtext keeps the last 50 it parsed, with their font objects.
    formulas = [f"{f} + {k}" for k in range(5) for f in FORMULAS]
    monkeypatch.setenv("DOCGEN_NO_CACHE", "1")
    serial = {f: mathsvg.typeset(f) for f in formulas}
    monkeypatch.delenv("DOCGEN_NO_CACHE")
    monkeypatch.setattr(mathsvg, "PARALLEL_MIN", 2)
    workers = mathsvg._parallel_workers(len(formulas))
    # Each round parses every formula here first. A forked worker that read glyphs through the
    # parent's font objects (same open files, same file offsets) got wrong outlines or FreeType
    # errors now and then while both processes read.
    for _ in range(3):
        for f in formulas:
            mathsvg.typeset(f)
        mathsvg.clear_memory()
        for p in _entries(cache_dir):
            p.unlink()
        assert mathsvg.prefetch(formulas + formulas[:2]) == len(formulas)
        assert {f: mathsvg.formula_svg(f) for f in formulas} == serial
        assert len(_entries(cache_dir)) == len(formulas)
    # Everything is known now: nothing more to typeset.
    assert mathsvg.prefetch(formulas) == 0
    if workers < 2:
        pytest.skip("one CPU or threads running: the parallel path was not taken")


def test_report_html_is_byte_identical_with_and_without_the_cache(cache_dir, monkeypatch):
    from docgen.jobs.build import design_for
    from docgen.render.html import render_html

    spec = Path(__file__).resolve().parents[2] / "specs" / "hydroponic-sensor-hub.toml"
    design = design_for(spec)
    monkeypatch.setenv("DOCGEN_NO_CACHE", "1")
    mathsvg.clear_memory()
    without = render_html(design, {}, medium="print")  # the PDF's HTML has the pictures
    monkeypatch.delenv("DOCGEN_NO_CACHE")
    for _ in range(2):  # cold cache, then warm cache
        mathsvg.clear_memory()
        assert render_html(design, {}, medium="print") == without
    assert _entries(cache_dir)


def test_only_the_formulas_the_document_shows_are_typeset(cache_dir, monkeypatch):
    # The print HTML asks the typesetter for the pictures its template places, all in one
    # batch, and for nothing else: every formula asked for appears in the page (as the
    # picture's alternative text), and every picture of the page was asked for.
    from docgen.jobs.build import design_for
    from docgen.render import filters
    from docgen.render import html as html_mod

    spec = Path(__file__).resolve().parents[2] / "specs" / "hydroponic-sensor-hub.toml"
    design = design_for(spec)
    asked: list[list[str]] = []
    real = mathsvg.prefetch
    monkeypatch.setattr(mathsvg, "prefetch", lambda f: asked.append(list(f)) or real(f))
    page = html_mod.render_html(design, {}, medium="print")
    assert len(asked) == 1
    shown = set(asked[0])
    traced = {v.symbol for v in design.values.values()}
    assert shown < traced | {f for v in design.values.values() for f in (v.latex, v.substituted)}
    assert page.count('<img class="math"') == len(asked[0])
    for latex in shown:
        assert f'alt="{escape(filters.formula_text(latex))}"' in page
    assert "@formula-" not in page
