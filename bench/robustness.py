"""Hostile and careless input, generated: count tracebacks, wrong exit codes, lost files,
unescaped output and the longest run.

Every cause of issue 17 has a generator below (and a regression test in
tests/e2e/test_hostile_input.py). Most generated inputs fail validation in milliseconds; the ones
that reach the design run with Monte Carlo off. Cases run in-process through the CLI's main()
(SystemExit caught); only the special files, the lock and the killed builds use a subprocess.

The expected verdict of each case is known from how it was made: "bad" inputs must exit 2 with
a message naming the file (and the field, where there is one); "valid" inputs may pass, fail or
be infeasible (exit 0 or 1, never 2); "any" inputs may do any of these but must say why.

    python bench/robustness.py                   # 5,000 inputs, seed 1 (about 10 minutes)
    python bench/robustness.py --count 300 --seed 7
"""

from __future__ import annotations

import argparse
import contextlib
import io
import os
import random
import re
import signal
import subprocess
import sys
import tempfile
import time
import traceback
from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from docgen.cli import main  # noqa: E402
from tests.conftest import DEMO, DEMO_STANDALONE, standalone  # noqa: E402
from tests.e2e.test_robustness import FIELDS, _replace, _toml_value  # noqa: E402

BASE = DEMO_STANDALONE.replace("samples = 400", "samples = 0")


def _no_monte_carlo(text: str) -> str:
    text = standalone(text)
    return text.replace("samples = 400", "samples = 0") if "[analysis]" in text else \
        text + "\n[analysis]\nsamples = 0\n"


# Every demo spec (bridge, center-tap, half-wave, split; zener, follower, regulators) is a base.
BASES = [BASE] + [_no_monte_carlo(p.read_text()) for p in sorted((ROOT / "specs").glob("*.toml"))
                  if p != DEMO]
LIBRARY = (ROOT / "specs" / "parts" / "demo-parts.toml").read_text()
QUANTITY_FIELDS = FIELDS + [("transformer", "winding_resistance"), ("protection", "safe_voltage"),
                            ("protection", "discharge_time"), ("reservoir", "tolerance"),
                            ("environment", "required_life"), ("margins", "warn_band")]
CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069]")
INTERNAL = ("float division by zero", "ZeroDivisionError", "Traceback", "math domain error",
            "object has no attribute",
            "NoStandardValue", "OverflowError", "RecursionError")
UNICODE_DIGITS = "\u0660\u0661\u0664\u06f3\u0966\u09e7\uff11\uff15\U0001d7d8\u0e51"


@dataclass
class Case:
    cause: str
    text: str | None = None  # requirements file text (None: argv given whole)
    expect: str = "any"  # "bad" (exit 2) | "valid" (0 or 1) | "any"
    names: str = ""  # a text the error must contain when the exit is 2
    argv: list[str] | None = None
    files: dict[str, bytes] = field(default_factory=dict)  # extra files beside the spec
    raw: bytes | None = None  # requirements file bytes (instead of text)


# --------------------------------------------------------------------------- value generators

SAMPLES = ["0 V", "-5 mA", "nan V", "inf A", "1e308 V", "12 parsecs", "", " ", "4700 uF",
           "10 %", "230 V", "50 Hz", "45 degC", "1e-30 A", "0 ohm", "3 kV", "999 A", "1 MHz",
           "1e-308", "5e-324 V", "0.125 V", "'", '"', "\\", "1 V\n2 V"]


def garbage(rng: random.Random):
    kind = rng.randrange(6)
    if kind == 0:
        return rng.choice([float("nan"), float("inf"), -float("inf"), 0.0, -0.0, -1.0, 1e300,
                           1e-308, 5e-324, rng.uniform(-1e6, 1e6), rng.uniform(0, 1)])
    if kind == 1:
        return rng.choice([0, -1, 1, rng.randint(-10**12, 10**12), 2**63, -(2**63)])
    if kind == 2:
        return rng.random() < 0.5
    if kind == 3:
        return "".join(rng.choice("0123456789.eE+- mVAkHzuF%degCohm") for _ in
                       range(rng.randrange(10)))
    if kind == 4:
        return rng.choice(SAMPLES)
    return rng.choice(["\x1b[31m", "\u202e", "\x00", "<b>", "=1+1", "\r", "\x07"]) + \
        rng.choice(SAMPLES)


def _field(rng: random.Random) -> tuple[str, str]:
    return rng.choice(QUANTITY_FIELDS)


