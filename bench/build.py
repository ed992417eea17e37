"""Benchmark: the whole docgen pipeline against its performance budget.

For every demo spec (``specs/*.toml``, or the specs named on the command line) this measures the
median wall time over ``--runs`` fresh processes of

* ``docgen --help`` and ``docgen check SPEC``;
* ``docgen build SPEC --no-pdf --force`` and ``docgen build SPEC --force`` (HTML and PDF), each
  with the formula cache warm and with an empty formula cache;
* a no-change rebuild ``docgen build SPEC`` right after a build (it should find the outputs up
  to date);
* the peak memory (maximum resident set size) of a full build;
* the pages of the PDF: the body (before appendix A) and the whole, against the page budget of
  the review package (body <= 12 pages for one rail, <= 16 for a split supply; the whole at most
  half the pages of the layout before it), and the ratio full build / check (target <= 5);
* in one instrumented in-process build (a fresh interpreter that wraps a few functions, the code
  is not edited): the time spent inside WeasyPrint (HTML parsing, layout, drawing and PDF
  writing) against everything else (imports, sizing, engine, corners, Monte Carlo, plots,
  formulas, templates, file writing).

Each figure is printed with its target. The script only reports: it always exits 0.

    python bench/build.py                 # every demo spec, 3 runs each
    python bench/build.py --runs 5 specs/hydroponic-sensor-hub.toml

The formula cache is pointed at a temporary folder (``DOCGEN_CACHE_DIR``), so the user's cache
is neither used nor changed; "cold" runs start from an empty cache folder each time.
"""

from __future__ import annotations

import argparse
import datetime
import json
import os
import platform
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent

TARGETS = {
    "help": ("<", 0.3, "s"),
    "check": ("<", 1.5, "s"),
    "rebuild": ("<", 0.5, "s"),
    "peak": ("<", 500.0, "MiB"),
    "share": ("<=", 40.0, "%"),
    "ratio": ("<=", 5.0, "x"),
}

# Pages of each demo's PDF in the layout before the review package (every section in the body,
# worksheet-style calculations), measured on 2026-12-02: the whole PDF should be at most half.
PAGES_BEFORE = {"audio-preamp-split-15v": 81, "bench-psu-12v-follower": 70,
                "hydroponic-sensor-hub": 56, "lab-reference-adjustable": 50,
                "meter-backup-halfwave": 66, "us-controller-5v-120v": 54}
BODY_PAGES = {"single": 12, "split": 16}
APPENDIX_MARK = "Appendix A. Derivations"


def pdf_pages(pdf: Path) -> tuple[int, int] | None:
    """(body pages, total pages): the body ends before the page that opens appendix A."""
    try:
        import pypdf
    except ImportError:
        return None
    pages = pypdf.PdfReader(pdf).pages
    body = next((i for i, page in enumerate(pages) if APPENDIX_MARK in (page.extract_text() or "")),
                len(pages))
    return body, len(pages)


# --------------------------------------------------------------------------- child processes

def docgen_command() -> list[str]:
    """The console script installed beside this interpreter, else the same entry point run by
    this interpreter (a version manager's shell shim would add its own start-up time)."""
    script = Path(sys.executable).parent / "docgen"
    if script.is_file():
        return [str(script)]
    return [sys.executable, "-c", "import sys; from docgen.cli import main; sys.exit(main())"]


def run_with_rss(cmd: list[str], env: dict[str, str]) -> tuple[float, float, int, str]:
    """Run a command; return (wall seconds, peak RSS in MiB of the child and the children it
    waited for, exit code, output). os.wait4 reads the resource use of that one child."""
    with tempfile.TemporaryFile("w+") as out:
        start = time.perf_counter()
        proc = subprocess.Popen(cmd, stdout=out, stderr=subprocess.STDOUT, env=env, cwd=ROOT)
        _, status, usage = os.wait4(proc.pid, 0)
        wall = time.perf_counter() - start
        proc.returncode = os.waitstatus_to_exitcode(status)
        out.seek(0)
        text = out.read()
    # ru_maxrss is in KiB on Linux and in bytes on macOS.
    rss_mib = usage.ru_maxrss / (1024.0 * 1024.0 if sys.platform == "darwin" else 1024.0)
    return wall, rss_mib, proc.returncode, text


def median_of(runs: int, cmd: list[str], env: dict[str, str], before=None):
    """Median wall time and peak RSS over ``runs`` runs; ``before`` runs before each run."""
    walls, rss, codes, last = [], [], [], ""
    for _ in range(runs):
        if before is not None:
            before()
        wall, peak, code, last = run_with_rss(cmd, env)
        walls.append(wall)
        rss.append(peak)
        codes.append(code)
    return statistics.median(walls), max(rss), codes, last


