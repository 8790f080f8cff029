"""A build writes every output or none, and says so in one line when the machine gets in the way.

Faults are injected where they happen in life: a renderer that fails, a
rename that fails half-way through the commit, a process killed outright
between two renames, SIGTERM and SIGHUP while files are written, a full
disk (writing to /dev/full, which the kernel answers with ENOSPC), a file
name taken by a device, a folder or a fifo.
"""

import errno
import json
import os
import signal
import subprocess
import sys
import textwrap
import time

import pytest

import stavegen.build as build_module
import stavegen.outputs as outputs
from stavegen.build import output_names
from stavegen.build import write_outputs
from stavegen.model.loader import load_spar
from stavegen.pipeline import design

from conftest import ROOT, SAMPLES

EPOCH = "1700000000"  # SOURCE_DATE_EPOCH: the PDFs' dates fixed so that sets can be compared byte for byte


def _files(folder):
    return {p.name: p.read_bytes() for p in folder.iterdir()}


SAMPLE = "daysailer-mast.toml"  # passes its check; its outputs are named day-sailer-mast*
SLUG = "day-sailer-mast"


def _changed_sample(tmp_path):
    """The sample with a smaller margin: a build of it changes the JSON (and more) but keeps the file names."""
    text = (SAMPLES / SAMPLE).read_text()
    assert "margin = 0.02" in text
    changed = tmp_path / "changed.toml"
    changed.write_text(text.replace("margin = 0.02", "margin = 0.01"))
    return changed


@pytest.fixture
def old_set(run, tmp_path, monkeypatch):
    """An output folder holding a complete earlier build of the sample; returns (folder, its files)."""
    monkeypatch.setenv("SOURCE_DATE_EPOCH", EPOCH)
    out = tmp_path / "out"
    assert run(["build", SAMPLES / SAMPLE, "-o", out]).exit_code == 0
    before = _files(out)
    assert len(before) == len(output_names("x"))
    return out, before


def test_failed_renderer_leaves_previous_outputs_untouched(run, tmp_path, old_set, monkeypatch):
    out, before = old_set
    import stavegen.render.csv_cutlist as csv_cutlist

    def broken(_design):
        raise RuntimeError("renderer failed on purpose")

    monkeypatch.setattr(csv_cutlist, "to_csv", broken)
    result = run(["build", _changed_sample(tmp_path), "-o", out])
    assert result.exit_code == 3 and "renderer failed on purpose" in result.stderr
    assert _files(out) == before  # same files, same bytes, no temporary leftovers


def test_outputs_appear_only_when_complete(tmp_path, monkeypatch):
    """While writing, only hidden temporary files exist; after commit, only the final names."""
    result = design(load_spar(SAMPLES / "yawl-mainmast-metric.toml"), layout=True)
    seen = []
    real_add = build_module.OutputSet.add

    def spy(self, name, writer):
        path = real_add(self, name, writer)
        seen.append(sorted(os.listdir(self.folder)))
        return path

    monkeypatch.setattr(build_module.OutputSet, "add", spy)
    written = write_outputs(result, tmp_path)
    for listing in seen:
        assert all(name.startswith(".") and name.endswith(".part") for name in listing)
    assert sorted(os.listdir(tmp_path)) == sorted(p.name for p in written)


def test_a_rename_failing_half_way_puts_the_old_set_back(run, tmp_path, old_set, monkeypatch):
    """The third rename of the commit fails: the two done are undone, the old five files stay as they were."""
    out, before = old_set
    renames = []
    real = outputs._rename

    def failing(source, target):
        if len(renames) == 2:
            raise OSError(errno.EIO, "Input/output error")
        renames.append(target)
        real(source, target)

    monkeypatch.setattr(outputs, "_rename", failing)
    result = run(["build", _changed_sample(tmp_path), "-o", out])
    assert len(renames) == 2
    assert result.exit_code == 2, result.output
    assert "Input/output error" in result.stderr and "\n" not in result.stderr.strip()
    assert _files(out) == before


_KILLED_CHILD = textwrap.dedent("""
    import os, sys
    import stavegen.outputs as outputs
    from stavegen.build import write_outputs
    from stavegen.model.loader import load_spar
    from stavegen.pipeline import design

    done = []
    real = outputs._rename

    def dying(source, target):
        if len(done) == 2:
            os._exit(9)  # killed between two renames: no cleanup of any kind runs
        real(source, target)
        done.append(target)

    outputs._rename = dying
    write_outputs(design(load_spar(sys.argv[1]), layout=True), sys.argv[2])
""")


