"""The quick ways of sizing and choosing a stave count give the answers of the slow ones.

References: Roark's Formulas for Stress and Strain (regular polygon of
apothem a: s = 2 a tan(π/N), A = N s a / 2, I = A (12 a² + s²) / 48; disc
I = π R⁴ / 4) for the closed-form section; the full search at every point on
the exact section (the sizing's own slow path) for the quick searches; every
count laid out for the pruned comparison; scipy's LAPACK tridiagonal
eigenvalue solver (an independent general-purpose library) for the Euler load.
"""

from __future__ import annotations

import math
import os
import re
import subprocess
import sys
from dataclasses import replace

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import stavegen.sizing.count as count
from stavegen.checks.assess import assess
from stavegen.errors import DesignError
import stavegen.sizing.solve as solve_module
from stavegen.checks.beam import least_eigenvalue
from stavegen.model.loader import load_spar, parse_spar
from stavegen.model.spar import Joint
from stavegen.section.properties import evaluate_section
from stavegen.sizing.count import board_feet_floor, compare_stave_counts
from stavegen.sizing.parallel import Pool
from stavegen.sizing.solve import solve
from stavegen.sizing.targets import CLOSED_FORM_TOLERANCE, rounded_ring

from conftest import ROOT, SAMPLES, spar_dict
from test_sizing import sample_data


@settings(max_examples=150, deadline=None)
@given(staves=st.integers(4, 24), radius=st.floats(15, 300), allowance=st.floats(0, 3),
       share=st.floats(0.05, 0.95), bevel=st.booleans())
def test_closed_form_equals_the_exact_section(staves, radius, allowance, share, bevel):
    """Flush and bevel sections: disc less the regular N-gon bore (Roark) equals the exact integration."""
    joint = Joint("bevel" if bevel or staves == 4 else "birdsmouth-flush")
    thinnest = radius + allowance - radius * math.cos(math.pi / staves)
    wall = thinnest + share * (radius - thinnest)
    try:
        exact = evaluate_section(staves, joint, radius, wall, allowance)
    except Exception:  # geometry the joint cannot build: nothing to compare
        return
    quick = rounded_ring(staves, radius, wall, allowance)
    scale = math.pi * radius**4 / 4  # the disc's I: the error of a difference is measured against its terms
    assert abs(quick.inertia - exact.inertia) <= 10 * CLOSED_FORM_TOLERANCE * scale
    assert abs(quick.area - exact.area) <= 10 * CLOSED_FORM_TOLERANCE * math.pi * radius**2
    assert quick.bore_inertia == pytest.approx(exact.bore_inertia, rel=1e-12)
    assert quick.bore.area == pytest.approx(exact.bore.area, rel=1e-12)


def _full_search_only(monkeypatch):
    monkeypatch.setattr(solve_module, "SEARCHES", ((False, False),))


CASES = [
    ("daysailer-mast.toml", {"wall": "auto"}),
    ("daysailer-mast.toml", {"wall": "auto-tapered"}),
    ("yawl-mainmast-metric.toml", {"wall": "auto"}),
    ("yawl-mainmast-metric.toml", {"wall": "auto-tapered", "joint": "bevel"}),
    ("yawl-mainmast-metric.toml", {"wall": "auto", "joint": "birdsmouth-centered"}),
    ("daysailer-mast.toml", {"stations": "auto"}),
]


@pytest.mark.parametrize("name, hollow", CASES, ids=[f"{n.split('-')[0]}-{'-'.join(map(str, h.values()))}"
                                                      for n, h in CASES])