def _set(text: str, section: str, key: str, value: str) -> str:
    if f"[{section}]" not in text and section != "output":
        text += f"\n[{section}]\n"  # [output.x] at the end belongs to the last [[output]]
    return _replace(text, section, key, value)


# ----------------------------------------------------------------------- one generator per cause

def gen_field_garbage(rng, base):
    sec, key = _field(rng)
    return Case("any value in any field", _set(base, sec, key, _toml_value(garbage(rng))))


PLAIN_NUMBER_FIELDS = [("analysis", "samples"), ("analysis", "seed"),
                       ("output.zener", "min_current_factor"), ("output.transistor", "h_fe_min")]


def gen_huge_integer(rng, base):
    sec, key = _field(rng) if rng.random() < 0.8 else rng.choice(PLAIN_NUMBER_FIELDS)
    digits = rng.choice([310, 400, 1000, 4300])
    value = str(rng.choice([1, -1]) * (10 ** (digits - 1) + rng.randrange(10**6)))
    return Case("integer too wide for a float", _set(base, sec, key, value), "bad",
                key)


def gen_long_literal(rng, base):
    sec, key = _field(rng)
    return Case("integer literal over 4300 digits",
                _set(base, sec, key, "9" * rng.randint(4301, 20000)), "bad")


def gen_deep_nesting(rng, base):
    depth = rng.choice([33, 100, 1000, 2000, 5000])
    value = ("[" * depth + "]" * depth) if rng.random() < 0.5 else \
        ("{a=" * depth + "1" + "}" * depth)
    return Case("nesting ~2000 deep", base + f"x = {value}\n", "bad")


def gen_dotted_key(rng, base):
    parts = rng.choice([65, 1000, 20000, 60000])
    key = ".".join(rng.choice(["a", '"q"', "b1"]) for _ in range(parts))
    return Case("very long dotted key", base + key + " = 1\n", "bad")


def gen_library_path(rng, base):
    ref = rng.choice(["a\\u0000b", "x\\u001b[2J", "../outside.toml", "/etc/passwd",
                      "https://example.invalid/p.toml", "~/p.toml", "../../../../etc/hostname",
                      "sub/../../outside.toml", "missing.toml", "/dev/zero", "."])
    return Case("parts library path (NUL, outside, URL)",
                base + f'\n[parts]\nlibrary = "{ref}"\n', "bad", "parts.library")


def gen_library_content(rng, base):
    lib = LIBRARY
    for _ in range(rng.randint(1, 3)):
        kind = rng.randrange(6)
        lines = lib.splitlines()
        quantity_lines = [i for i, ln in enumerate(lines) if "=" in ln and '"' in ln
                          and not ln.lstrip().startswith(("#", "id", "description", "name"))]
        i = rng.choice(quantity_lines)
        key = lines[i].split("=")[0].strip()
        if kind == 0:
            lines[i] = f"{key} = {_toml_value(garbage(rng))}"
        elif kind == 1:
            lines[i] = f"{key} = {10 ** rng.choice([310, 1000])}"
        elif kind == 2:
            lines[i] = f"{key} = " + "[" * 3000 + "]" * 3000
        elif kind == 3:
            lines.insert(i, "bogus_" + "\x1b" * rng.randint(0, 1) + f"key{i} = 1")
        elif kind == 4:
            lines[i] = lines[i].replace('"', "", 1)
        else:
            lines[i] = f'{key} = "{rng.choice(UNICODE_DIGITS)}{rng.choice(UNICODE_DIGITS)} V"'
        lib = "\n".join(lines) + "\n"
    return Case("mutated parts library", base + '\n[parts]\nlibrary = "parts.toml"\n', "any",
                files={"parts.toml": lib.encode("utf-8", "surrogatepass")})


def gen_bleeder(rng, base):
    extra = rng.choice([f'discharge_time = "{rng.choice([0.001, 0.1, 1, 30, 1e4])} s"',
                        f'safe_voltage = "{rng.choice([1e-9, 1e-3, 0.5, 5, 500])} V"'])
    return Case("bleeder with odd discharge_time / safe_voltage",
                base + f"\n[protection]\nbleeder = true\n{extra}\n", "valid")


def gen_zero(rng, base):
    sec, key = _field(rng)
    return Case("zero in a quantity (division by zero)",
                _set(base, sec, key, rng.choice(["0", "0.0", '"0 ohm"', '"0 V"', '"0 %"'])))


