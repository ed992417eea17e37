"""The argparse parser: every subcommand, option and help text.

A new option goes beside its subcommand's others here, and its handling in that
subcommand's module; a new subcommand adds a block here and a line in dispatch.HANDLERS.
"""

from __future__ import annotations

import argparse
from pathlib import Path

from .. import __version__
from .explore import add_design_option
from .explore import add_parser as add_explore
from .help_text import (
    BUILD_EXIT,
    CHECK_EXIT,
    COMPLETION_EXIT,
    DIFF_EXIT,
    EPILOG,
    NEW_EXIT,
    SCHEMA_EXIT,
)


def _sub(sub, name: str, help_text: str, description: str, epilog: str):
    return sub.add_parser(name, help=help_text, description=description, epilog=epilog,
                          formatter_class=argparse.RawDescriptionHelpFormatter)


def _output_options(p: argparse.ArgumentParser, verbose_help: str) -> None:
    """--format, -q and -v, shared by check, build and diff."""
    p.add_argument("--format", choices=("text", "json"), default="text",
                   help="text for people (default) or one JSON object on stdout")
    loud = p.add_mutually_exclusive_group()
    loud.add_argument("-q", "--quiet", action="store_true",
                      help="print nothing on stdout but the JSON of --format json; errors "
                      "still go to stderr and the exit status tells the verdict")
    loud.add_argument("-v", "--verbose", action="store_true", help=verbose_help)


def build_parser() -> argparse.ArgumentParser:
    """Every subcommand and option; shell completion is generated from this parser."""
    from ..starter import REGULATORS

    p = argparse.ArgumentParser(
        prog="docgen",
        description="Size a small mains-powered linear DC supply from a requirements file and "
        "write a traced design document (HTML, PDF and results.json).",
        epilog=EPILOG,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("--version", action="version", version=f"docgen {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    b = _sub(sub, "build", "build the design document for one or more specs",
             "Build OUT/<spec name>/ with report.html, report.pdf, results.json, bom.csv, "
             "bom-stresses.csv and the plots. A folder builds every .toml spec in it.",
             BUILD_EXIT)
    b.add_argument("specs", nargs="+", metavar="SPEC_OR_DIR", type=Path)
    b.add_argument("-o", "--out", type=Path, default=Path("out"),
                   help="output folder (default: ./out)")
    b.add_argument("--no-pdf", action="store_true", help="write HTML and results.json only")
    b.add_argument("--body-only", action="store_true",
                   help="leave the appendices out of the PDF (report.html keeps everything)")
    b.add_argument("--strict", action="store_true", help="treat warnings as failures")
    b.add_argument("--force", action="store_true",
                   help="rebuild even when the outputs are up to date")
    b.add_argument("-j", "--jobs", type=positive_int, default=None, metavar="N",
                   help="worker processes for several specs (default: number of CPUs)")
    _output_options(b, "print the time of each stage of a single build on stderr")
    add_design_option(b)

    c = _sub(sub, "check", "validate, size and check; print the result",
             "Validate and compute without writing files; print each failing or marginal "
             "check with its corner and margin.", CHECK_EXIT)
    c.add_argument("specs", nargs="+", metavar="SPEC", type=Path,
                   help="requirements files or folders; '-' reads one from standard input")
    c.add_argument("--strict", action="store_true", help="treat warnings as failures")
    _output_options(c, "print passing checks too, and each stage's time on stderr")

    d = _sub(sub, "diff", "show what a requirements change does to the design",
             "Compute two versions of a requirements file and list what changed: "
             "requirements, values, parts, checks, cautions and the overall status. Give two "
             "files, or one file and --rev to compare it with its content at a git revision.",
             DIFF_EXIT)
    d.add_argument("specs", nargs="+", metavar="SPEC", type=Path,
                   help="OLD NEW, or one SPEC with --rev")
    d.add_argument("--rev", metavar="REV",
                   help="compare SPEC with its content at this git revision (e.g. HEAD, main~3)")
    d.add_argument("--threshold", type=non_negative_float, default=1e-9, metavar="REL",
                   help="smallest relative change of a value or margin to report (default 1e-9)")
    d.add_argument("-o", "--out", type=Path, metavar="FILE",
                   help="also write an HTML change report to FILE")
    _output_options(d, "print the time of reading and computing each side on stderr")

    n = _sub(sub, "new", "print or write a commented starter requirements file",
             "Print a commented starter requirements file, or write it to PATH (never "
             "overwriting an existing file). The output block fits the regulator kind asked.",
             NEW_EXIT)
    n.add_argument("path", nargs="?", type=Path, help="file to create; '-' or none: stdout")
    n.add_argument("--regulator", choices=REGULATORS, default="zener",
                   help="regulator kind of the starter's output (default: zener)")

    s = _sub(sub, "schema", "print a JSON Schema (requirements file or results.json)",
             "Print the JSON Schema of the requirements file (for editors and TOML language "
             "servers; quantities accept a number or a string with units), of results.json, or "
             "of the --format json output of check, build or diff.",
             SCHEMA_EXIT)
    s.add_argument("which", choices=("requirements", "results", "check", "build", "diff"),
                   help="requirements file, results.json, or the --format json output of "
                   "check, build or diff")

    add_explore(sub)

    k = _sub(sub, "completion", "print a shell completion script",
             "Print a completion script for bash or zsh, generated from docgen's own "
             "argument parser.", COMPLETION_EXIT)
    k.add_argument("shell", choices=("bash", "zsh"))
    return p


def positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 1:
        raise argparse.ArgumentTypeError(f"expected a whole number of at least 1, got {text!r}")
    return value


def non_negative_float(text: str) -> float:
    import math

    try:
        value = float(text)
    except ValueError:
        value = -1.0
    if not (math.isfinite(value) and value >= 0):
        raise argparse.ArgumentTypeError(f"expected a number of 0 or more, got {text!r}")
    return value
