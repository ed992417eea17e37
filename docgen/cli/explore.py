"""The command line of the search, self-contained so that it plugs into the CLI with two calls:
``add_parser(sub)`` adds `docgen explore`, ``add_design_option(build_parser)`` adds
`build --design`; ``handle(args)`` and ``build_best(specs, args)`` run them."""

from __future__ import annotations

import argparse
import math
from pathlib import Path

from ..explore import DEFAULT_BUDGET
from ..explore.objectives import OBJECTIVES

EXPLORE_EXIT = """\
exit status:
  0  a design that passes every check was found
  1  no candidate passes (or the file's own requirements cannot be met)
  2  bad input (file, field or option named)
"""


def _budget(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"expected at least 1, got {value}")
    return value


def add_parser(sub) -> argparse.ArgumentParser:
    """`docgen explore SPEC`: search the parts library for the best design."""
    p = sub.add_parser(
        "explore", help="search the parts library for the best design of a spec",
        description="Enumerate the combinations of library parts (transformer, rectifier, "
        "capacitor, regulator parts; each heat sink and resistor is sized with them), drop "
        "those a hand bound rules out, verify the rest with the waveform engine at their "
        "worst-case corners, and rank the ones that pass every check. The design that "
        "`docgen build` gives is always among them. Writes OUT/<spec name>-explore/ with the "
        "trade-off plot; `docgen build --design best` builds the best one.",
        epilog=EXPLORE_EXIT, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("spec", metavar="SPEC", type=Path)
    p.add_argument("--objective", choices=tuple(OBJECTIVES), default="cost",
                   help="what 'best' means (default: cost)")
    p.add_argument("--budget", type=_budget, default=DEFAULT_BUDGET, metavar="N",
                   help=f"verify at most N candidates (default {DEFAULT_BUDGET})")
    p.add_argument("--versus", choices=tuple(o for o in OBJECTIVES if o != "cost"),
                   default="dissipation",
                   help="the objective the trade-off plot sets against cost (default: "
                   "dissipation)")
    p.add_argument("--all", action="store_true",
                   help="verify every candidate the hand bounds leave, also those whose parts "
                   "alone cost more than the best found (a fuller trade-off plot)")
    p.add_argument("--sensitivity", action="store_true",
                   help="also search again with the ripple limit +-20 %%, the hottest ambient "
                   "+-10 K and the load current +-10 %%, and show the best cost of each")
    p.add_argument("--top", type=_budget, default=5, metavar="N",
                   help="rows of the table of the best candidates (default 5)")
    p.add_argument("-o", "--out", type=Path, default=Path("out"),
                   help="output folder (default: ./out)")
    p.add_argument("-q", "--quiet", action="store_true", help="print nothing on stdout")
    p.add_argument("-v", "--verbose", action="store_true",
                   help="print the time of each step on stderr")
    return p


def add_design_option(build: argparse.ArgumentParser) -> None:
    build.add_argument("--design", choices=("greedy", "best"), default="greedy",
                       help="greedy: size stage by stage (default); best: the cheapest design "
                       "of a search of the parts library (see `docgen explore`)")


def _reporter(args):
    from ..progress import StageReporter

    if args.quiet:
        return None
    reporter = StageReporter(timings=args.verbose, label="explore")
    return reporter if (reporter.live or reporter.timings) else None


def handle(args) -> int:
    """Run `docgen explore`."""
    from ..explore import search as search_mod
    from ..explore.document import currency_of
    from ..explore.text import front_points, space_sentence, table, why_sentence
    from ..jobs.output import prepare_dir, safe_stem, write_atomic
    from ..progress import reporting
    from ..spec import load_requirements
    from ..units import format_quantity as fq

    loaded = load_requirements(args.spec)
    with reporting(_reporter(args)):
        result = search_mod.search(loaded, objective=args.objective, budget=args.budget,
                                   exhaustive=args.all)
        yield_text = _best_yield(loaded, result)
        steps = []
        if args.sensitivity:
            from ..explore.sensitivity import sensitivity

            steps = sensitivity(loaded, budget=args.budget)
    currency = currency_of(loaded)
    out_dir = args.out / (safe_stem(args.spec) + "-explore")
    prepare_dir(out_dir)
    svg = _plot(result, currency, args.versus)
    write_atomic(out_dir / "tradeoff.svg", svg)
    if args.quiet:
        return 0 if result.best is not None else 1
    print(space_sentence(result))
    if result.budget_reached:
        print(f"candidate budget reached: {result.budget} verified of {result.candidates}; "
              "raise --budget to search the rest (the best below is the best of those "
              "verified)")
    print(why_sentence(result, currency))
    if yield_text:
        print(yield_text)
    print()
    print(table(result, currency, args.top), end="")
    if steps:
        print("\nsensitivity (best cost with one requirement stepped):")
        base = result.best.cost if result.best is not None else math.nan
        for s in steps:
            unit = {"output[0].ripple_max": "V", "environment.ambient_max": "degC",
                    "output[0].load_max": "A"}[s.field]
            if math.isfinite(s.best_cost):
                delta = f"{s.best_cost - base:+.2f} {currency}".strip()
                cost = f"{s.best_cost:.2f} {currency} ({delta})"
            else:
                cost = "no candidate passes"
            print(f"  {s.what} {s.step} ({fq(s.value, unit, 3)}): {cost}")
    pts, _ = front_points(result, "cost", args.versus)
    print(f"\ntrade-off plot ({len(pts)} feasible candidates): {out_dir / 'tradeoff.svg'}")
    if result.best is not None and args.objective == "cost":
        print("build the best one with: docgen build --design best " + str(args.spec))
    elif result.best is not None:
        print("note: docgen build --design best builds the best by cost")
    return 0 if result.best is not None else 1


def _best_yield(loaded, result) -> str:
    """The Monte Carlo yield of the best design: the pipeline's full run of it."""
    from ..errors import InfeasibleDesign
    from ..explore.search import best_loaded
    from ..pipeline import run
    from ..progress import stage

    if result.best is None:
        return ""
    with stage("Monte Carlo of the best design"):
        try:
            design = run(best_loaded(loaded, result))
        except InfeasibleDesign as exc:
            return f"The best design could not be built again: {exc}"
    mc = design.monte_carlo
    if not mc or not mc.get("samples"):
        return f"The best design is {design.status.upper()} (Monte Carlo is off in the file)."
    return (f"The best design is {design.status.upper()}; Monte Carlo yield "
            f"{mc['yield'] * 100:.1f} % of {mc['samples']} samples (seed {mc['seed']}).")


def _plot(result, currency: str, versus: str = "dissipation") -> str:
    from ..explore.document import tradeoff_data
    from ..render.explore_plot import tradeoff_svg

    data = tradeoff_data(result, currency, versus)
    return tradeoff_svg(data.pop("points"), data.pop("front"), data.pop("greedy"),
                        data.pop("chosen"), **data)


def build_best(specs: list[Path], args) -> int:
    """`docgen build --design best`: search each spec, then build its best design."""
    from ..explore.document import best_design
    from ..jobs.build import build_one
    from ..jobs.incremental import invalidate_stamp, out_dir_for
    from ..progress import reporting
    from .build import pdf_option

    worst = 0
    for path in specs:
        # the outputs will not be the greedy build's: a later plain build must rebuild
        invalidate_stamp(out_dir_for(path, args.out))
        with reporting(_reporter(args)):
            result = build_one(path, args.out, pdf=pdf_option(args), design=best_design)
        status = result.status
        worst = max(worst, 1 if status in ("fail", "infeasible") or
                    (status == "warn" and args.strict) else 0)
        if not args.quiet:
            if status == "infeasible":
                print(f"{path}: INFEASIBLE: {result.reason}")
            else:
                print(f"{path}: {status.upper()} (searched design) -> {result.out_dir}/")
    return worst