def gen_mains(rng, base):
    value = rng.choice([0.125, 0.5, 1, 5, 12, 24, 48, 100, 127, 400, 690, 999])
    return Case("odd mains voltage (fuse sizing)", _set(base, "mains", "nominal", str(value)),
                "valid")


def gen_unicode_digits(rng, base):
    sec, key = _field(rng)
    digits = "".join(rng.choice(UNICODE_DIGITS) for _ in range(rng.randint(1, 4)))
    return Case("unicode digits as numbers", _set(base, sec, key, f'"{digits} V"'), "bad", key)


def gen_control_chars(rng, base):
    esc = rng.choice(["\\u001b[31m", "\\u001b]0;pwned\\u0007", "\\u202e", "\\u0008" * 5,
                      "\\r", "\\u009b2J"])
    where = rng.randrange(3)
    if where == 0:
        return Case("terminal escapes in a key", base + f'\n["k{esc}x"]\ny = 1\n', "bad")
    if where == 1:
        return Case("terminal escapes in a value", _set(base, *_field(rng), f'"{esc}1 V"'), "bad")
    return Case("terminal escapes in the title",
                base.replace('title = "', f'title = "{esc}', 1), "valid")


def gen_huge_value(rng, base):
    n = rng.choice([1000, 10_000, 100_000, 400_000])
    sec, key = _field(rng)
    return Case("huge value echoed", _set(base, sec, key, '"' + "x" * n + '"'), "bad", key)


def gen_many_keys(rng, base):
    n = rng.choice([50, 2000, 20000])
    section = rng.choice(["mains", "environment", "rectifier"])
    keys = "".join(f"k{i} = 1\n" for i in range(n))
    return Case("many unknown keys", base.replace(f"[{section}]", f"[{section}]\n{keys}", 1),
                "bad", "more problems")


def gen_extreme_float(rng, base):
    sec, key = _field(rng)
    return Case("extreme float formatting",
                _set(base, sec, key, rng.choice(["1e-308", "5e-324", "1.7976931348623157e308",
                                                 '"1e-300 V"', "-1e-308"])))


def gen_bom(rng, base):
    return Case("UTF-8 byte-order mark", raw=b"\xef\xbb\xbf" + base.encode(), expect="bad",
                names="byte-order mark")


def gen_samples(rng, base):
    n = rng.choice([10_001, 100_000, 10**9, -1])
    return Case("analysis.samples bound", base.replace("samples = 0", f"samples = {n}"), "bad",
                "analysis.samples")


def gen_quotes(rng, base):
    value = rng.choice(["'", '"', "it's", 'a "b"', "\\", "x" * 200 + "'"])
    sec, key = _field(rng)
    return Case("quotes in a value", _set(base, sec, key, _toml_value(value)), "bad", key)


def gen_binary(rng, base):
    blob = bytes(rng.randrange(256) for _ in range(rng.randint(1, 300)))
    cut = rng.randrange(len(base))
    raw = base[:cut].encode() + blob + base[cut:].encode()
    return Case("binary bytes in the file", raw=raw, expect="any")


GENERATORS = [  # (weight, generator): mostly inputs refused in milliseconds
    (18, gen_field_garbage), (5, gen_huge_integer), (3, gen_long_literal), (4, gen_deep_nesting),
    (3, gen_dotted_key), (6, gen_library_path), (8, gen_library_content), (2, gen_bleeder),
    (4, gen_zero), (2, gen_mains), (4, gen_unicode_digits), (5, gen_control_chars),
    (3, gen_huge_value), (2, gen_many_keys), (4, gen_extreme_float), (1, gen_bom),
    (3, gen_samples), (4, gen_quotes), (5, gen_binary),
]


# --------------------------------------------------------------------------- running and judging

@dataclass
class Tally:
    tried: int = 0
    tracebacks: int = 0
    wrong_exit: int = 0
    files_lost: int = 0
    unescaped: int = 0
    internal: int = 0
    longest: float = 0.0
    longest_cause: str = ""
    codes: Counter = field(default_factory=Counter)
    causes: Counter = field(default_factory=Counter)
    problems: list[str] = field(default_factory=list)

    def problem(self, kind: str, cause: str, detail: str) -> None:
        setattr(self, kind, getattr(self, kind) + 1)
        if len(self.problems) < 40:
            self.problems.append(f"{kind}: [{cause}] {detail[:300]!r}")


