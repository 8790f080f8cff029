"""Measure stavegen's speed and memory; write the figures to docs/benchmarks.md.

Run from the repository root with the project installed:

    python benchmarks/run_benchmarks.py            # measure and print
    python benchmarks/run_benchmarks.py --write    # also rewrite docs/benchmarks.md
    python benchmarks/run_benchmarks.py --write --before /path/to/old/venv/bin/python
                                                   # also time an older install on the same jobs

Every figure is a whole process (python -m stavegen ...): wall time from
time.perf_counter around subprocess.run and CPU time (user + system) and
peak resident memory from getrusage(RUSAGE_CHILDREN), in a fresh runner
process per measurement; the median of several runs. A process's import
cost is measured the same way on a process that only imports what the
command loaded (found by running the command once and reading sys.modules).
Worker processes started by `size` are not children the runner can wait
for, so their CPU is missing from its CPU figure; `size` is also measured
with STAVEGEN_WORKERS=1 (one process), where the CPU figure is whole.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = sorted(p for p in (ROOT / "samples").glob("*.toml") if "[boat]" not in p.read_text())  # spar files
SIZED = [ROOT / "samples" / "daysailer-mast.toml", ROOT / "samples" / "yawl-mainmast-metric.toml"]  # for `size`
GOALS = {"sample_build_over_imports": 1.3, "size_over_build": 3.0, "peak_memory_mb": 300.0}
WORKDIR = {"cwd": None}  # processes run in a scratch folder, so each python imports its own installed stavegen
HEAVY = ("numpy", "scipy", "shapely", "ezdxf", "reportlab", "pydantic", "rich", "typer")

_RUNNER = r"""
import resource, subprocess, sys, time, json, os
args, env = json.loads(sys.argv[1]), json.loads(sys.argv[2])
t = time.perf_counter()
p = subprocess.run(args, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, env={**os.environ, **env})
dt = time.perf_counter() - t
u = resource.getrusage(resource.RUSAGE_CHILDREN)
print(json.dumps({"seconds": dt, "cpu": u.ru_utime + u.ru_stime, "peak_mb": u.ru_maxrss / 1024,
                  "code": p.returncode, "stderr": p.stderr.decode()[-300:]}))
"""

_MODULES = r"""
import sys
sys.argv = ["stavegen"] + sys.argv[1:]
from stavegen.cli import main
try:
    main()
except SystemExit:
    pass
