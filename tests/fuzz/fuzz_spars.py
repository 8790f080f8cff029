"""Mutate the sample spar files and check that every run ends well.

"Well" means: exit code 0, 1 or 2; on exit 2 exactly one line on stderr,
starting "stavegen: " and free of terminal control characters; on 0 and 1
nothing on stderr; no control character on stdout; never exit 3 (an internal error), never a traceback.

Not part of the test suite (it takes minutes): run it by hand,

    python tests/fuzz/fuzz_spars.py --cases 3000 --seed 1 [--jobs 2] [--show 10]

Each case is one to three mutations of a sample: values scaled by ten, cut
by ten, negated, zeroed, made huge (1e308, 10**400, "1/999…9"), a digit
slipped, a unit slip, a type changed, a key deleted, misspelt or renamed
with markup or control characters, list entries dropped or repeated; or a
text-level edit (a line deleted, repeated or cut short, a character
changed). Cases run in-process in a fork pool, ``check`` for most and
``build`` or ``section`` for some, each under a time limit (a run over it
is counted as slow, not as a failure: run-away work is its own issue).
The counts by outcome are printed at the end; the exit status is 1 when
any case ended badly.
"""

from __future__ import annotations

import argparse
import copy
import json
import multiprocessing
import os
import random
import signal
import sys
import tempfile
import time
import tomllib
import warnings
from collections import Counter
from pathlib import Path

import tomlkit

ROOT = Path(__file__).resolve().parents[2]
SAMPLES = sorted((ROOT / "samples").glob("*.toml"))
CONTROL = {chr(c) for c in range(32)} - {"\t", "\n", "\r"} | {chr(127)} | {chr(c) for c in range(0x80, 0xA0)}

ODD_TEXT = ["[/]", "[bold]x", "\x1b[2J\x1b]0;title\x07", "x" * 10000, "", " ", "1/8", "1/" + "9" * 5000,
            "9" * 400 + "/1", "1e400", "-0", "12 furlongs", "3 ft 4 in 5 mm", "\u202eevil", "名前", "auto",
            "4 3/0", "0/0", ".", "1/8 in", "6.4 m", "12'", "1 1/2 1/2"]
ODD_KEYS = ["stavs", "wal", "lenght", "[/]", "\x1b[2J", "x" * 300, "a.b", "", " ", "名前", "kerf ", "Staves"]
HUGE = [10 ** 309, 10 ** 400, 1e308, float("inf"), float("nan"), -1e308, 2 ** 63, 1e-320]


class Slow(BaseException):
    """Raised by the alarm: escapes the command's own ``except Exception``."""


def _paths(node, prefix=()):
    """Every (container, key) pair in the parsed document."""
    out = []
    if isinstance(node, dict):
        for k, v in node.items():
            out.append((node, k, prefix + (k,)))
            out += _paths(v, prefix + (k,))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            out.append((node, i, prefix + (i,)))
            out += _paths(v, prefix + (i,))
    return out


def _slip_digit(value, rng):
    text = repr(value) if isinstance(value, float) else str(value)
    digits = [i for i, c in enumerate(text) if c.isdigit()]
    if not digits:
        return value
    i = rng.choice(digits)
    op = rng.randrange(3)
    if op == 0:
        text = text[:i] + rng.choice("0123456789") + text[i:]  # an extra digit: [900, 1100] for [900, 110]
    elif op == 1 and len(digits) > 1:
        text = text[:i] + text[i + 1:]
    else:
        text = text[:i] + rng.choice("0123456789") + text[i + 1:]
    try:
        return type(value)(text) if not isinstance(value, str) else text
    except ValueError:
        return text


def _new_value(value, rng):
    r = rng.random()
    if isinstance(value, bool):
        return rng.choice([not value, 1, "yes", [value]])
    if isinstance(value, (int, float)):
        ops = [lambda v: v * 10, lambda v: v / 10, lambda v: -v, lambda v: 0, lambda v: rng.choice(HUGE),
               lambda v: _slip_digit(v, rng), lambda v: f"{v} m", lambda v: f"{v} in", lambda v: str(v),
               lambda v: [v], lambda v: {"x": v}, lambda v: True, lambda v: rng.choice(ODD_TEXT),
               lambda v: float(v) + 0.5, lambda v: int(v) if v == v and abs(v) < 1e18 else v]
        return rng.choice(ops)(value)
    if isinstance(value, str):
        ops = [lambda v: rng.choice(ODD_TEXT), lambda v: _slip_digit(v, rng), lambda v: v + " mm",
               lambda v: v.replace("ft", "in"), lambda v: v.upper(), lambda v: v[: rng.randrange(len(v) + 1)],
               lambda v: 3, lambda v: [v], lambda v: v + rng.choice(ODD_TEXT)[:20]]
        return rng.choice(ops)(value)
    if isinstance(value, list):
        v = list(value)
        op = rng.randrange(6)
        if op == 0 and v:
            v.pop(rng.randrange(len(v)))
        elif op == 1 and v:
            v.insert(rng.randrange(len(v)), copy.deepcopy(rng.choice(v)))
        elif op == 2:
            v.reverse()
        elif op == 3:
            v = []
        elif op == 4:
            v = "auto"
        else:
            v.append(rng.choice([0, -1, "x", [1, 2, 3], 10 ** 400]))
        return v
    if isinstance(value, dict):
        return rng.choice([{}, "x", [value], 1])
    return value if r < 0.5 else None