def run_main(argv: list[str]) -> tuple[int | None, str, str, str]:
    """(exit code, stdout, stderr, traceback text or "") of one in-process CLI call."""
    out, err = io.StringIO(), io.StringIO()
    tb = ""
    try:
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = main(argv)
    except SystemExit as exc:  # argparse
        code = exc.code if isinstance(exc.code, int) else 2
    except Exception:  # noqa: BLE001 - counting exactly these is the point
        code, tb = None, traceback.format_exc()
    return code, out.getvalue(), err.getvalue(), tb


def judge(t: Tally, case: Case, spec: Path, code, out: str, err: str, tb: str,
          seconds: float) -> None:
    t.tried += 1
    t.causes[case.cause] += 1
    t.codes[code] += 1
    if seconds > t.longest:
        t.longest, t.longest_cause = seconds, case.cause
    if tb or "Traceback" in out + err:
        t.problem("tracebacks", case.cause, tb.strip().splitlines()[-1] if tb else err)
        return
    text = out + err
    if CONTROL.search(text) or any(len(line) > 1000 for line in text.splitlines()) \
            or len(text) > 20_000:
        t.problem("unescaped", case.cause, text)
    if any(word in text for word in INTERNAL):
        t.problem("internal", case.cause, text)
    wrong = ""
    if code not in (0, 1, 2):
        wrong = f"exit {code}"
    elif case.expect == "bad" and code != 2:
        wrong = f"expected exit 2, got {code}"
    elif case.expect == "valid" and code == 2:
        wrong = "expected a verdict (0 or 1), got 2"
    elif code == 2 and not (err.startswith("docgen: error: ")
                            and any(n in err for n in (spec.name, *case.files))):
        wrong = "exit 2 without a message naming the file"
    elif code == 2 and case.names and case.names not in err:
        wrong = f"exit 2 without naming {case.names!r}"
    elif code == 1 and not ("INFEASIBLE" in out or "FAIL" in out):
        wrong = "exit 1 without a failing check or an infeasible verdict"
    if wrong:
        t.problem("wrong_exit", case.cause, f"{wrong}: {text}")


def run_case(t: Tally, case: Case, folder: Path, k: int) -> None:
    folder.mkdir(parents=True, exist_ok=True)
    for name, data in case.files.items():
        (folder / name).write_bytes(data)
    (folder.parent / "outside.toml").write_text("schema = 1\nsecret_outside_key = 1\n")
    spec = folder / f"case{k}.toml"
    data = case.raw if case.raw is not None else case.text.encode("utf-8", "surrogatepass")
    spec.write_bytes(data)
    start = time.perf_counter()
    code, out, err, tb = run_main(case.argv or ["check", str(spec)])
    seconds = time.perf_counter() - start
    judge(t, case, spec, code, out, err, tb, seconds)
    if "secret_outside_key" in out + err:
        t.problem("unescaped", case.cause, "leaked a key name of a file outside the project")
    if spec.read_bytes() != data:
        t.problem("files_lost", case.cause, "the requirements file was changed")


# --------------------------------------------------------------------------- builds and specials

def build_cases(t: Tally, tmp: Path, rng: random.Random, count: int) -> None:
    """Builds into one folder (--no-pdf): feasible, infeasible, injected part ids; a user's own
    file in the output folder and the spec must survive; no stale report beside an infeasible
    result; bom.csv cells never start a formula; leftover temporary files are removed."""
    out = tmp / "out"
    spec = tmp / "b" / "s.toml"
    spec.parent.mkdir(parents=True)
    lib = LIBRARY.replace('id = "', 'id = "=X')
    (spec.parent / "parts.toml").write_text(lib)
    for k in range(count):
        variant = rng.randrange(4)
        text = BASE
        if variant == 1:
            text += '\n[protection]\nbleeder = true\ndischarge_time = "0.1 s"\n'  # infeasible
        elif variant == 2:
            text += '\n[parts]\nlibrary = "parts.toml"\n'
        elif variant == 3:
            text = text.replace('title = "', 'title = "<script>x</script>\\u001b[2J', 1)
        spec.write_text(text)
        folder = out / "s"
        if folder.is_dir():
            (folder / "notes.txt").write_text("user file")
            (folder / ".report.html.abcdefgh.tmp").write_text("left by a killed build")
        start = time.perf_counter()
        code, stdout, stderr, tb = run_main(["build", str(spec), "-o", str(out), "--no-pdf"])
        case = Case("build into one folder", text, "valid")
        judge(t, case, spec, code, stdout, stderr, tb, time.perf_counter() - start)
        if spec.read_text() != text or (k and (folder / "notes.txt").read_text() != "user file"):
            t.problem("files_lost", case.cause, "spec or a user's file changed")
        if (folder / ".report.html.abcdefgh.tmp").exists():
            t.problem("wrong_exit", case.cause, "leftover temporary file not removed")
        if variant == 1 and any((folder / n).exists() for n in ("report.html", "bom.csv",
                                                                 "plots")):
            t.problem("files_lost", case.cause, "stale report beside an infeasible result")
        if variant != 1 and (folder / "bom.csv").exists():
            cells = (folder / "bom.csv").read_text()
            if re.search(r'(^|,)"?[=+@]', cells, re.M):
                t.problem("unescaped", case.cause, "bom.csv cell starts a formula")
        if variant == 3 and "<script>x" in (folder / "report.html").read_text():
            t.problem("unescaped", case.cause, "markup in the title reached the HTML")


