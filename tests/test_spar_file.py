"""The spar file's keys, its reference, its starter, and odd input read safely.

References: the key reference (docs/spar-file.md) and the starter file are
held to the loader itself, not to a copy of its keys; the write-back is held
to an independent TOML reader (tomllib) and to the file's own bytes; the
bare fraction's two readings to 1 in = 25.4 mm exactly (international yard
and pound agreement, 1959).
"""

from __future__ import annotations

import copy
import dataclasses
import json
import os
import re
import threading
import tomllib
from pathlib import Path

import pytest

from stavegen.errors import InputError
from stavegen.model import schema
from stavegen.model.loader import LARGEST_FILE, load_spar, parse_spar
from stavegen.model.reference import reference_markdown
from stavegen.model.rewrite import with_solved_values
from stavegen.model.spar import Profile
from stavegen.model.starter import starter_text

from conftest import ROOT, SAMPLES, SPAR_SAMPLES, spar_dict

ESC = "\x1b"

# A spar dict that sets every table, for probing keys one at a time.
FULL = spar_dict(
    hollow={"plug": [{"from": 0, "to": 300}], "layer": [{"material": "glass-6oz", "plies": 2, "from": 0, "to": 2000}],
            "strip": [{"material": "mine", "width": 15, "thickness": 0.5, "place": "inner-face", "from": 0,
                       "to": 2500}]},
    materials={"mine": {"name": "My tape", "E_mpa": 90000, "density_kg_m3": 1500, "strength_mpa": 500,
                        "ply_thickness": 0.3, "source": "test figures"}},
    stock={"thickness": 22, "widths": [95, 145], "lengths": [3000, 3600]},
    output={"paper": "a4"},
)
# Where each table sits in that dict, and what it needs to be read at all.
_SETUP = {
    "spar": lambda d: d["spar"],
    "plan": lambda d: d["plan"],
    "hollow": lambda d: d["hollow"],
    "hollow.notch": lambda d: (d["hollow"].update(joint="birdsmouth-custom", notch={"depth": 10, "apex_height": 5})
                               or d["hollow"]["notch"]),
    "hollow.plug": lambda d: d["hollow"]["plug"][0],
    "hollow.layer": lambda d: d["hollow"]["layer"][0],
    "hollow.strip": lambda d: d["hollow"]["strip"][0],
    "materials.NAME": lambda d: d["materials"]["mine"],
    "stock": lambda d: d["stock"],
    "output": lambda d: d["output"],
    "parting": lambda d: d.setdefault("parting", {"at": 1000}),
    "wood": lambda d: (d["hollow"].update(wood={"name": "Test wood", "moe": 11000, "mor": 80, "density": 450})
                       or d["hollow"]["wood"]),
}
_WHERE = {"hollow.plug": "hollow.plug[1]", "wood": "hollow.wood", "hollow.layer": "hollow.layer[1]",
          "hollow.strip": "hollow.strip[1]", "materials.NAME": "materials.mine"}


def _probe_cases():
    for decl in (schema.TOP,) + schema.SPAR_FILE:
        for key in decl.keys:
            yield pytest.param(decl.path, key, id=f"{decl.path or 'top'}.{key.name}")


@pytest.mark.parametrize("table, key", list(_probe_cases()))
def test_every_declared_key_is_read_by_the_loader(table, key):
    """A value no key accepts, put under each declared key in turn, is refused naming that very key."""
    data = copy.deepcopy(FULL)
    target = data if table == "" else _SETUP[table](data)
    target[key.name] = "not a table" if key.kind in ("table", "tables") else [[[]]]
    with pytest.raises(InputError) as err:
        parse_spar(data, "probe.toml")
    where = ".".join(p for p in (_WHERE.get(table, table), key.name) if p)
    assert err.value.key == where or err.value.key.startswith((where + "[", where + ".")), err.value.one_line()