def slip_data(data: dict, rng: random.Random) -> dict:
    """One or two slips of the kind a builder makes: a digit added, dropped or changed, or a factor of ten."""
    data = copy.deepcopy(data)
    for _ in range(rng.choice([1, 1, 2])):
        spots = [(c, k) for c, k, _ in _paths(data) if isinstance(c[k], (int, float, str))
                 and not isinstance(c[k], bool) and any(ch.isdigit() for ch in str(c[k]))]
        if not spots:
            break
        container, key = rng.choice(spots)
        value = container[key]
        if isinstance(value, (int, float)) and rng.random() < 0.3:
            container[key] = value * 10 if rng.random() < 0.5 else value / 10
        else:
            container[key] = _slip_digit(value, rng)
    return data


def mutate_data(data: dict, rng: random.Random) -> dict:
    data = copy.deepcopy(data)
    for _ in range(rng.choice([1, 1, 2, 3])):
        spots = _paths(data)
        if not spots:
            break
        container, key, _ = rng.choice(spots)
        op = rng.random()
        if op < 0.6:
            new = _new_value(container[key], rng)
            if new is None:
                continue
            container[key] = new
        elif op < 0.75:
            if isinstance(container, dict):
                del container[key]
            else:
                container.pop(key)
        elif op < 0.95 and isinstance(container, dict):
            name = str(key)
            kind = rng.randrange(4)
            if kind == 0 and len(name) > 2:
                i = rng.randrange(len(name))
                new_name = name[:i] + name[i + 1:]
            elif kind == 1 and len(name) > 2:
                i = rng.randrange(len(name) - 1)
                new_name = name[:i] + name[i + 1] + name[i] + name[i + 2:]
            elif kind == 2:
                new_name = rng.choice(ODD_KEYS)
            else:
                new_name = name + name[-1]
            if new_name not in container:
                container[new_name] = container.pop(key)
        elif isinstance(container, dict):
            container[rng.choice(ODD_KEYS)] = rng.choice([1, "x", [1], {"a": 1}])
    return data


def mutate_text(text: str, rng: random.Random) -> str:
    lines = text.splitlines(keepends=True)
    op = rng.randrange(6)
    i = rng.randrange(len(lines))
    if op == 0:
        del lines[i]
    elif op == 1:
        lines.insert(i, lines[i])
    elif op == 2:
        j = rng.randrange(len(lines))
        lines[i], lines[j] = lines[j], lines[i]
    elif op == 3:
        return text[: rng.randrange(len(text))]
    elif op == 4 and lines[i]:
        k = rng.randrange(len(lines[i]))
        lines[i] = lines[i][:k] + rng.choice("0123456789.,=[]\"'#x \x00") + lines[i][k + 1:]
    else:
        lines.insert(i, rng.choice(["[x]\n", "[[hollow.plug]]\n", "[hollow]\n", "units = \"mm\"\n"]))
    return "".join(lines)


def make_case(seed: int, index: int, mode: str = "all") -> tuple[str, str, bytes]:
    """(sample name, command, file bytes) of case ``index``."""
    rng = random.Random(seed * 1_000_003 + index)
    sample = rng.choice(SAMPLES)
    text = sample.read_text(encoding="utf-8")
    if mode == "slips":
        body = tomlkit.dumps(slip_data(tomllib.loads(text), rng)).encode("utf-8")
    elif rng.random() < 0.25:
        body = mutate_text(text, rng).encode("utf-8", "surrogatepass")
    else:
        body = tomlkit.dumps(mutate_data(tomllib.loads(text), rng)).encode("utf-8", "surrogatepass")
    r = rng.random()
    command = "check" if r < 0.85 else ("build" if r < 0.95 else "section")
    return sample.name, command, body


def _alarm(signum, frame):
    raise Slow()