def special_cases(t: Tally, tmp: Path) -> None:
    """Special files, a held lock and killed builds: in subprocesses with a timeout."""
    fifo = tmp / "fifo.toml"
    os.mkfifo(fifo)
    for argv in (["check", "/dev/zero"], ["check", str(fifo)], ["build", "/dev/zero", "-o",
                 str(tmp / "o")], ["check", "/dev/null"], ["check", str(tmp)]):
        start = time.perf_counter()
        try:
            proc = subprocess.run([sys.executable, "-m", "docgen.cli", *argv], cwd=ROOT,
                                  capture_output=True, text=True, timeout=60)
            code, out, err = proc.returncode, proc.stdout, proc.stderr
        except subprocess.TimeoutExpired:
            code, out, err = None, "", "timed out after 60 s"
        judge(t, Case("device, FIFO or folder as input", "", "bad"), Path(argv[1]), code, out,
              err, "", time.perf_counter() - start)
    # killed builds: whatever the moment, a later build removes the leftovers and succeeds
    out = tmp / "killed"
    for delay in (0.3, 0.8, 1.5, 2.5):
        proc = subprocess.Popen([sys.executable, "-m", "docgen.cli", "build", str(DEMO), "-o",
                                 str(out), "--force"], cwd=ROOT, stdout=subprocess.DEVNULL,
                                stderr=subprocess.DEVNULL)
        time.sleep(delay)
        proc.send_signal(signal.SIGKILL)
        proc.wait()
        start = time.perf_counter()
        code, stdout, stderr, tb = run_main(["build", str(DEMO), "-o", str(out), "--no-pdf"])
        judge(t, Case("rebuild after SIGKILL", "", "valid"), DEMO, code, stdout, stderr, tb,
              time.perf_counter() - start)
        left = [p.name for p in (out / DEMO.stem).rglob("*.tmp")]
        if left:
            t.problem("files_lost", "rebuild after SIGKILL", f"temporary files left: {left}")


def _git(cwd: Path, *args: str) -> None:
    subprocess.run(["git", "-c", "user.name=bench", "-c", "user.email=bench@invalid", *args],
                   cwd=cwd, check=True, capture_output=True)