# --------------------------------------------------------------------------- in-process split

INPROCESS = r"""
import json, sys, time
T0 = time.perf_counter()
totals = {}

def wrap(owner, name, key):
    fn = getattr(owner, name, None)
    if fn is None:
        return
    def timed(*args, **kwargs):
        start = time.perf_counter()
        try:
            return fn(*args, **kwargs)
        finally:
            totals[key] = totals.get(key, 0.0) + time.perf_counter() - start
    setattr(owner, name, timed)

import docgen.jobs.build as build
import docgen.render.html as html
import docgen.render.mathsvg as mathsvg
import docgen.render.pdf as pdf
import weasyprint
import weasyprint.document
T1 = time.perf_counter()
wrap(build, "run", "pipeline (sizing, engine, corners, Monte Carlo)")
wrap(build, "draw_plots", "plots and schematic")
wrap(html, "render_html", "HTML (templates and formulas)")
# Formulas: typeset ahead in one batch (prefetch), or one by one as the template asks.
wrap(mathsvg, "prefetch", "  of which formulas")
wrap(html, "formula_data_uri", "  of which formulas")
wrap(pdf, "render_pdf", "render_pdf (all)")
wrap(weasyprint.HTML, "__init__", "weasyprint: HTML parsing")
wrap(weasyprint.HTML, "render", "weasyprint: style and layout")
wrap(weasyprint.document.Document, "write_pdf", "weasyprint: drawing and PDF writing")
from docgen.cli import main
code = main(sys.argv[1:])
T2 = time.perf_counter()
totals["imports (docgen, matplotlib, WeasyPrint)"] = T1 - T0
totals["build call"] = T2 - T1
print("@@BENCH@@" + json.dumps(totals))
sys.exit(code)
"""

WEASY_KEYS = ("weasyprint: HTML parsing", "weasyprint: style and layout",
              "weasyprint: drawing and PDF writing")


def inprocess_split(spec: Path, out: Path, env: dict[str, str]) -> dict[str, float] | None:
    cmd = [sys.executable, "-c", INPROCESS, "build", str(spec), "--force", "-o", str(out)]
    wall, _, code, text = run_with_rss(cmd, env)
    for line in text.splitlines():
        if line.startswith("@@BENCH@@"):
            parts = json.loads(line[len("@@BENCH@@"):])
            parts["whole process"] = wall
            return parts
    print(f"    (instrumented build failed, exit {code}): {text.strip()[-400:]}")
    return None


# --------------------------------------------------------------------------- printing

def verdict(key: str, value: float) -> str:
    rel, limit, unit = TARGETS[key]
    ok = value < limit if rel == "<" else value <= limit
    target = f"target {rel} {limit:g} {unit}"
    return f"{target:<18} {'met' if ok else 'MISSED'}"


def line(label: str, value: float, unit: str, key: str | None = None, note: str = "") -> None:
    shown = f"{value:8.2f} {unit}" if unit != "MiB" else f"{value:8.0f} {unit}"
    extra = verdict(key, value) if key else ""
    print(f"  {label:<42} {shown:<12} {extra} {note}".rstrip())


