"""Benchmark: the design-space search of every demo spec that names a parts library, against
one `docgen check` of the same spec, measured in one run.

For each spec: the time of one check (pipeline with its Monte Carlo samples), the time of the
whole search (greedy design, hand bounds, batched verification), candidates verified per
second, and the ratio search / check. The target is a ratio below 10 for each spec.
Each measurement runs in this process after a warm-up import; run on a quiet machine.

    python bench/explore.py                  # every demo spec with a library
    python bench/explore.py specs/lab-reference-adjustable.toml
    python bench/explore.py --all            # verify every candidate (no cost bound)
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
TARGET = 10.0


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("specs", nargs="*", type=Path)
    ap.add_argument("--all", action="store_true", help="no cost bound (verify every candidate)")
    args = ap.parse_args(argv)
    from docgen.explore.search import search
    from docgen.pipeline import run
    from docgen.spec import load_requirements

    specs = args.specs or [p for p in sorted((ROOT / "specs").glob("*.toml"))
                           if "[parts]" in p.read_text(encoding="utf-8")]
    worst = 0.0
    print(f"{'spec':<34} {'check s':>8} {'search s':>9} {'ratio':>6} {'verified':>9} "
          f"{'per s':>7} {'space':>6} {'best':>7} {'greedy':>7}")
    for path in specs:
        loaded = load_requirements(path)
        t0 = time.perf_counter()
        run(loaded)
        t_check = time.perf_counter() - t0
        t0 = time.perf_counter()
        r = search(loaded, exhaustive=args.all)
        t_search = time.perf_counter() - t0
        ratio = t_search / t_check
        worst = max(worst, ratio)
        best = f"{r.best.cost:.2f}" if r.best else "none"
        greedy = f"{r.greedy.cost:.2f}" if r.greedy and r.greedy.feasible else "none"
        print(f"{path.name:<34} {t_check:8.2f} {t_search:9.2f} {ratio:6.1f} "
              f"{len(r.verdicts):9d} {len(r.verdicts) / t_search:7.1f} {r.space_size:6d} "
              f"{best:>7} {greedy:>7}")
    print(f"worst ratio {worst:.1f} (target below {TARGET:g})")
    return 0 if worst < TARGET else 1


if __name__ == "__main__":
    sys.exit(main())
