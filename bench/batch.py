"""Benchmark: a cold batch build of many specs, then a rebuild with nothing changed.

Writes COUNT invented variations of the demo spec (DEMO DATA: made-up rails, loads and mains)
into a temporary folder, runs ``docgen build FOLDER -o OUT`` twice in a fresh process each time,
and prints both wall-clock times and their ratio. The second run should find every spec up to
date; the target is a no-change rebuild at least 50 times faster than the cold build.

    python bench/batch.py                 # 50 specs with PDFs (several minutes)
    python bench/batch.py --no-pdf        # HTML and results.json only
    python bench/batch.py --count 10 -j 2
"""

from __future__ import annotations

import argparse
import itertools
import re
import subprocess
import sys
import tempfile
import time
from pathlib import Path

# (mains RMS, frequency) x (zener rail) x (load current): invented combinations.
MAINS = [("230 V", "50 Hz"), ("120 V", "60 Hz"), ("240 V", "50 Hz"), ("220 V", "60 Hz")]
RAILS = ["5.1 V", "6.2 V", "9.1 V", "12 V", "15 V"]
LOADS = ["10 mA", "20 mA", "30 mA", "40 mA", "60 mA"]
RIPPLE = ["20 mV", "50 mV", "100 mV"]

TEMPLATE = """\
# DEMO DATA: invented benchmark variation {n} of the demo spec; not a real product.
schema = 1

[project]
title = "Benchmark rail {n}: {rail} at {load} from {mains}"
document_id = "BENCH-{n:03d}"
revision = "A"
date = "2026-01-01"
demo = true

[mains]
nominal = "{mains}"
frequency = "{freq}"

[[output]]
name = "bench rail"
voltage = "{rail}"
load_min = "2 mA"
load_max = "{load}"
ripple_max = "{ripple}"
"""


def write_specs(folder: Path, count: int) -> list[Path]:
    combos = itertools.cycle(itertools.product(MAINS, RAILS, LOADS))
    paths = []
    for n in range(1, count + 1):
        (mains, freq), rail, load = next(combos)
        text = TEMPLATE.format(n=n, mains=mains, freq=freq, rail=rail, load=load,
                               ripple=RIPPLE[n % len(RIPPLE)])
        path = folder / f"bench-{n:03d}.toml"
        path.write_text(text, encoding="utf-8")
        paths.append(path)
    return paths


def run_build(specs: Path, out: Path, extra: list[str]) -> tuple[float, int, str]:
    cmd = [sys.executable, "-m", "docgen.cli", "build", str(specs), "-o", str(out), *extra]
    start = time.perf_counter()
    proc = subprocess.run(cmd, capture_output=True, text=True, check=False)
    seconds = time.perf_counter() - start
    if proc.returncode == 2:
        sys.stderr.write(proc.stderr)
    return seconds, proc.returncode, proc.stdout


def tail(stdout: str) -> str:
    lines = [ln for ln in stdout.splitlines() if re.match(r"\d+ specs: ", ln)]
    return lines[-1] if lines else "(no summary)"


def main() -> int:
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("--count", type=int, default=50, help="number of specs (default 50)")
    p.add_argument("--no-pdf", action="store_true", help="build HTML and results.json only")
    p.add_argument("-j", "--jobs", type=int, default=None, help="worker processes")
    p.add_argument("--keep", type=Path, default=None,
                   help="build into this new folder and keep it (default: a temporary folder)")
    args = p.parse_args()
    if args.count < 1:
        p.error("--count must be at least 1")

    extra = (["--no-pdf"] if args.no_pdf else []) + (["-j", str(args.jobs)] if args.jobs else [])
    with tempfile.TemporaryDirectory(prefix="docgen-bench-") as tmp:
        root = args.keep if args.keep is not None else Path(tmp)
        if args.keep is not None:
            root.mkdir(parents=True, exist_ok=False)
        specs = root / "specs"
        specs.mkdir()
        write_specs(specs, args.count)
        out = root / "out"
        kind = "HTML + results.json" if args.no_pdf else "HTML + PDF + results.json"
        print(f"{args.count} specs, {kind}, jobs={args.jobs or 'auto'}")

        cold, code1, out1 = run_build(specs, out, extra)
        print(f"cold build:      {cold:8.2f} s   exit {code1}   {tail(out1)}")
        warm, code2, out2 = run_build(specs, out, extra)
        print(f"no-change build: {warm:8.2f} s   exit {code2}   {tail(out2)}")
        ratio = cold / warm if warm > 0 else float("inf")
        verdict = "meets" if ratio >= 50 else "misses"
        print(f"ratio: {ratio:.0f}x ({verdict} the 50x target)")
        if code1 == 2 or code2 == 2 or code1 != code2:
            print("note: the two runs ended differently; see the output above", file=sys.stderr)
            return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