def test_quick_search_finds_what_the_full_search_finds(name, hollow, monkeypatch):
    """Skipping points already met and searching on the closed form change neither the size nor the words.

    Words to roundoff: where a tapered wall makes a ratio equal at every station, which station is named
    as the least is roundoff's choice. And one exception, for the better: the full search of a centred
    notch probes walls at a stretch's middle that the joint cannot build and gives up; the quick one never
    searches there (the wall that binds elsewhere builds and holds), so its answer passes the exact check
    everywhere or it refuses for what binds.
    """
    spar = parse_spar(sample_data(name, **hollow), name)
    try:
        quick = solve(spar)
    except DesignError as exc:
        quick = exc
    _full_search_only(monkeypatch)
    try:
        full = solve(spar)
    except DesignError as exc:
        assert hollow.get("joint") == "birdsmouth-centered", exc.problem
        assert isinstance(quick, DesignError) or assess(quick.spar).passed
        return
    assert not isinstance(quick, DesignError), quick
    assert assess(quick.spar).passed

    def words(lines):  # the least ratios' places dropped where the ratio prints as its target
        return [re.sub(r"(1\.0\d\d) at [^,;]*", r"\1", line) for line in lines]

    assert words(quick.lines) == words(full.lines)
    for mine, theirs in ((quick.spar.hollow.wall, full.spar.hollow.wall),
                         (quick.spar.hollow.diameter, full.spar.hollow.diameter)):
        assert mine.z == theirs.z
        assert np.allclose(mine.value, theirs.value, rtol=1e-9, atol=0)


def test_quick_search_refuses_as_the_full_search_does(monkeypatch):
    """A wall the stock cannot give: the same one-line refusal either way."""
    data = sample_data("daysailer-mast.toml", wall="auto")
    data["stock"]["thickness"] = 0.5
    spar = parse_spar(data, "daysailer-mast.toml")
    with pytest.raises(DesignError) as quick:
        solve(spar)
    _full_search_only(monkeypatch)
    with pytest.raises(DesignError) as full:
        solve(spar)
    assert type(quick.value) is type(full.value) and str(quick.value) == str(full.value)
    assert "stock is too thin" in str(quick.value)


@pytest.fixture(scope="module")
def auto_spars(tmp_path_factory):
    folder = tmp_path_factory.mktemp("counts")
    out = []
    for name, changes in (("daysailer-mast.toml", {"staves = 12": 'staves = "auto"', 'wall = "5/8"': 'wall = "auto"'}),
                          ("yawl-mainmast-metric.toml", {"staves = 12": 'staves = "auto"'})):
        text = (SAMPLES / name).read_text()
        for old, new in changes.items():
            assert old in text
            text = text.replace(old, new)
        path = folder / name
        path.write_text(text)
        out.append(load_spar(path))
    return out


def test_floor_is_never_above_the_order(auto_spars):
    """Every count that meets the target with a workable stave, laid out: its order is at least its floor."""
    for spar in auto_spars:
        compared = compare_stave_counts(spar, Pool(1))
        assert any(c.floor > 0 for c in compared.candidates)
        for c in compared.candidates:
            if c.floor <= 0:
                continue
            laid = c if c.layout is not None else count._laid_out(c, count.SectionCache(c.spar))
            if laid.layout is not None:
                assert c.floor <= laid.layout.lumber.to_buy_board_feet, c.staves


def test_pruning_changes_neither_the_choice_nor_the_runner_up(auto_spars, monkeypatch):
    """Counts ruled out by their floor: with no floor every count is laid out; with the tightest valid floor
    (each count's own order) most are ruled out; the choice, the runner-up and every order laid out agree."""
    for spar in auto_spars:
        monkeypatch.setattr(count, "board_feet_floor", lambda spar, result: 1e-9)  # nothing can be ruled out
        every = compare_stave_counts(spar, Pool(1))
        orders = {c.staves: c.board_feet for c in every.candidates if c.board_feet is not None}
        monkeypatch.setattr(count, "board_feet_floor", lambda spar, result: orders.get(spar.hollow.staves, 1e-9))
        pruned = compare_stave_counts(spar, Pool(1))
        monkeypatch.undo()
        assert sum(c.outbid for c in pruned.candidates) >= 2
        assert pruned.chosen.staves == every.chosen.staves
        assert pruned.chosen.board_feet == every.chosen.board_feet
        assert pruned.reason.split(" (next")[1:] == every.reason.split(" (next")[1:]
        runner_up = sorted(c.board_feet for c in every.candidates if c.eligible)[1]
        for mine, theirs in zip(pruned.candidates, every.candidates):
            if mine.outbid:
                assert theirs.board_feet >= runner_up and "not laid out" in mine.why_not()
            else:
                assert mine.board_feet == theirs.board_feet


