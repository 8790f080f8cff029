"""Run-away work is refused in one line before it starts: too many stations for a build, or for the
comparison of every stave count. How time and memory grow with stations is measured in the benchmarks
(docs/benchmarks.md), never here.
"""

from dataclasses import replace

import pytest

from stavegen.errors import InputError
from stavegen.model.loader import load_spar
from stavegen.stations.grid import MOST_STATIONS, refuse_too_many, station_marks
from stavegen.sizing.count import MOST_STATIONS_COMPARED

from conftest import SAMPLES


def _variant(tmp_path, name, **replacements):
    text = (SAMPLES / name).read_text()
    for old, new in replacements.items():
        assert old in text
        text = text.replace(old, new)
    path = tmp_path / name
    path.write_text(text)
    return path


@pytest.mark.parametrize("command", ["check", "build"])
def test_marks_too_close_are_refused_with_the_spacing_that_works(run, tmp_path, command):
    """1 mm marks on a 6.4 m mast: 6,400 stations pass; a quarter of that spacing would make 25,600."""
    path = _variant(tmp_path, "yawl-mainmast-metric.toml", **{"mark_spacing = 250": "mark_spacing = 0.5"})
    args = {"check": [command, path], "build": [command, path, "-o", tmp_path / "out"]}[command]
    result = run(args)
    assert result.exit_code == 2, result.output
    message = result.stderr.strip()
    assert "\n" not in message and "output.mark_spacing" in message
    assert f"at most {MOST_STATIONS:,} stations" in message and "use a spacing of at least" in message
    assert not (tmp_path / "out").exists()


def test_the_spacing_offered_is_accepted(run, tmp_path):
    """The spacing the message offers (rounded up to what the units print) passes the same test."""
    path = _variant(tmp_path, "yawl-mainmast-metric.toml", **{"mark_spacing = 250": "mark_spacing = 0.5"})
    message = run(["check", path]).stderr
    offered = float(message.split("at least ")[1].split()[0])
    (tmp_path / "again").mkdir()
    fixed = _variant(tmp_path / "again", "yawl-mainmast-metric.toml", **{"mark_spacing = 250": f"mark_spacing = {offered}"})
    spar = load_spar(fixed)
    refuse_too_many(spar)  # no error
    assert len(station_marks(spar)) <= MOST_STATIONS
    with pytest.raises(InputError):
        refuse_too_many(replace(spar, output=replace(spar.output, mark_spacing=offered - 0.1)))


def test_comparing_every_count_has_its_own_limit(run, tmp_path):
    path = _variant(tmp_path, "daysailer-mast.toml", **{"mark_spacing = 12": "mark_spacing = 0.1"})
    result = run(["size", path])
    assert result.exit_code == 2
    message = result.stderr.strip()
    assert "\n" not in message and "output.mark_spacing" in message
    assert f"at most {MOST_STATIONS_COMPARED:,} stations when it compares" in message