mods = sorted(m for m in sys.modules if m.startswith("stavegen") and not m.startswith("stavegen.samples"))
sys.stderr.write("\nMODULES " + " ".join(mods + sorted({m.split(".")[0] for m in sys.modules} & set(%r))) + "\n")
""" % (HEAVY,)


def measure(args: list[str], repeat: int = 5, env: dict | None = None, refused_ok: bool = False) -> dict | None:
    """Median wall and CPU time (s) and the largest peak memory (MB) of a command run ``repeat`` times; None
    when ``refused_ok`` and the command refuses its input (exit 2: an older install reading a newer sample)."""
    runs = []
    for _ in range(repeat):
        out = subprocess.run([sys.executable, "-c", _RUNNER, json.dumps(args), json.dumps(env or {})],
                             capture_output=True, text=True, check=True, cwd=WORKDIR["cwd"])
        runs.append(json.loads(out.stdout))
    codes = {r["code"] for r in runs}
    if refused_ok and codes == {2}:
        return None
    if codes - {0, 1}:
        raise SystemExit(f"{args} failed: {runs[0]['stderr']}")
    return {"seconds": statistics.median(r["seconds"] for r in runs),
            "cpu": statistics.median(r["cpu"] for r in runs),
            "peak_mb": max(r["peak_mb"] for r in runs), "runs": repeat}


def loaded_modules(py: str, command: list[str]) -> list[str]:
    """The stavegen modules and the heavy libraries a command loads."""
    done = subprocess.run([py, "-c", _MODULES] + command, capture_output=True, text=True, cwd=WORKDIR["cwd"])
    line = [x for x in done.stderr.splitlines() if x.startswith("MODULES ")]
    return line[-1].split()[1:] if line else []


def import_cost(py: str, command: list[str], repeat: int) -> dict:
    """Starting Python and importing just what ``command`` loads, measured as a process."""
    mods = loaded_modules(py, command)
    stavegen = [m for m in mods if m.startswith("stavegen")]
    figures = measure([py, "-c", "import " + ", ".join(stavegen)], repeat)
    figures["libraries"] = [m for m in mods if not m.startswith("stavegen")]
    return figures


def build_against_imports(py: str, sample: Path, tmp: Path, rounds: int) -> dict:
    """The build of ``sample`` and a process importing just what it loads, run by turns ``rounds`` times.

    On a shared machine the speed drifts over minutes; timed by turns, both figures see the same drift, and
    the ratio is the median of the rounds' ratios.
    """
    mods = [m for m in loaded_modules(py, ["build", str(sample), "-o", str(tmp / "pair-probe")])
            if m.startswith("stavegen")]
    build, imports = [], []
    for i in range(rounds):
        imports.append(measure([py, "-c", "import " + ", ".join(mods)], 1)["cpu"])
        build.append(measure([py, "-m", "stavegen", "build", str(sample), "-o", str(tmp / f"pair-{i}")], 1)["cpu"])
    return {"build": statistics.median(build), "imports": statistics.median(imports),
            "ratio": statistics.median(b / i for b, i in zip(build, imports)), "rounds": rounds}


def generated_spar(folder: Path, stations: int, staves: int | str = 16, length_m: float = 12.0,
                   wall: str = '[[0, 46], [8000, 46], [{length}, 32]]', stock: float = 48) -> Path:
    """A generated 12 m spar of ``staves`` staves whose marks and file positions give about ``stations`` stations."""
    length = length_m * 1000
    spacing = length / max(1, stations - 14)  # with the 13 file positions and plug ends: within the limit
    staves_text = f'"{staves}"' if isinstance(staves, str) else staves
    text = f"""[spar]
name = "Benchmark spar {stations}"
units = "mm"
length = {length}

[plan]
wood = "sitka-spruce"
stations = [[0, 230], [2000, 250], [8000, 250], [{length}, 140]]

[hollow]
wood = "douglas-fir-coast"
staves = {staves_text}
joint = "birdsmouth-flush"
wall = {wall.format(length=length)}

[[hollow.plug]]
from = 0
to = 900

[[hollow.plug]]
from = {length - 600}
to = {length}

[stock]
thickness = {stock}
widths = [95, 145, 195]
lengths = [3000, 3600, 4200, 4800, 6000]
kerf = 3
scarf_ratio = 10
scarf_stagger = 400
no_scarf = [[1800, 2400]]

