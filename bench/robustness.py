"""Throw random and malformed values at `docgen check` and count tracebacks.

Prints: inputs tried, verdicts by exit status, tracebacks seen (target 0). Run from the
repository root: python bench/robustness.py [--count N] [--seed S]
"""

from __future__ import annotations

import argparse
import contextlib
import io
import random
import sys
import tempfile
import traceback
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from docgen.cli import main  # noqa: E402
from tests.conftest import DEMO_STANDALONE  # noqa: E402
from tests.e2e.test_robustness import FIELDS, _replace, _toml_value  # noqa: E402

SAMPLES = ["0 V", "-5 mA", "nan V", "inf A", "1e308 V", "12 parsecs", "", " ", "4700 uF",
           "10 %", "230 V", "50 Hz", "45 degC", "1e-30 A", "0 ohm", "3 kV", "999 A", "1 MHz"]


def random_value(rng: random.Random):
    kind = rng.randrange(5)
    if kind == 0:
        return rng.choice([float("nan"), float("inf"), -float("inf"), 0.0, -1.0, 1e300,
                           rng.uniform(-1e6, 1e6)])
    if kind == 1:
        return rng.randint(-10**12, 10**12)
    if kind == 2:
        return rng.random() < 0.5
    if kind == 3:
        return "".join(rng.choice("0123456789.eE+- mVAkHzuF%degC") for _ in range(rng.randrange(8)))
    return rng.choice(SAMPLES)


def main_() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--count", type=int, default=100)
    ap.add_argument("--seed", type=int, default=1)
    args = ap.parse_args()
    rng = random.Random(args.seed)
    codes = {0: 0, 1: 0, 2: 0}
    tracebacks = 0
    with tempfile.TemporaryDirectory() as tmp:
        for k in range(args.count):
            section, key = rng.choice(FIELDS)
            text = _replace(DEMO_STANDALONE, section, key, _toml_value(random_value(rng)))
            path = Path(tmp) / f"fuzz{k}.toml"
            path.write_text(text)
            out = io.StringIO()
            try:
                with contextlib.redirect_stdout(out), contextlib.redirect_stderr(out):
                    code = main(["check", str(path)])
                codes[code] = codes.get(code, 0) + 1
            except Exception:  # noqa: BLE001 - counting exactly these is the point
                tracebacks += 1
                traceback.print_exc()
    print(f"inputs tried: {args.count}")
    print("verdicts: " + ", ".join(f"exit {c}: {n}" for c, n in sorted(codes.items())))
    print(f"tracebacks seen: {tracebacks} (target 0)")
    return 0


if __name__ == "__main__":
    sys.exit(main_())
