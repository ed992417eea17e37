"""Benchmark of the steady-state engine (not a test: timings depend on the machine).

1. Accuracy and speed against the solve_ivp reference of tests/reference (same circuits): time
   per operating point of the reference and of the engine (one point per call, and amortised in a
   batch), and the largest relative difference of the compared figures.
2. 10,000 operating points in one call: wall time, CPU time, peak traced memory (tracemalloc sees
   numpy's allocations) and the process's peak resident size.

Run from the repository root: python3 bench/engine.py [--quick]
"""

from __future__ import annotations

import argparse
import os
import resource
import sys
import time
import tracemalloc
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from docgen.engine import Circuit, simulate  # noqa: E402
from tests.reference.test_engine_vs_scipy import CASES, COMPARED, Ref  # noqa: E402


def reference_vs_engine(names: list[str]) -> None:
    print("== engine vs solve_ivp reference (same circuits) ==")
    print(f"{'case':34s} {'ref s':>8s} {'engine s':>9s} {'ratio':>8s} {'max rel diff':>13s}")
    ref_total = eng_total = 0.0
    worst = 0.0
    refs = {}
    for name in names:
        params = CASES[name]
        t0 = time.perf_counter()
        ref = Ref(**params).steady()
        t_ref = time.perf_counter() - t0
        refs[name] = ref
        simulate(Circuit(**params))  # warm-up (imports, caches)
        reps = 5
        t0 = time.perf_counter()
        for _ in range(reps):
            got = simulate(Circuit(**params))
        t_eng = (time.perf_counter() - t0) / reps
        diff = max(abs(got.point(0)[k] / ref[k] - 1.0) for k in COMPARED)
        worst = max(worst, diff)
        ref_total += t_ref
        eng_total += t_eng
        print(f"{name:34s} {t_ref:8.3f} {t_eng:9.4f} {t_ref / t_eng:8.0f} {diff:13.2e}")
    n = len(names)
    print(
        f"per operating point: reference {ref_total / n:.3f} s, engine (1 point per call) "
        f"{eng_total / n * 1e3:.2f} ms -> engine {ref_total / eng_total:.0f}x faster; "
        f"max relative difference {worst:.2e} over {', '.join(COMPARED)}"
    )
    # Amortised: the same circuits repeated in one vectorised call per topology/load kind.
    batch = 200
    t_batch = 0.0
    for name in names:
        params = dict(CASES[name])
        params["c"] = np.full(batch, params["c"])
        t0 = time.perf_counter()
        got = simulate(Circuit(**params))
        t_batch += time.perf_counter() - t0
        assert got.converged.all()
    per_point = t_batch / (batch * n)
    print(
        f"amortised in batches of {batch}: engine {per_point * 1e3:.3f} ms per point -> "
        f"{ref_total / n / per_point:.0f}x faster than the reference"
    )
    return refs


def steps_sweep(names, refs) -> None:
    print("== discretisation: max relative difference to the reference vs steps_per_period ==")
    for steps in (128, 256, 384, 512, 1024):
        worst = 0.0
        for name in names:
            got = simulate(Circuit(**CASES[name]), steps_per_period=steps)
            worst = max(worst, max(abs(got.point(0)[k] / refs[name][k] - 1) for k in COMPARED))
        print(f"steps_per_period={steps:5d}: max relative difference {worst:.2e}")


def ten_thousand() -> None:
    print("== 10,000 operating points in one call ==")
    print("(timed without tracing; peak memory from a second, traced run: tracemalloc slows")
    print(" numpy's many small allocations down, so its run is not timed)")
    rng = np.random.default_rng(2024)
    n = 10_000
    for topology in ("bridge", "center-tap", "half-wave"):
        circ = Circuit(
            topology,
            v_rms=12.0 * rng.uniform(0.85, 1.15, n),
            freq=50.0,
            r_s=rng.uniform(0.1, 1.0, n),
            l_s=rng.uniform(0.0, 2e-3, n),
            c=4700e-6 * rng.uniform(0.8, 1.2, n),
            esr=0.03,
            i_load=rng.uniform(0.05, 1.0, n),
        )
        t0, c0 = time.perf_counter(), time.process_time()
        got = simulate(circ, keep_waveforms=[0, n - 1])
        wall, cpu = time.perf_counter() - t0, time.process_time() - c0
        tracemalloc.start()
        simulate(circ, keep_waveforms=[0, n - 1])
        _, peak = tracemalloc.get_traced_memory()
        tracemalloc.stop()
        rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024  # KiB -> MiB on Linux
        print(
            f"{topology:10s}: {wall:5.2f} s wall ({cpu:5.2f} s CPU, all threads), "
            f"peak traced memory {peak / 2**20:6.1f} MiB, process peak RSS {rss:6.1f} MiB, "
            f"converged {int(got.converged.sum())}/{n}, mean passes {got.iterations.mean():.1f}"
        )
    load = os.getloadavg()[0]
    print(
        f"cores {os.cpu_count()}, 1-minute load average at the end {load:.1f} (other work "
        f"on the machine inflates wall times)"
    )


def switch_on_cost() -> None:
    """CPU time of the switch-on transient (until charged) against its grid, on the circuits of
    tests/reference/test_switch_on.py, with the steady-state peak as the settling reference."""
    from docgen.engine import switch_on
    from tests.reference.test_switch_on import CASES as SO_CASES

    print("== switch-on transient (until charged) ==")
    for name, params in SO_CASES.items():
        c = Circuit(**params)
        ref = simulate(c).i_d_peak
        base = None
        for steps, later in ((4000, 1000), (2000, 500), (1000, 250)):
            t0 = time.process_time()
            so = switch_on(c, steps_per_period=steps, later_steps_per_period=later,
                           settle_peak=ref)
            dt = time.process_time() - t0
            base = base or (so.i_peak[0], so.i2t[0])
            print(f"{name:26s} steps {steps:5d}/{later:4d}: {dt * 1e3:7.0f} ms CPU, "
                  f"{so.pulses[0]:3.0f} pulse periods, peak {so.i_peak[0] / base[0] - 1:+.1e}, "
                  f"I2t {so.i2t[0] / base[1] - 1:+.1e} (relative to the finest)")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="only the three fastest reference cases")
    args = ap.parse_args()
    names = sorted(CASES)
    if args.quick:
        names = [n for n in names if "_L0" in n]
    t0 = time.perf_counter()
    refs = reference_vs_engine(names)
    steps_sweep(names, refs)
    ten_thousand()
    switch_on_cost()
    print(f"benchmark took {time.perf_counter() - t0:.0f} s")


if __name__ == "__main__":
    main()