def run_case(args) -> dict:
    seed, index, limit, mode = args
    from typer.testing import CliRunner

    from stavegen.cli import app

    sample, command, body = make_case(seed, index, mode)
    with tempfile.TemporaryDirectory(prefix="stavegen-fuzz-") as tmp:
        path = Path(tmp) / "case.toml"
        path.write_bytes(body)
        argv = [command, str(path)]
        if command == "build":
            argv += ["-o", str(Path(tmp) / "out")]
        elif command == "section":
            argv += ["--at", "0"]
        signal.signal(signal.SIGALRM, _alarm)
        signal.alarm(limit)
        started = time.process_time()
        try:
            with warnings.catch_warnings():
                warnings.simplefilter("always")
                result = CliRunner().invoke(app, argv)
            code, out, err = result.exit_code, result.stdout, result.stderr
            if result.exception is not None and not isinstance(result.exception, SystemExit):
                code, err = "exception", f"{type(result.exception).__name__}: {result.exception}"
        except Slow:
            code, out, err = "slow", "", ""
        finally:
            signal.alarm(0)
        cpu = time.process_time() - started
        left = sorted(p.name for p in (Path(tmp) / "out").iterdir()) if (Path(tmp) / "out").exists() else []
    verdict = judge(code, err, command, left, out)
    return {"index": index, "sample": sample, "command": command, "code": code, "verdict": verdict,
            "stderr": err[:400], "cpu": round(cpu, 2)}


def judge(code, err: str, command: str, left: list[str], out: str = "") -> str:
    if code == "slow":
        return "slow"
    if any(c in CONTROL for c in out):
        return "control character in the output"  # rich writes no escapes to a pipe: this came from the file
    if code not in (0, 1, 2):
        return f"bad exit {code}"
    if "Traceback" in err:
        return "traceback"
    lines = err.strip().splitlines()
    if code == 2:
        if len(lines) != 1:
            return "exit 2, not one line"
        if not lines[0].startswith("stavegen: "):
            return "exit 2, not a stavegen message"
        if any(c in CONTROL for c in lines[0]):
            return "control character in the message"
        if len(lines[0]) > 600:
            return "message over 600 characters"
        if command == "build" and left:
            return "exit 2 but files left"
        return "ok"
    if lines:
        return f"exit {code} with stderr"
    return "ok"


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--cases", type=int, default=1000)
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--mode", choices=("all", "slips"), default="all",
                        help="all: every kind of mutation; slips: only digits slipped and factors of ten")
    parser.add_argument("--jobs", type=int, default=os.cpu_count() or 1)
    parser.add_argument("--limit", type=int, default=60, help="CPU-free seconds per case before it counts as slow")
    parser.add_argument("--show", type=int, default=5, help="cases to print for each bad verdict")
    parser.add_argument("--log", type=Path, help="write every case's result here (JSON lines)")
    parser.add_argument("--dump", type=int, help="print case INDEX's file and command, and stop")
    opts = parser.parse_args()
    if opts.dump is not None:
        sample, command, body = make_case(opts.seed, opts.dump, opts.mode)
        sys.stdout.write(f"# {command} (from {sample})\n")
        sys.stdout.buffer.write(body)
        return 0
    import stavegen.cli  # noqa: F401  (imported once, before the fork)
    import stavegen.pipeline  # noqa: F401

    started = time.time()
    counts: Counter = Counter()
    codes: Counter = Counter()
    bad: dict[str, list[dict]] = {}
    log = opts.log.open("w") if opts.log else None
    ctx = multiprocessing.get_context("fork")
    with ctx.Pool(opts.jobs, maxtasksperchild=200) as pool:
        jobs = [(opts.seed, i, opts.limit, opts.mode) for i in range(opts.cases)]
        for n, res in enumerate(pool.imap_unordered(run_case, jobs, chunksize=4), start=1):
            counts[res["verdict"]] += 1
            codes[str(res["code"])] += 1
            if res["verdict"] != "ok":
                bad.setdefault(res["verdict"], []).append(res)
            if log:
                log.write(json.dumps(res) + "\n")
            if n % 250 == 0:
                print(f"{n} cases, {dict(counts)}", file=sys.stderr)
    if log:
        log.close()
    print(f"{opts.cases} cases (seed {opts.seed}, {opts.mode}) in {time.time() - started:.0f} s")
    print("exit codes: " + ", ".join(f"{k}: {v}" for k, v in sorted(codes.items())))
    print("verdicts:   " + ", ".join(f"{k}: {v}" for k, v in counts.most_common()))
    for verdict, cases in bad.items():
        print(f"\n{verdict} ({len(cases)}):")
        for res in cases[: opts.show]:
            print(f"  case {res['index']} ({res['command']} {res['sample']}): {res['stderr'][:300]!r}")
    failed = sum(v for k, v in counts.items() if k not in ("ok", "slow"))
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