def test_the_full_probe_spar_loads():
    spar = parse_spar(copy.deepcopy(FULL), "probe.toml")
    assert spar.output.paper == "a4" and spar.hollow.plugs


def test_reference_is_current():
    """docs/spar-file.md is generated from the loader's schema; regenerate it when a key changes."""
    text = (ROOT / "docs" / "spar-file.md").read_text(encoding="utf-8")
    assert text == reference_markdown(), "run: python -m stavegen.model.reference > docs/spar-file.md"


def test_reference_names_every_key_and_explains_the_joints():
    text = reference_markdown()
    for decl in schema.SPAR_FILE:
        for key in decl.keys:
            assert f"| `{key.name}` |" in text
    for word in ("min_strength_ratio", "edge_allowance", "[hollow.notch]", "A wood of your own",
                 '"birdsmouth-flush"`: ', '"birdsmouth-centered"`: '):
        assert word in text


@pytest.mark.parametrize("units", ["in", "mm"])
def test_starter_holds_every_key(units):
    text = starter_text(units)
    for decl in schema.SPAR_FILE:
        header = "[hollow.wood]" if decl is schema.WOOD else (f"[[{decl.path}]]" if decl.array else f"[{decl.path}]")
        assert header in text, header
        for key in decl.keys:
            if key.kind in ("table", "tables"):
                continue
            assert re.search(rf"^(# )?{re.escape(key.name)} = ", text, re.M), (decl.path, key.name)


def _uncomment(text: str, names: set[str]) -> str:
    return re.sub(r"^# ([A-Za-z_0-9]+) = ", lambda m: f"{m.group(1)} = " if m.group(1) in names else m.group(0), text,
                  flags=re.M)


@pytest.mark.parametrize("units", ["in", "mm"])
def test_starter_defaults_are_the_loaders(units, tmp_path):
    """A key the starter shows commented out at its default changes nothing when the # is removed."""
    text = starter_text(units)
    at_default = {k.name for d in (schema.SPAR, schema.HOLLOW, schema.STOCK, schema.OUTPUT) for k in d.keys
                  if k.example is None and k.aside is None and k.kind not in ("table", "tables")}
    assert {"edge_allowance", "min_strength_ratio", "notch_cut"} <= at_default

    def read(text: str):  # the figures, not whether the file wrote them
        spar = parse_spar(tomllib.loads(text), "s.toml")
        hollow = dataclasses.replace(spar.hollow, strength_target_given=False)
        return dataclasses.replace(spar, hollow=hollow, head_load_given=False)

    assert read(_uncomment(text, at_default)) == read(text)


@pytest.mark.parametrize("units", ["in", "mm"])
def test_starter_optional_values_and_blocks_load(units):
    text = starter_text(units)
    on = _uncomment(text, {"stations", "min_strength_ratio", "min_corner_wall"})
    spar = parse_spar(tomllib.loads(on), "s.toml")
    assert spar.hollow.diameter_given and spar.hollow.min_strength_ratio == 1.0 and spar.hollow.min_corner_wall
    # The custom notch block, switched on with its joint.
    notch = on.replace('joint = "birdsmouth-flush"', 'joint = "birdsmouth-custom"').replace("# [hollow.notch]",
                                                                                            "[hollow.notch]")
    notch = _uncomment(notch, {"depth", "apex_height"})
    assert parse_spar(tomllib.loads(notch), "s.toml").hollow.joint.depth > 0
    # A wood of one's own, as a table in place of the staves' wood.
    lines = [ln for ln in text.splitlines() if not ln.startswith('wood = "douglas-fir-coast"')]
    head, _, tail = "\n".join(lines).partition("# Materials of your own")
    own = _uncomment(head.replace("# [hollow.wood]", "[hollow.wood]"),
                     {"name", "moe", "mor", "density", "source"}) + "# " + tail
    wood = parse_spar(tomllib.loads(own), "s.toml").hollow.wood
    assert wood.name == "My wood" and wood.source == "the table the figures come from"
    assert 1000 <= wood.moe <= 40000
    # A material of one's own, and the sheathing and strip blocks switched on with it.
    mine = text.replace("# [materials.NAME]", "[materials.mine]").replace("# [[hollow.layer]]", "[[hollow.layer]]")
    mine = mine.replace("# [[hollow.strip]]", "[[hollow.strip]]")
    head, _, tail = mine.partition("[[hollow.layer]]")
    tail, _, materials = tail.partition("[materials.mine]")
    blocks, _, rest = tail.partition("\n[stock]")
    tail = _uncomment(blocks, {"material", "plies", "width"}) + "\n[stock]" + rest
    materials = _uncomment(materials, {"E_mpa", "density_kg_m3", "strength_mpa", "ply_thickness"})
    mine = head + "[[hollow.layer]]" + tail + "[materials.mine]" + materials
    spar = parse_spar(tomllib.loads(mine), "s.toml")
    assert spar.hollow.layers[0].material.key == "glass-6oz" and spar.hollow.layers[0].plies == 2
    assert spar.hollow.strips[0].material.key == "carbon-ud"