def test_a_build_killed_between_renames_is_finished_by_the_next(tmp_path, old_set):
    """Killed after two of five renames: the journal says so, and the next write into the folder completes the
    new set, byte for byte what an undisturbed build of it writes."""
    out, before = old_set
    changed = _changed_sample(tmp_path)
    env = dict(os.environ, SOURCE_DATE_EPOCH=EPOCH)
    child = subprocess.run([sys.executable, "-c", _KILLED_CHILD, str(changed), str(out)], env=env, cwd=ROOT,
                           capture_output=True, text=True)
    assert child.returncode == 9, child.stderr
    left = sorted(os.listdir(out))
    journals = [n for n in left if n.startswith(outputs.JOURNAL_PREFIX)]
    assert len(journals) == 1  # what a reader checks: a set is mid-commit
    visible = {n: (out / n).read_bytes() for n in left if not n.startswith(".")}
    assert 0 < sum(visible[n] != before[n] for n in before) < 5  # mixed: the fault this guards against

    fresh = tmp_path / "fresh"
    write_outputs(design(load_spar(changed), layout=True), fresh)
    expected = _files(fresh)
    assert expected != before
    with outputs.OutputSet(out):  # any later write into the folder recovers it first
        pass
    assert _files(out) == expected


def test_stale_temporaries_are_removed_by_the_next_build(run, tmp_path, old_set):
    out, before = old_set
    stale = [f".{SLUG}.json.abcd1234.stavegen.part", f".{SLUG}-report.pdf.k2j4_8zz.part",
             f".{SLUG}.json.zzzz9999.stavegen.old"]
    for name in stale:
        (out / name).write_bytes(b"half a file")
    (out / ".keep-me.part").write_text("not ours")
    (out / "notes.txt").write_text("the builder's own file")
    assert run(["build", SAMPLES / SAMPLE, "-o", out]).exit_code == 0
    assert sorted(os.listdir(out)) == sorted(list(before) + [".keep-me.part", "notes.txt"])
    assert _files(out)[f"{SLUG}.json"] == before[f"{SLUG}.json"]


_SLOW_CHILD = textwrap.dedent("""
    import sys, time
    import stavegen.render.pdf_report as pdf_report
    from stavegen.cli import main

    real = pdf_report.write_report

    def slow(result, path):
        real(result, path)
        time.sleep(60)  # the report is on disk under its temporary name; the signal comes now

    pdf_report.write_report = slow
    sys.argv = ["stavegen", "build", sys.argv[1], "-o", sys.argv[2]]
    main()
""")