def test_worker_processes_change_nothing(auto_spars):
    """The same comparison with one process and with a pool of workers, whoever finishes first (on the yawl's
    mast: the pool's share-out is the same whatever the spar, and its comparison is the quicker of the two)."""
    spar = auto_spars[1]
    alone = compare_stave_counts(spar, Pool(1))
    shared = compare_stave_counts(spar, Pool(3))
    assert shared.reason == alone.reason
    assert [(c.staves, c.board_feet, c.verdict(), c.floor, c.cuts) for c in shared.candidates] == \
           [(c.staves, c.board_feet, c.verdict(), c.floor, c.cuts) for c in alone.candidates]


def test_the_chosen_count_is_laid_out_once(auto_spars, monkeypatch):
    """A build of a spar whose stave count is chosen uses the layout made to choose it."""
    import stavegen.layout.plan as plan
    from stavegen.pipeline import design

    monkeypatch.setenv("STAVEGEN_WORKERS", "1")
    calls = []
    real = plan.lay_out

    def counting(*args, **kwargs):
        calls.append(args[0].hollow.staves)
        return real(*args, **kwargs)

    monkeypatch.setattr(plan, "lay_out", counting)
    monkeypatch.setattr(count, "lay_out", counting)
    result = design(auto_spars[0], layout=True)
    assert len(calls) == len(set(calls))  # no count twice
    assert result.spar.hollow.staves in calls and result.layout is not None


def test_euler_eigenvalue_against_lapack():
    """The chain's least eigenvalue by inverse iteration on its known K⁻¹ against LAPACK's tridiagonal solver."""
    from scipy.linalg import eigh_tridiagonal

    rng = np.random.default_rng(16)
    for n in (3, 50, 2000):
        lengths = rng.uniform(0.5, 2.0, n)
        weights = rng.uniform(0.5, 2.0, n)  # lumped at the free node and the inner ones; the last node held
        stiff = np.zeros(n + 1)
        stiff[:-1] += 1 / lengths
        stiff[1:] += 1 / lengths
        scale = 1 / np.sqrt(weights)
        diag = stiff[:n] * scale**2
        off = -1 / lengths[:-1] * scale[:-1] * scale[1:]
        lapack = eigh_tridiagonal(diag, off, select="i", select_range=(0, 0), eigvals_only=True)[0]
        assert least_eigenvalue(lengths, weights) == pytest.approx(lapack, rel=1e-9)


def test_check_loads_no_solver_drawing_or_pdf_library():
    """`check` of a resolved spar imports neither scipy, ezdxf, reportlab nor pydantic (a test of what is
    loaded, not of time: the cost of each command's imports is in the benchmarks)."""
    script = ("import sys\nfrom stavegen.cli import main\nsys.argv = ['stavegen', 'check', sys.argv[1]]\n"
              "try:\n    main()\nexcept SystemExit:\n    pass\n"
              "sys.stderr.write(' '.join(m for m in ('scipy', 'ezdxf', 'reportlab', 'pydantic') if m in sys.modules))")
    done = subprocess.run([sys.executable, "-c", script, str(SAMPLES / "daysailer-mast.toml")], cwd=ROOT,
                          capture_output=True, text=True, env=dict(os.environ))
    assert done.returncode == 0, done.stderr
    assert done.stderr.strip() == ""