def bench_spec(spec: Path, runs: int, base_env: dict[str, str], work: Path) -> None:
    docgen = docgen_command()
    out = work / "out"
    warm_cache = work / "cache-warm"
    cold_cache = work / "cache-cold"
    env_warm = {**base_env, "DOCGEN_CACHE_DIR": str(warm_cache)}
    env_cold = {**base_env, "DOCGEN_CACHE_DIR": str(cold_cache)}

    def empty_cold_cache():
        shutil.rmtree(cold_cache, ignore_errors=True)

    print(f"\n{spec.relative_to(ROOT) if spec.is_relative_to(ROOT) else spec}"
          f"  (median of {runs} runs, wall time of a fresh process)")

    t, _, _, _ = median_of(runs, docgen + ["--help"], env_warm)
    line("docgen --help", t, "s", "help")
    t_check, _, codes, _ = median_of(runs, docgen + ["check", str(spec)], env_warm)
    line("docgen check", t_check, "s", "check", f"(exit {codes[0]})")

    html_cmd = docgen + ["build", str(spec), "--no-pdf", "--force", "-o", str(out)]
    full_cmd = docgen + ["build", str(spec), "--force", "-o", str(out)]
    # Warm the formula cache once (not timed).
    run_with_rss(full_cmd, env_warm)
    t, _, codes, _ = median_of(runs, html_cmd, env_cold, before=empty_cold_cache)
    line("build --no-pdf, empty formula cache", t, "s", None, f"(exit {codes[0]})")
    t, _, codes, _ = median_of(runs, html_cmd, env_warm)
    line("build --no-pdf, warm formula cache", t, "s", None, f"(exit {codes[0]})")
    t_cold, peak_cold, codes, _ = median_of(runs, full_cmd, env_cold, before=empty_cold_cache)
    line("build (HTML+PDF), empty formula cache", t_cold, "s", None, f"(exit {codes[0]})")
    t_full, peak, codes, text = median_of(runs, full_cmd, env_warm)
    line("build (HTML+PDF), warm formula cache", t_full, "s", None, f"(exit {codes[0]})")
    pdf = out / spec.stem / "report.pdf"
    html = out / spec.stem / "report.html"
    if pdf.exists() and html.exists():
        print(f"  {'':42} report.html {html.stat().st_size / 1024:.0f} KiB, "
              f"report.pdf {pdf.stat().st_size / 1024:.0f} KiB")
    if t_check > 0:
        line("ratio full build (warm) / check", t_full / t_check, "x", "ratio")
    pages = pdf_pages(pdf) if pdf.exists() else None
    if pages is not None:
        body, total = pages
        import tomllib

        raw = tomllib.loads(spec.read_text(encoding="utf-8"))
        split = raw.get("rectifier", {}).get("topology") == "split"
        budget = BODY_PAGES["split" if split else "single"]
        print(f"  {'pages: body / whole PDF':<42} {body:5d} / {total:<4d}   body target <= "
              f"{budget} {'met' if body <= budget else 'MISSED'}", end="")
        before = PAGES_BEFORE.get(spec.stem, 0)
        if before:
            print(f"; whole target <= {before // 2} (half of {before}) "
                  f"{'met' if total <= before / 2 else 'MISSED'}")
        else:
            print()

    rebuild_cmd = docgen + ["build", str(spec), "-o", str(out)]
    t, _, codes, text = median_of(runs, rebuild_cmd, env_warm)
    skipped = "up to date" in text
    line("no-change rebuild", t, "s", "rebuild",
         "(skipped: up to date)" if skipped else "(NOT skipped: rebuilt)")

    line("peak memory of a full build (max RSS)", max(peak, peak_cold), "MiB", "peak")

    for label, env, before in (("warm formula cache", env_warm, None),
                               ("empty formula cache", env_cold, empty_cold_cache)):
        if before is not None:
            before()
        parts = inprocess_split(spec, out, env)
        if parts is None:
            continue
        whole = parts["whole process"]
        weasy = sum(parts.get(k, 0.0) for k in WEASY_KEYS)
        share = 100.0 * (whole - weasy) / whole if whole > 0 else float("nan")
        line(f"share outside WeasyPrint, {label}", share, "%", "share",
             f"({whole - weasy:.2f} of {whole:.2f} s)")
        for key in ("imports (docgen, matplotlib, WeasyPrint)",
                    "pipeline (sizing, engine, corners, Monte Carlo)", "plots and schematic",
                    "HTML (templates and formulas)", "  of which formulas", *WEASY_KEYS):
            if key in parts:
                print(f"      {key:<50} {parts[key]:6.2f} s")


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("specs", nargs="*", type=Path, help="specs to measure (default specs/*.toml)")
    ap.add_argument("--runs", type=int, default=3, help="runs per figure; the median is shown")
    args = ap.parse_args(argv)
    specs = [p.resolve() for p in args.specs] or sorted((ROOT / "specs").glob("*.toml"))
    runs = max(1, args.runs)
    try:
        import matplotlib
        import weasyprint
        versions = f"matplotlib {matplotlib.__version__}, WeasyPrint {weasyprint.__version__}"
    except Exception as exc:  # noqa: BLE001 - the report still runs
        versions = f"libraries not importable: {exc}"
    print(f"docgen performance budget  {datetime.date.today().isoformat()}  "
          f"Python {platform.python_version()}, {os.cpu_count()} CPUs, {versions}")
    print(f"command: {' '.join(docgen_command())}")
    if hasattr(os, "getloadavg"):
        # Other work on the machine slows every figure; say how busy it was.
        print("load average at start: " + ", ".join(f"{x:.2f}" for x in os.getloadavg()))
    base_env = {k: v for k, v in os.environ.items() if k != "DOCGEN_NO_CACHE"}
    for spec in specs:
        with tempfile.TemporaryDirectory(prefix="docgen-bench-") as tmp:
            try:
                bench_spec(spec, runs, base_env, Path(tmp))
            except Exception as exc:  # noqa: BLE001 - report, never gate
                print(f"  benchmark of {spec} stopped: {type(exc).__name__}: {exc}")
    if hasattr(os, "getloadavg"):
        print("\nload average at end: " + ", ".join(f"{x:.2f}" for x in os.getloadavg()))
    return 0


if __name__ == "__main__":
    main()
    sys.exit(0)