@pytest.mark.parametrize("signum", [signal.SIGTERM, signal.SIGHUP])
def test_a_signal_while_writing_removes_the_temporaries(tmp_path, old_set, signum):
    out, before = old_set
    child = subprocess.Popen([sys.executable, "-c", _SLOW_CHILD, str(_changed_sample(tmp_path)), str(out)],
                             cwd=ROOT, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    deadline = time.monotonic() + 120
    while not any(n.startswith(f".{SLUG}-report.pdf.") for n in os.listdir(out)):
        assert child.poll() is None and time.monotonic() < deadline, child.stderr.read()
        time.sleep(0.02)
    child.send_signal(signum)
    _, err = child.communicate(timeout=60)
    assert child.returncode == 128 + signum, err
    assert err.strip() == f"stavegen: stopped by {signal.Signals(signum).name}; no output was changed"
    assert _files(out) == before


def test_a_full_disk_is_reported_as_such(run, tmp_path, old_set, monkeypatch):
    """The report's writer meets ENOSPC from the kernel (/dev/full): one line, exit 2, the old set untouched."""
    out, before = old_set
    import stavegen.render.pdf_report as pdf_report

    def onto_full_disk(result, path):
        with open("/dev/full", "wb") as disk:
            disk.write(b"%PDF" * 1024)

    monkeypatch.setattr(pdf_report, "write_report", onto_full_disk)
    result = run(["build", _changed_sample(tmp_path), "-o", out])
    assert result.exit_code == 2, result.output
    message = result.stderr.strip()
    assert "\n" not in message and "the disk is full" in message and f"{SLUG}-report.pdf" in message
    assert "internal error" not in message
    assert _files(out) == before


def test_a_permission_problem_is_reported_as_such(run, tmp_path, monkeypatch):
    import stavegen.render.pdf_report as pdf_report

    def locked(result, path):
        raise PermissionError(errno.EACCES, "Permission denied", str(path))

    monkeypatch.setattr(pdf_report, "write_report", locked)
    out = tmp_path / "new" / "out"
    result = run(["build", SAMPLES / SAMPLE, "-o", out])
    assert result.exit_code == 2
    assert "permission denied" in result.stderr and "\n" not in result.stderr.strip()
    assert not (tmp_path / "new").exists()  # the folders made for the set go with it


def test_init_replaces_only_regular_files(run, tmp_path):
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    folder = tmp_path / "folder.toml"
    folder.mkdir()
    link = tmp_path / "link.toml"
    link.symlink_to(tmp_path / "elsewhere.toml")
    for target, kind in (("/dev/null", "a device"), (fifo, "a named pipe"), (folder, "a folder"),
                         (link, "a symbolic link"), (tmp_path / ".", "a folder")):
        result = run(["init", target, "--force"])
        assert result.exit_code == 2, (target, result.output)
        message = result.stderr.strip()
        assert kind in message and "\n" not in message
    assert os.path.exists("/dev/null") and not os.path.isfile("/dev/null")
    assert sorted(os.listdir(tmp_path)) == ["folder.toml", "link.toml", "pipe.toml"]
    assert list(folder.iterdir()) == []


def test_a_build_will_not_write_over_a_folder(run, tmp_path):
    out = tmp_path / "out"
    (out / f"{SLUG}.json").mkdir(parents=True)
    result = run(["build", SAMPLES / SAMPLE, "-o", out])
    assert result.exit_code == 2
    assert f"{SLUG}.json" in result.stderr and "is a folder" in result.stderr
    assert os.listdir(out) == [f"{SLUG}.json"]


def test_size_write_asks_before_replacing_a_file(run, tmp_path):
    target = tmp_path / "chosen.toml"
    target.write_text("# the builder's own notes\n")
    result = run(["size", SAMPLES / SAMPLE, "--write", target])
    assert result.exit_code == 2
    assert "--force" in result.stderr and "\n" not in result.stderr.strip()
    assert target.read_text() == "# the builder's own notes\n"
    result = run(["size", SAMPLES / SAMPLE, "--write", "/dev/null", "--force"])
    assert result.exit_code == 2 and "a device" in result.stderr


@pytest.mark.parametrize("sample, code", [(SAMPLE, 0), ("skiff-boom-too-light.toml", 1)])
@pytest.mark.parametrize("json_out", [False, True])
def test_a_closed_pipe_keeps_the_check_exit_code(sample, code, json_out):
    """``stavegen check ... | head -1``: the reader is gone before the first line; the exit code is the check's."""
    child = subprocess.Popen([sys.executable, "-m", "stavegen", "check", str(SAMPLES / sample)]
                             + (["--json"] if json_out else []),
                             cwd=ROOT, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    child.stdout.close()
    err = child.stderr.read()
    child.wait(timeout=120)
    assert child.returncode == code, err
    assert err == ""


def test_identical_input_gives_identical_files(tmp_path):
    """Two builds in separate processes with different hash seeds: every file byte for byte the same
    (PDF dates fixed by SOURCE_DATE_EPOCH; the DXF has no clock, GUID or set order in it)."""
    sets = []
    for seed in ("1", "4"):
        out = tmp_path / seed
        env = dict(os.environ, PYTHONHASHSEED=seed, SOURCE_DATE_EPOCH=EPOCH)
        done = subprocess.run([sys.executable, "-m", "stavegen", "build", str(SAMPLES / SAMPLE), "-o",
                               str(out)], env=env, cwd=ROOT, capture_output=True, text=True)
        assert done.returncode == 0, done.stderr
        sets.append(_files(out))
    assert sets[0].keys() == sets[1].keys() and len(sets[0]) == len(output_names("x"))
    for name in sets[0]:
        assert sets[0][name] == sets[1][name], name
    assert json.loads(sets[0][f"{SLUG}.json"])["spar"]["name"] == "Day-sailer mast"


_OTHER_THREAD_CHILD = textwrap.dedent("""
    import os, signal, sys, tempfile, threading, time
    from pathlib import Path
    import stavegen.outputs as outputs

    # A thread that does not block the signal, started before any writing, as rich's refresh thread is.
    threading.Thread(target=threading.Event().wait, daemon=True).start()
    real = tempfile.mkstemp

    def mkstemp(*args, **kwargs):
        made = real(*args, **kwargs)
        # Process-directed, and blocked in this thread: the kernel hands it to the other thread, and Python runs
        # the handler here at once, before the temporary is listed for removal, unless the handler defers.
        os.kill(os.getpid(), getattr(signal, sys.argv[2]))
        time.sleep(0.2)
        return made

    tempfile.mkstemp = mkstemp
    try:
        with outputs.OutputSet(Path(sys.argv[1])) as out:
            out.add("a.txt", lambda p: p.write_text("new"))
            out.commit()
    except KeyboardInterrupt:
        sys.exit(130)
""")


@pytest.mark.parametrize("name, code", [("SIGTERM", 128 + signal.SIGTERM), ("SIGHUP", 128 + signal.SIGHUP),
                                        ("SIGINT", 130)])
def test_a_signal_taken_by_another_thread_while_a_temporary_is_made_leaves_nothing(tmp_path, name, code):
    """A signal blocked in the main thread goes to another thread (the kernel's choice), and Python still runs
    its handler in the main thread: the handlers defer while signals are held, so the temporary made in that
    moment is removed with the rest and the earlier file stays."""
    out = tmp_path / "out"
    out.mkdir()
    (out / "a.txt").write_text("old")
    child = subprocess.run([sys.executable, "-c", _OTHER_THREAD_CHILD, str(out), name], cwd=ROOT,
                           capture_output=True, text=True, timeout=120)
    assert child.returncode == code, child.stderr
    assert sorted(os.listdir(out)) == ["a.txt"] and (out / "a.txt").read_text() == "old"