def test_typo_is_reported_as_unknown_with_the_nearest_key_before_any_missing():
    data = spar_dict()
    data["hollow"]["stavs"] = data["hollow"].pop("staves")
    del data["spar"]["length"]  # a missing key elsewhere comes second
    with pytest.raises(InputError) as err:
        parse_spar(data, "t.toml")
    assert err.value.key == "hollow.stavs"
    assert "unknown key; did you mean staves?" in err.value.problem and "missing" not in err.value.problem


def test_unknown_key_in_a_plug_names_the_nearest():
    data = spar_dict(hollow={"plug": [{"form": 0, "to": 300}]})
    with pytest.raises(InputError) as err:
        parse_spar(data, "t.toml")
    assert err.value.key == "hollow.plug[1].form" and "did you mean from?" in err.value.problem


def _write(tmp_path: Path, data: dict, name="spar.toml") -> Path:
    import tomlkit

    path = tmp_path / name
    path.write_text(tomlkit.dumps(data), encoding="utf-8")
    return path


def test_markup_in_names_is_printed_literally(run, tmp_path):
    """Rich markup in the spar's name, a wood's name and the output folder prints as written."""
    name = "Mast [/] [bold]x[/bold] [link=y]"
    wood = {"name": "Wood [/]", "moe": 11000, "mor": 80, "density": 450}
    path = _write(tmp_path, spar_dict(spar={"name": name}, hollow={"wood": wood}))
    checked = run(["check", path])
    assert checked.exit_code in (0, 1), checked.output
    assert name in checked.stdout and "Wood [/]" in checked.stdout
    section = run(["section", path, "--at", "1000"])
    assert section.exit_code == 0, section.output
    folder = tmp_path / "o[bold]x"
    stocked = spar_dict(spar={"name": name}, stock={"thickness": 22, "widths": [95, 145], "lengths": [3600]})
    built = run(["build", _write(tmp_path, stocked, "stocked.toml"), "-o", folder])
    assert built.exit_code in (0, 1), built.output
    assert "o[bold]x" in " ".join(built.stdout.split())
    assert (folder / "mast-bold-x-bold-link-y.json").exists()


def test_control_characters_never_reach_the_terminal(run, tmp_path):
    bad_name = _write(tmp_path, spar_dict(spar={"name": f"A{ESC}[2J{ESC}]0;pwned\x07 mast"}), "name.toml")
    bad_key = _write(tmp_path, spar_dict(hollow={f"{ESC}[2J": 1}), "key.toml")
    for path, fragment in ((bad_name, "spar.name: holds a control character (\\x1b)"),
                           (bad_key, 'hollow."\\x1b[2J": unknown key')):
        result = run(["check", path])
        assert result.exit_code == 2
        message = result.stderr.strip()
        assert fragment in message and "\n" not in message
        assert ESC not in result.stdout + result.stderr and "\x07" not in result.stderr