[output]
mark_spacing = {spacing}
"""
    path = folder / f"bench-{stations}-{staves}.toml"
    path.write_text(text)
    return path


def auto_sample(folder: Path, sample: Path) -> Path:
    """A sample with its stave count (and the day-sailer's wall, tapered) left to stavegen: what `size` works on."""
    text = sample.read_text()
    for old, new in (('staves = 12', 'staves = "auto"'), ('wall = "5/8"', 'wall = "auto-tapered"')):
        text = text.replace(old, new)
    path = folder / f"auto-{sample.name}"
    path.write_text(text)
    return path


_SPLIT = r"""
import importlib, json, sys, time
from pathlib import Path
t0 = time.process_time()
for m in sys.argv[1].split():
    importlib.import_module(m)
out = {"importing what build loads (no interpreter start)": time.process_time() - t0}
import stavegen.layout.lumber as lumber
from stavegen.model.loader import load_spar
from stavegen.pipeline import design
from stavegen.render import dxf_templates
from stavegen.render.csv_cutlist import to_csv
from stavegen.render.json_doc import write_json
from stavegen.render.pdf_fullsize import write_fullsize
from stavegen.render.pdf_report import write_report
highs = [0.0]
def timed(f):
    def run(*a, **k):
        t = time.process_time()
        try:
            return f(*a, **k)
        finally:
            highs[0] += time.process_time() - t
    return run
lumber._ip, lumber._lp = timed(lumber._ip), timed(lumber._lp)
folder = Path(sys.argv[3])
def stage(name, f):
    t = time.process_time()
    got = f()
    out[name] = time.process_time() - t
    return got
result = stage("design", lambda: design(load_spar(Path(sys.argv[2])), layout=True))
out["HiGHS"] = highs[0]
stage("JSON and CSV", lambda: (write_json(result, folder / "a.json"), to_csv(result)))
stage("report PDF", lambda: write_report(result, folder / "r.pdf"))
stage("full-size PDF", lambda: write_fullsize(result, folder / "f.pdf"))
def sheets():
    sheet = dxf_templates.template_document(result)
    sheet.saveas(folder / "t.dxf")
    dxf_templates.cut_document(result, full=sheet).saveas(folder / "c.dxf")
stage("DXF sheets", sheets)
print(json.dumps(out))
"""


def build_split(py: str, sample: Path, tmp: Path, repeat: int) -> dict:
    """Where one build's CPU goes, in one process per run (medians): importing what ``build`` loads, the design
    (of it the HiGHS solves of the lumber orders), and each output as its library draws it."""
    mods = [m for m in loaded_modules(py, ["build", str(sample), "-o", str(tmp / "split-probe")])
            if m.startswith("stavegen")]
    runs = []
    for _ in range(repeat):
        done = subprocess.run([py, "-c", _SPLIT, " ".join(mods), str(sample), str(tmp)], capture_output=True,
                              text=True, cwd=WORKDIR["cwd"], check=True)
        runs.append(json.loads(done.stdout.splitlines()[-1]))
    return {k: statistics.median(r[k] for r in runs) for k in runs[0]}


def section_timing(count: int = 2000) -> tuple[float, float]:
    """Microseconds per exact section evaluation and per closed-form check (16 flush staves), in this process."""
    sys.path.insert(0, str(ROOT))
    from stavegen.model.spar import Joint
    from stavegen.section.properties import evaluate_section
    from stavegen.sizing.targets import rounded_ring

    t = time.perf_counter()
    for i in range(count):
        evaluate_section(16, Joint("birdsmouth-flush"), 100 + i * 1e-3, 30.0, 1.5)
    exact = (time.perf_counter() - t) / count * 1e6
    t = time.perf_counter()
    for i in range(count * 20):
        rounded_ring(16, 100 + i * 1e-4, 30.0, 1.5)
    return exact, (time.perf_counter() - t) / (count * 20) * 1e6


def run_jobs(py: str, tmp: Path, repeat: int, growth: bool = True) -> dict:
    results: dict = {}
    results["floor"] = measure([py, "-c", "import stavegen.cli, stavegen.build, stavegen.pipeline, "
                                "stavegen.layout.plan, stavegen.sizing.count, stavegen.render.json_doc, "
                                "stavegen.render.csv_cutlist, stavegen.render.dxf_templates, "
                                "stavegen.render.pdf_report, stavegen.render.pdf_fullsize"], repeat)
    results["bare floor"] = measure([py, "-c", "import stavegen.cli"], repeat)
    for sample in SAMPLES:  # an older install (growth off: the "before" run) may not read a newer sample
        for what, args in (("build", ["build", str(sample), "-o", str(tmp / sample.stem)]),
                           ("check", ["check", str(sample)])):
            found = measure([py, "-m", "stavegen", *args], repeat, refused_ok=not growth)
            if found is not None:
                results[f"{what} {sample.name}"] = found
    for sample in SIZED:  # the day-sailer's mast (inches, tapered wall solved) and the yawl's (mm)
        auto = auto_sample(tmp, sample)
        results[f"size {sample.name}"] = measure([py, "-m", "stavegen", "size", str(auto)], repeat)
        results[f"size {sample.name}, one process"] = measure([py, "-m", "stavegen", "size", str(auto)], repeat,
                                                              {"STAVEGEN_WORKERS": "1"})
        results[f"build {auto.name}"] = measure([py, "-m", "stavegen", "build", str(auto), "-o",
                                                 str(tmp / auto.stem)], repeat)
    if growth:
        for n in (100, 1000, 8000):
            spar = generated_spar(tmp, n)
            runs = 3 if n < 8000 else 1
            results[f"check {n} stations"] = measure([py, "-m", "stavegen", "check", str(spar), "--json"], runs)
            results[f"build {n} stations"] = measure([py, "-m", "stavegen", "build", str(spar), "-o",
                                                      str(tmp / f"b{n}")], runs)
        results["build 8000 stations, 24 staves"] = measure(
            [py, "-m", "stavegen", "build", str(generated_spar(tmp, 8000, staves=24)), "-o", str(tmp / "b24")], 1)
        for n in (100, 1000):
            spar = generated_spar(tmp, n, staves="auto", wall='"auto"', stock=72)
            results[f"size {n} stations"] = measure([py, "-m", "stavegen", "size", str(spar)], 1)
            results[f"size {n} stations, one process"] = measure([py, "-m", "stavegen", "size", str(spar)], 1,
                                                                 {"STAVEGEN_WORKERS": "1"})
    return results


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--from-json", help="only write docs/benchmarks.md from a saved run (last-run.json)")
    parser.add_argument("--write", action="store_true", help="rewrite docs/benchmarks.md")
    parser.add_argument("--repeat", type=int, default=5)
    parser.add_argument("--before", help="python of an older install: time it on the same sample jobs")
    opts = parser.parse_args()
    if opts.from_json:
        write_doc(json.loads(Path(opts.from_json).read_text()))
        return
    py = sys.executable
    results: dict = {"machine": f"{platform.machine()}, {os.cpu_count()} cores, {platform.python_version()}, "
                                f"{platform.platform()}", "load before": os.getloadavg()[0]}
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        WORKDIR["cwd"] = tmp
        results["jobs"] = run_jobs(py, tmp, opts.repeat)
        results["imports"] = {}
        for name, command in (("check", ["check", str(SIZED[0])]),
                              ("check --json", ["check", str(SIZED[0]), "--json"]),
                              ("section", ["section", str(SIZED[0]), "--at", "5 ft"]),
                              ("woods", ["woods"]),
                              ("init", ["init", str(tmp / "starter.toml"), "--force"]),
                              ("build", ["build", str(SIZED[0]), "-o", str(tmp / "imports")]),
                              ("size", ["size", str(auto_sample(tmp, SIZED[0]))])):
            results["imports"][name] = import_cost(py, command, opts.repeat)
        results["split"] = build_split(py, SIZED[0], tmp, opts.repeat)
        results["pair"] = build_against_imports(py, SIZED[0], tmp, max(7, opts.repeat))
        results["pairs"] = {sample.name: build_against_imports(py, sample, tmp, 3)
                            for sample in sorted((ROOT / "samples").glob("*.toml"))}
        results["split runs"] = opts.repeat
        if opts.before:
            (tmp / "before").mkdir()
            results["before"] = run_jobs(opts.before, tmp / "before", opts.repeat, growth=False)
            results["before imports"] = {
                name: import_cost(opts.before, command, opts.repeat)
                for name, command in (("check", ["check", str(SIZED[0])]),
                                      ("build", ["build", str(SIZED[0]), "-o", str(tmp / "before-imports")]))}
    results["load after"] = os.getloadavg()[0]
    results["section_us"], results["closed_form_us"] = section_timing()
    for key, value in results["jobs"].items():
        print(f"{key}: {value['seconds']:.3f} s wall, {value['cpu']:.3f} s CPU, peak {value['peak_mb']:.0f} MB")
    for key, value in results["imports"].items():
        print(f"imports of {key}: {value['cpu']:.3f} s CPU ({' '.join(value['libraries'])})")
    print("one build, in process: " + ", ".join(f"{k} {v:.3f} s" for k, v in results["split"].items()))
    (ROOT / "benchmarks" / "last-run.json").write_text(json.dumps(results, indent=2) + "\n")
    if opts.write:
        write_doc(results)


def _row(key: str, value: dict, before: dict | None) -> str:
    was = ""
    if before and key in before:
        b = before[key]
        was = f"{b['seconds']:.2f} s / {b['cpu']:.2f} s"
    return (f"| {key} | {was} | {value['seconds']:.2f} s / {value['cpu']:.2f} s | {value['peak_mb']:.0f} |")


def write_doc(results: dict) -> None:
    jobs, imports, before = results["jobs"], results["imports"], results.get("before")
    rows = [_row(k, v, before) for k, v in jobs.items() if k not in ("floor", "bare floor")]
    pair = results.get("pair") or {"build": jobs["build daysailer-mast.toml"]["cpu"],
                                   "imports": imports["build"]["cpu"], "rounds": 0}
    build_cpu, import_cpu = pair["build"], pair["imports"]
    build_ratio = pair.get("ratio", build_cpu / import_cpu)
    size_ratios = {s.name: jobs[f"size {s.name}"]["seconds"] / jobs[f"build {s.name}"]["seconds"]
                   for s in SIZED}
    size_cpu_ratios = {s.name: jobs[f"size {s.name}, one process"]["cpu"] / jobs[f"build {s.name}"]["cpu"]
                       for s in SIZED}
    peaks = [v["peak_mb"] for v in jobs.values()]
    check = [jobs[f"check {n} stations"]["cpu"] for n in (100, 1000, 8000)]
    build = [jobs[f"build {n} stations"]["cpu"] for n in (100, 1000, 8000)]
    size = [jobs[f"size {n} stations, one process"]["cpu"] for n in (100, 1000)]
    import_rows = []
    for name, value in imports.items():
        was = ""
        if results.get("before imports", {}).get(name):
            was = f"{results['before imports'][name]['cpu']:.2f} s"
        import_rows.append(f"| {name} | {was} | {value['cpu']:.2f} s | {', '.join(value['libraries'])} |")
    text = f"""# Benchmarks

Speed and memory targets live here and in `benchmarks/`, never in timed
tests. The whole-process figures below are written by
`python benchmarks/run_benchmarks.py --write` (rerun it after a change that
could affect speed; `--before PYTHON` times an older install on the same
jobs); the lumber figures further down by `python benchmarks/bench_lumber.py`.

## Whole process

- Machine: {results['machine']}; load average {results['load before']:.1f} when the run
  started and {results['load after']:.1f} when it ended (a shared machine: wall times
  swing with the load, CPU times much less).
- Method: each figure is a whole process (`python -m stavegen ...`), the
  median of several runs (one run for the largest spars): wall time from
  `time.perf_counter` around `subprocess.run`, CPU time (user + system) and
  peak memory from `getrusage(RUSAGE_CHILDREN)`. `size` shares its work
  with worker processes (`stavegen/sizing/parallel.py`) whose CPU the runner
  cannot count; "one process" runs set `STAVEGEN_WORKERS=1`.
- Generated spar: 12 m, 16 flush-birdsmouth staves (24 where said),
  tapered wall, two plugs, with `mark_spacing` set to give about 100, 1,000
  or 8,000 stations (8,000 is the most stavegen accepts; 1,000 when it
  compares every stave count). The `size` runs leave the stave count (and
  the day-sailer mast's wall, tapered) to stavegen; "build auto-..." builds
  that file, choosing its count on the way (its layout is the chosen
  count's, not made again).

| run | before: wall / CPU | now: wall / CPU | peak MB |
| --- | ---: | ---: | ---: |
{chr(10).join(rows)}

Exact section evaluation (16 staves, flush): {results['section_us']:.0f} µs each; the
closed form the sizing searches on: {results['closed_form_us']:.1f} µs.

### Imports of each command

CPU of starting Python and importing what the command loads (found by
running it), and the libraries among them. `check`, `section`, `woods` and
`init` load no scipy, ezdxf, reportlab or pydantic.

| command | before | now | libraries loaded |
| --- | ---: | ---: | --- |
{chr(10).join(import_rows)}

### Against the goals

| goal | measured | met |
| --- | --- | --- |
| a sample build within {GOALS['sample_build_over_imports']} × the CPU of importing what it needs (the two run by turns, {pair['rounds']} rounds, medians) | day-sailer mast: {build_cpu:.2f} s against {import_cpu:.2f} s, {build_ratio:.2f} × | {"yes" if build_ratio <= GOALS['sample_build_over_imports'] else "no"} |
| `size` under 3 × one build of the sample as given (wall) | {", ".join(f"{k}: {v:.2f} ×" for k, v in size_ratios.items())} | {"yes" if max(size_ratios.values()) < 3 else "no"} |
| the same in CPU, one process | {", ".join(f"{k}: {v:.2f} ×" for k, v in size_cpu_ratios.items())} | {"yes" if max(size_cpu_ratios.values()) < 3 else "no"} |
| peak memory under 300 MB | worst {max(peaks):.0f} MB | {"yes" if max(peaks) < 300 else "no"} |
| check CPU linear in stations (100 → 1,000 → 8,000) | {check[0]:.2f} s → {check[1]:.2f} s → {check[2]:.2f} s | {(check[2] - check[1]) / 7000 * 1e3:.2f} ms a station past 1,000, {(check[1] - check[0]) / 900 * 1e3:.2f} ms before |
| build CPU linear in stations | {build[0]:.2f} s → {build[1]:.2f} s → {build[2]:.2f} s | {(build[2] - build[1]) / 7000 * 1e3:.2f} ms a station past 1,000, {(build[1] - build[0]) / 900 * 1e3:.2f} ms before |
| size CPU linear in stations (100 → 1,000) | {size[0]:.2f} s → {size[1]:.2f} s | {(size[1] - size[0]) / 900 * 1e3:.2f} ms a station |
"""
    pairs = results.get("pairs")
    if pairs:
        goal = GOALS["sample_build_over_imports"]
        met = sum(v["ratio"] <= goal for v in pairs.values())
        pair_rows = "\n".join(f"| {k} | {v['build']:.2f} s | {v['imports']:.2f} s | {v['ratio']:.2f} × |"
                              for k, v in pairs.items())
        text += f"""
### Every sample against its imports

Each bundled sample (a boat file builds every spar in it) built by turns
with a process importing what that build loads, 3 rounds each, medians; a
rough figure on this machine (single rounds of one sample swing by a
tenth or more). {met} of {len(pairs)} are within the {goal} × goal.

| sample | build CPU | imports CPU | ratio |
| --- | ---: | ---: | ---: |
{pair_rows}
"""
    split = results.get("split")
    if split:
        drawing = split["HiGHS"] + split["report PDF"] + split["full-size PDF"] + split["DXF sheets"]
        floor = (import_cpu + drawing) / import_cpu
        goal = GOALS["sample_build_over_imports"]
        verdict = (f"The {goal} × goal sits below what HiGHS, ezdxf and reportlab take to prove the cutting plan "
                   "and draw the six files (cProfile, 2026-12-02: stavegen's own renderer code is about 7 % of the "
                   "DXF's and the report's time and a quarter of the full-size PDF's)." if floor > goal else
                   f"That leaves {(goal - 1) * import_cpu - drawing:.2f} s for "
                   f"stavegen's own work within the {goal} × goal.")
        stage_rows = "\n".join(f"| {k} | {v:.3f} s |" for k, v in split.items())
        text += f"""
### Where a build's CPU goes

The day-sailer mast built in one process, each stage timed with
`time.process_time` (`build_split` in the runner; medians of
{results.get("split runs", "several")} runs). "HiGHS" is the part of the design spent in the
lumber orders' LP and integer solves; the outputs are each written by
their library from what the layout computed.

| stage | CPU |
| --- | ---: |
{stage_rows}

The solves and the outputs alone come to {drawing:.2f} s: with the
imports ({import_cpu:.2f} s as a process, run by turns with the build) that is {floor:.2f} × the
imports before any of stavegen's own design work. {verdict}
"""
    doc = ROOT / "docs" / "benchmarks.md"
    # Keep the hand-written sections (from "### What profiling found" on).
    old = doc.read_text() if doc.exists() else ""
    keep = old[old.index("### What profiling found"):] if "### What profiling found" in old else ""
    doc.write_text(text + ("\n" + keep if keep else ""))


if __name__ == "__main__":
    main()