def folder_cases(t: Tally, tmp: Path) -> None:
    """A held lock, a tampered output of the same size, an oversized library, diff --rev with a
    revision naming a file outside the project."""
    import fcntl

    spec = tmp / "f" / "s.toml"
    spec.parent.mkdir()
    spec.write_text(BASE)
    out = tmp / "fout"
    code, o, e, tb = run_main(["build", str(spec), "-o", str(out), "--no-pdf"])
    judge(t, Case("build into one folder", BASE, "valid"), spec, code, o, e, tb, 0.0)
    # a second build while another holds the folder's lock (another process)
    holder = subprocess.Popen(
        [sys.executable, "-c", "import fcntl, os, time\n"
         f"fd = os.open({str(out / 's' / '.docgen.lock')!r}, os.O_RDWR)\n"
         "fcntl.flock(fd, fcntl.LOCK_EX)\nprint('locked', flush=True)\ntime.sleep(60)\n"],
        stdout=subprocess.PIPE, text=True)
    try:
        holder.stdout.readline()
        start = time.perf_counter()
        code, o, e, tb = run_main(["build", str(spec), "-o", str(out), "--no-pdf", "--force"])
        judge(t, Case("concurrent build into one folder", BASE, "bad", "another docgen build",
                   files={"fout/s": b""}),
              spec, code, o, e, tb, time.perf_counter() - start)
    finally:
        holder.kill()
        holder.wait()
        holder.stdout.close()
    fd = os.open(out / "s" / ".docgen.lock", os.O_RDWR)
    fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)  # released with its holder
    os.close(fd)
    # same size, other content: must not be called up to date
    html = out / "s" / "report.html"
    data = html.read_bytes()
    html.write_bytes(data[:-8] + b"<!--x-->")
    code, o, e, tb = run_main(["build", str(spec), "-o", str(out), "--no-pdf"])
    judge(t, Case("up to date by content", BASE, "valid"), spec, code, o, e, tb, 0.0)
    if "up to date" in o or html.read_bytes() != data:
        t.problem("files_lost", "up to date by content", "a tampered report was kept")
    # an oversized parts library
    (spec.parent / "big.toml").write_bytes(b"schema = 1\n" + b"# pad\n" * 600_000)
    spec.write_text(BASE + '\n[parts]\nlibrary = "big.toml"\n')
    start = time.perf_counter()
    code, o, e, tb = run_main(["check", str(spec)])
    judge(t, Case("parts library size limit", "", "bad", "at most", files={"big.toml": b""}),
          spec, code, o, e, tb, time.perf_counter() - start)
    # diff --rev: the revision's spec names a file outside the repository
    repo = tmp / "repo"
    repo.mkdir()
    (tmp / "secret.toml").write_text("schema = 1\nsecret_outside_key = 1\n")
    rspec = repo / "s.toml"
    rspec.write_text(BASE + '\n[parts]\nlibrary = "../secret.toml"\n')
    _git(repo, "init", "-q")
    _git(repo, "add", "s.toml")
    _git(repo, "commit", "-q", "-m", "bench")
    rspec.write_text(BASE)
    start = time.perf_counter()
    code, o, e, tb = run_main(["diff", str(rspec), "--rev", "HEAD"])
    judge(t, Case("diff --rev library confinement", "", "bad", "parts.library"), rspec, code, o,
          e, tb, time.perf_counter() - start)
    if "secret_outside_key" in o + e or "docgen-diff-" in o + e:
        t.problem("unescaped", "diff --rev library confinement", "leaked an outside file")


def main_() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--count", type=int, default=5000, help="generated requirements files")
    ap.add_argument("--builds", type=int, default=12, help="builds into one folder")
    ap.add_argument("--seed", type=int, default=1)
    args = ap.parse_args()
    rng = random.Random(args.seed)
    weights = [w for w, _ in GENERATORS]
    t = Tally()
    began = time.perf_counter()
    with tempfile.TemporaryDirectory(prefix="docgen-robustness-") as tmp_name:
        tmp = Path(tmp_name)
        for k in range(args.count):
            gen = rng.choices([g for _, g in GENERATORS], weights)[0]
            base = BASE if rng.random() < 0.5 else rng.choice(BASES)  # the demo half the time
            run_case(t, gen(rng, base), tmp / f"p{k % 50}", k)
            if (k + 1) % 500 == 0:
                print(f"  {k + 1} inputs, {time.perf_counter() - began:.0f} s", file=sys.stderr)
        build_cases(t, tmp, rng, args.builds)
        folder_cases(t, tmp)
        special_cases(t, tmp)
    for line in t.problems:
        print(line)
    print(f"inputs tried: {t.tried} ({len(t.causes)} causes; seed {args.seed}; "
          f"{time.perf_counter() - began:.0f} s in all)")
    print("verdicts: " + ", ".join(f"exit {c}: {n}" for c, n in
                                   sorted(t.codes.items(), key=lambda x: str(x[0]))))
    print(f"tracebacks: {t.tracebacks} (target 0)")
    print(f"wrong exit codes: {t.wrong_exit} (target 0)")
    print(f"files lost: {t.files_lost} (target 0)")
    print(f"unescaped outputs: {t.unescaped} (target 0)")
    print(f"internal messages shown: {t.internal} (target 0)")
    print(f"longest run: {t.longest:.2f} s ({t.longest_cause})")
    print("inputs per cause: " + "; ".join(f"{c}: {n}" for c, n in sorted(t.causes.items())))
    bad = t.tracebacks + t.wrong_exit + t.files_lost + t.unescaped + t.internal
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main_())