def test_long_values_are_cut_in_messages(run, tmp_path):
    path = _write(tmp_path, spar_dict(hollow={"joint": "x" * 10_000, "wall": "y" * 10_000}))
    result = run(["check", path])
    assert result.exit_code == 2 and len(result.stderr) < 400 and "10,000 characters" in result.stderr


def test_long_names_give_short_file_names(run, tmp_path):
    name = " ".join(["Mainmast"] * 13)  # 116 characters: allowed, but too long for a file-name stem
    stocked = spar_dict(spar={"name": name}, stock={"thickness": 22, "widths": [95, 145], "lengths": [3600]})
    spar = parse_spar(stocked, "t.toml")
    assert len(spar.slug) <= 60 and spar.slug.startswith("mainmast-mainmast") and not spar.slug.endswith("-")
    out = tmp_path / "out"
    assert run(["build", _write(tmp_path, stocked), "-o", out]).exit_code in (0, 1)
    assert (out / f"{spar.slug}-templates.dxf").exists()
    too_long = run(["check", _write(tmp_path, spar_dict(spar={"name": "x" * 240}), "long.toml")])
    assert too_long.exit_code == 2 and "spar.name: is 240 characters long" in too_long.stderr


@pytest.mark.parametrize("target", [".", "folder"])
def test_init_onto_a_folder_is_refused(run, tmp_path, target, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "folder").mkdir()
    for extra in ([], ["--force"]):
        result = run(["init", target, *extra])
        assert result.exit_code == 2 and "is a folder" in result.stderr and "\n" not in result.stderr.strip()
    assert sorted(os.listdir(tmp_path)) == ["folder"] and not os.listdir(tmp_path / "folder")


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="needs /dev/zero")
def test_a_device_is_not_read(run):
    result = run(["check", "/dev/zero"])
    assert result.exit_code == 2 and "device" in result.stderr and "\n" not in result.stderr.strip()


def test_an_oversized_file_is_refused_unread(run, tmp_path):
    path = tmp_path / "huge.toml"
    text = (SAMPLES / "daysailer-mast.toml").read_text()
    path.write_text(text + "#" * (LARGEST_FILE + 1 - len(text.encode())) + "\n")
    result = run(["check", path])
    assert result.exit_code == 2 and "larger than 1,024 KiB" in result.stderr


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="needs named pipes")
def test_an_endless_pipe_stops_at_the_size_limit(run, tmp_path):
    """A pipe is read (as a shell's <(…) gives one), but only up to the limit: an endless one is refused."""
    fifo = tmp_path / "endless"
    os.mkfifo(fifo)
    stop = threading.Event()

    def writer():
        try:
            with open(fifo, "wb") as pipe:
                while not stop.is_set():
                    pipe.write(b"# " + b"x" * 65_000 + b"\n")
        except (BrokenPipeError, OSError):
            pass

    thread = threading.Thread(target=writer, daemon=True)
    thread.start()
    result = run(["check", fifo])
    stop.set()
    thread.join(timeout=5)
    assert result.exit_code == 2 and "larger than" in result.stderr


def _warnings(run, tmp_path, data) -> tuple[list[str], str]:
    out = tmp_path / "doc.json"
    result = run(["check", _write(tmp_path, data), "--json"])
    assert result.exit_code in (0, 1), result.output
    out.write_text(result.stdout)
    text = run(["check", _write(tmp_path, data)]).stdout
    return json.loads(out.read_text())["warnings"], " ".join(text.split())


def test_unlikely_figures_are_warned_in_one_line_naming_the_key(run, tmp_path):
    steep = spar_dict(plan={"stations": [[0, 100], [2000, 100], [3000, 50]]},
                      hollow={"stations": [[0, 104], [2000, 104], [3000, 200]]},
                      stock={"thickness": 22, "widths": [95, 145], "lengths": [3600], "kerf": 8})
    warnings, text = _warnings(run, tmp_path, steep)
    for fragment in ("plan.stations[3]: the diameter goes from 100.0 mm at plan.stations[2] to 50.0 mm (2.00 times)",
                     "hollow.stations[3]: 200.0 mm against the plan's 50.0 mm there (4.00 times)",
                     "stock.kerf: 8.0 mm is wider than a ripping blade's kerf"):
        assert any(fragment in w for w in warnings), (fragment, warnings)
        assert fragment in text
    assert all("\n" not in w for w in warnings)
    section = run(["section", _write(tmp_path, steep, "steep.toml"), "--at", "1500"])
    assert section.exit_code == 0 and "stock.kerf: 8.0 mm is wider" in " ".join(section.stdout.split())


def test_a_wall_past_the_plans_radius_with_auto_diameters_is_warned():
    data = spar_dict(plan={"stations": [[0, 100], [3000, 60]]}, hollow={"stations": "auto", "wall": 35})
    (notice,) = parse_spar(data, "t.toml").notices
    assert notice.startswith("hollow.wall: 35.0 mm is as thick as the plan's radius (30.0 mm) at 3000.0 mm")


def test_no_warnings_for_the_samples(run):
    for sample in SPAR_SAMPLES:
        assert load_spar(sample).notices == (), sample


def test_refused_slips_name_the_station_and_the_values():
    data = spar_dict(plan={"stations": [[0, 100], [1500, 1100], [3000, 100]]})
    with pytest.raises(InputError) as err:
        parse_spar(data, "t.toml")
    assert err.value.key == "plan.stations[2]"
    assert "from 100.0 mm at plan.stations[1] to 1100.0 mm (11.00 times)" in err.value.problem


def test_write_back_keeps_every_other_byte(tmp_path):
    """Only the three solved values change, each keeping its comment; the rest of the file is byte for byte."""
    text = (SAMPLES / "daysailer-mast.toml").read_text()
    text = text.replace("staves = 12", 'staves = "auto"          # stavegen chooses')
    text = text.replace('wall = "5/8"', 'wall = "auto-tapered"  # solved')
    text = re.sub(r"(?m)^stations = \[\[0, \"3 3/4\".*$", 'stations = "auto"   # diameters', text)
    assert 'stations = "auto"' in text
    text = text.replace("\n", "\r\n")  # a file saved on Windows keeps its line ends
    original = parse_spar(tomllib.loads(text), "t.toml")
    # A hand-made solution (the write-back does not care how it was found): wall and diameters along the spar.
    hollow = dataclasses.replace(original.hollow, staves=10, wall=Profile((0.0, 5181.6), (18.0, 15.31)),
                                 diameter=Profile((0.0, 2590.8, 5181.6), (130.0, 128.2, 80.0)))
    solved = dataclasses.replace(original, hollow=hollow)
    out = with_solved_values(text, original, solved)
    before, after = text.splitlines(keepends=True), out.splitlines(keepends=True)
    assert len(before) == len(after)
    changed = [(a, b) for a, b in zip(before, after) if a != b]
    assert [b.split("=")[0].strip() for _, b in changed] == ["staves", "wall", "stations"]
    for a, b in changed:
        assert a.split("#")[1] == b.split("#")[1] and b.endswith("\r\n")
    read = tomllib.loads(out)["hollow"]
    assert read["staves"] == 10
    assert read["wall"] == [[0, "23/32"], [204, "5/8"]]  # 18 mm and 15.31 mm rounded up to 32nds
    assert read["stations"] == [[0, "5 1/8"], [102, "5 1/16"], [204, "3 5/32"]]
    reloaded = parse_spar(tomllib.loads(out), "t.toml")
    assert reloaded.hollow.staves == 10 and reloaded.hollow.wall.value[0] >= 18.0
