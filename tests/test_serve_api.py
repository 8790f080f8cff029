"""The page's API against the command line: the same messages, the same JSON, the same files.

The API is driven through Starlette's test client (requests go through the real app, its worker
processes and its caps); the command line is run in-process as tests/test_bad_input.py runs it.
"""

from __future__ import annotations

import csv
import io
import json
import re
import socket
import tomllib
import xml.etree.ElementTree as ET
import zipfile
from pathlib import Path

import pytest
from starlette.testclient import TestClient

from conftest import SAMPLES, SPAR_SAMPLES
from test_bad_input import CASES, expected_fragment

from stavegen.serve.app import LOOPBACK_HOSTS, Settings, bundled_samples, create_app

SVG = "{http://www.w3.org/2000/svg}"
MAST = SAMPLES / "daysailer-mast.toml"
BOOM = SAMPLES / "daysailer-boom.toml"  # eight staves: cutter rows short enough for the terminal's table
SAMPLE_FILES = SPAR_SAMPLES  # the page edits spar files


def make_client(**caps) -> TestClient:
    settings = Settings(text=MAST.read_text(encoding="utf-8"), name="daysailer-mast.toml",
                        samples=bundled_samples(SAMPLES), allowed_hosts=LOOPBACK_HOSTS + ["testserver"], **caps)
    return TestClient(create_app(settings))


@pytest.fixture(scope="module")
def client():
    with make_client() as c:
        yield c


def cli_message(result) -> str:
    """The one line the command line printed, without its "stavegen: " prefix."""
    line = result.stderr.strip()
    assert line.startswith("stavegen: "), line
    return line[len("stavegen: "):]


@pytest.mark.parametrize("path", CASES, ids=[p.stem for p in CASES])
def test_bad_spar_file_same_message_as_cli(path, client, run, tmp_path):
    for command, endpoint in (("check", "/api/check"), ("build", "/api/build")):
        args = [command, path] + (["-o", tmp_path / "out"] if command == "build" else [])
        result = run(args)
        assert result.exit_code == 2
        answer = client.post(endpoint, params={"name": str(path)}, content=path.read_bytes(),
                             headers={"Content-Type": "application/octet-stream"})
        assert answer.status_code == 422, answer.text
        body = answer.json()
        assert body["message"] == cli_message(result)
        assert expected_fragment(path) in body["message"]
        if body["key"]:
            assert f": {body['key']}: " in body["message"]


@pytest.mark.parametrize("path", SAMPLE_FILES, ids=[p.stem for p in SAMPLE_FILES])
def test_check_json_equals_cli(path, client, run):
    result = run(["check", path, "--json"])
    assert result.exit_code in (0, 1)
    for content_type in ("application/toml", "text/plain", "application/x-www-form-urlencoded"):
        answer = client.post("/api/check", params={"name": str(path)}, content=path.read_bytes(),
                             headers={"Content-Type": content_type})
        assert answer.status_code == 200
        assert answer.text == result.stdout


@pytest.mark.parametrize("path", SAMPLE_FILES, ids=[p.stem for p in SAMPLE_FILES])
def test_build_zip_holds_what_the_cli_writes(path, client, run, tmp_path):
    out = tmp_path / "cli"
    result = run(["build", path, "-o", out])
    assert result.exit_code in (0, 1), result.stderr
    answer = client.post("/api/build", params={"name": str(path)}, content=path.read_bytes())
    assert answer.status_code == 200
    assert answer.headers["content-type"] == "application/zip"
    archive = zipfile.ZipFile(io.BytesIO(answer.content))
    assert archive.testzip() is None
    written = sorted(p.name for p in out.iterdir())
    assert sorted(archive.namelist()) == written
    slug = next(n for n in written if n.endswith(".json"))[:-5]
    assert json.loads(archive.read(f"{slug}.json")) == json.loads((out / f"{slug}.json").read_text(encoding="utf-8"))
    assert archive.read(f"{slug}-cutlist.csv").decode("utf-8") == (out / f"{slug}-cutlist.csv").read_text(encoding="utf-8")
    rows = list(csv.reader(io.StringIO(archive.read(f"{slug}-cutlist.csv").decode("utf-8"))))
    assert len(rows) > 1
    assert archive.read(f"{slug}-report.pdf").startswith(b"%PDF")
    assert archive.read(f"{slug}-templates.dxf").lstrip().startswith(b"0")
    # the page's laid-out check is the build's JSON
    laid_out = client.post("/api/check", params={"name": str(path), "layout": "1"}, content=path.read_bytes())
    assert laid_out.json() == json.loads((out / f"{slug}.json").read_text(encoding="utf-8"))


def _shoelace(d: str) -> float:
    """Area (mm², y flipped back) of an SVG path made of M/L/Z straight lines, holes subtracted by their turn."""
    total = 0.0
    for ring in re.findall(r"M([^MZ]+)Z", d):
        points = [tuple(map(float, p.split(","))) for p in re.split(r"[ML]", ring.replace("L", " L").strip())
                  if p.strip() for p in [p.strip()]]
        total += 0.5 * sum(x1 * y2 - x2 * y1 for (x1, y1), (x2, y2) in zip(points, points[1:] + points[:1]))
    return abs(total)


def test_section_figures_and_drawing(client, run):
    """The section's figures are the `section` command's; the drawing's wood area, measured on the SVG
    by the shoelace formula, is the exact integral's within the drawing's polygonal round."""
    result = run(["section", BOOM, "--at", "7 ft 6 in"])
    assert result.exit_code == 0
    answer = client.post("/api/section", params={"at": "7 ft 6 in", "name": str(BOOM)},
                         content=BOOM.read_bytes())
    assert answer.status_code == 200
    body = answer.json()
    lines = result.stdout.splitlines()
    for label, value in body["figures"]["rows"]:
        assert any(label in line and value in line for line in lines), (label, value)
    for row in body["cutter"]:
        assert any(row["label"] in line and row["value"] in line for line in lines), row
    svg = ET.fromstring(body["section_svg"])
    staves = svg.findall(f".//{SVG}path[@class='stave']")
    assert len(staves) == 8
    # the finished round is the file's diameter there (linear between its stations)
    from stavegen.model.loader import load_spar

    od = float(load_spar(BOOM).hollow.diameter.at(7.5 * 304.8))
    rounds = svg.findall(f".//{SVG}circle[@class='round']")
    assert float(rounds[0].get("r")) == pytest.approx(od / 2, abs=1e-3)  # the drawing keeps 3 decimals
    area_row = next(v for k, v in body["figures"]["rows"] if k == "wood area")
    assert area_row.endswith(" in²")  # an inch spar: in² (4 significant figures), 1 in² = 645.16 mm² exactly
    wood = float(area_row.replace(",", "").split()[0]) * 645.16
    drawn = sum(_shoelace(p.get("d")) for p in svg.findall(f".//{SVG}path[@class='finished']"))
    assert drawn == pytest.approx(wood, rel=4e-4)
    stave = ET.fromstring(body["stave_svg"])
    assert float(stave.get("data-thickness-mm")) == pytest.approx(0.5 * 25.4, abs=1e-3)


def test_section_off_the_spar_names_the_position(client):
    answer = client.post("/api/section", params={"at": "30 ft"}, content=MAST.read_bytes())
    assert answer.status_code == 422
    assert answer.json()["key"] == "at"
    assert "is not on the spar" in answer.json()["message"]


def test_view_words_the_check_as_the_cli(client, run):
    result = run(["check", MAST])
    answer = client.post("/api/view", params={"name": str(MAST), "layout": "1"}, content=MAST.read_bytes())
    assert answer.status_code == 200
    view = answer.json()
    flat = " ".join(result.stdout.split())
    assert view["verdict"] in flat
    for row in view["stations"]["rows"]:
        assert " ".join(c for c in row if c) in flat
    assert view["order"]["summary"].startswith(("1 board", "2 boards", "3 boards", "4 boards", "5 boards",
                                                 "6 boards", "7 boards", "8 boards", "9 boards"))
    ET.fromstring(view["order"]["svg"])
    ET.fromstring(view["stave_svg"])


def test_size_is_the_size_command(client, run):
    result = run(["size", MAST])
    answer = client.post("/api/size", content=MAST.read_bytes())
    assert answer.status_code == 200
    body = answer.json()
    flat = " ".join(result.stdout.split())
    assert body["reason"] in flat
    assert f"{body['chosen']} staves" in body["reason"]
    for note in body["notes"]:
        assert note in flat


def test_edit_keeps_comments_and_writes_values_as_the_file_would(client):
    text = MAST.read_text(encoding="utf-8")
    ops = [{"set": "hollow.wall", "value": "7/8"},
           {"set": "hollow.plug[2].from", "value": "18 ft"},
           {"set": "hollow.margin", "value": "0.03"},
           {"set": "hollow.staves", "value": "auto"},
           {"set": "plan.stations", "value": [["0", "4.5"], ["20 ft", "3"]]},
           {"set": "output.templates_on_boards", "value": True},
           {"set": "spar.name", "value": "123", "string": True},
           {"append": "hollow.plug", "value": {"from": "9 ft", "to": "10 ft"}},
           {"delete": "hollow.plug[1]"}]
    answer = client.post("/api/edit", json={"text": text, "ops": ops})
    assert answer.status_code == 200, answer.text
    new = answer.json()["text"]
    for line in text.splitlines():
        if line.lstrip().startswith("#") or ("#" in line and "heel and partners" not in line):
            comment = line[line.index("#"):]
            assert comment in new, comment
    before, after = tomllib.loads(text), tomllib.loads(new)  # an independent TOML reader
    assert after == answer.json()["data"]
    assert after["hollow"]["wall"] == "7/8"
    assert after["hollow"]["margin"] == 0.03
    assert after["hollow"]["staves"] == "auto"
    assert after["plan"]["stations"] == [[0, 4.5], ["20 ft", 3]]
    assert after["output"]["templates_on_boards"] is True
    assert after["spar"]["name"] == "123"
    assert after["hollow"]["plug"] == [{"from": "18 ft", "to": "17 ft"}, {"from": "9 ft", "to": "10 ft"}]
    for table in ("stock",):
        assert after[table] == before[table]
    assert after["spar"]["length"] == before["spar"]["length"]


def test_edit_adds_tables_where_the_file_has_none(client):
    skiff = SAMPLES / "skiff-boom-too-light.toml"
    ops = [{"set": "hollow.joint", "value": "birdsmouth-custom", "string": True},
           {"set": "hollow.notch.depth", "value": "3/8"}, {"set": "hollow.notch.apex_fraction", "value": "0.3"},
           {"set": "output.paper", "value": "a4", "string": True},
           {"set": "plan.wood", "value": {"name": "test wood", "moe": "1.6e6 psi", "mor": "", "density": ""}}]
    answer = client.post("/api/edit", json={"text": skiff.read_text(encoding="utf-8"), "ops": ops})
    assert answer.status_code == 200
    text = answer.json()["text"]
    data = tomllib.loads(text)
    assert data["hollow"]["notch"] == {"depth": "3/8", "apex_fraction": 0.3}
    assert data["output"] == {"paper": "a4"}
    assert data["plan"]["wood"] == {"name": "test wood", "moe": "1.6e6 psi"}
    assert "\n\n[stock]" in text  # the new [hollow.notch] table ends with a blank line
    # the loader then names the wood's first missing figure, beside which the page shows it
    check = client.post("/api/check", params={"name": "skiff.toml"}, content=text.encode("utf-8"))
    assert check.status_code == 422
    assert check.json()["key"] == "plan.wood.mor"


def test_edit_of_bad_toml_gives_the_loader_message(client):
    answer = client.post("/api/edit", params={"name": "x.toml"}, json={"text": "[spar\n", "ops": []})
    assert answer.status_code == 422
    assert answer.json()["message"].startswith("x.toml: TOML syntax error")


def test_request_names_no_path_that_is_read(client):
    """A request's name is a label only: the text checked is the body's, never the file it names."""
    other = SAMPLES / "yawl-mainmast-metric.toml"
    answer = client.post("/api/check", params={"name": str(other)}, content=MAST.read_bytes())
    assert answer.status_code == 200
    assert answer.json()["spar"]["name"] == "Day-sailer mast"
    assert answer.json()["spar"]["source"] == str(other)
    assert client.get("/api/sample/..%2F..%2Fpyproject.toml").status_code == 404
    assert client.get("/api/sample/daysailer-mast.toml").json()["text"] == MAST.read_text(encoding="utf-8")
    assert client.get("/static/../app.py").status_code == 404


def test_start_gives_the_file_and_the_choices(client):
    start = client.get("/api/start").json()
    assert start["text"] == MAST.read_text(encoding="utf-8")
    assert "birdsmouth-flush" in start["choices"]["joint"]
    assert {s.name for s in SAMPLE_FILES} == set(start["samples"])
    page = client.get("/")
    assert page.status_code == 200 and "/static/app.js" in page.text
    for asset in ("app.js", "style.css"):
        assert client.get(f"/static/{asset}").status_code == 200
    assert "http" not in re.sub(r"http://www\.w3\.org/2000/svg", "", client.get("/static/app.js").text)


def test_request_size_is_capped():
    with make_client(max_body=2000) as small:
        answer = small.post("/api/check", content=b"#" * 5000)
        assert answer.status_code == 413
        assert small.post("/api/check", content=MAST.read_bytes()[:1999]).status_code in (200, 422)


def test_request_time_is_capped_and_the_server_goes_on():
    with make_client(slow_time_limit=0.05) as hasty:
        answer = hasty.post("/api/size", content=MAST.read_bytes())
        assert answer.status_code == 503
        assert "longer than" in answer.json()["message"]
        assert hasty.post("/api/check", content=MAST.read_bytes()).status_code == 200


def test_other_sites_and_hosts_are_refused(client):
    answer = client.post("/api/check", content=MAST.read_bytes(), headers={"Origin": "http://example.org"})
    assert answer.status_code == 403
    answer = client.post("/api/check", content=MAST.read_bytes(), headers={"Host": "example.org"})
    assert answer.status_code == 400
    same = client.post("/api/check", content=MAST.read_bytes(), headers={"Origin": "http://testserver"})
    assert same.status_code == 200


def test_serve_command_binds_loopback_and_warns_for_other_hosts(monkeypatch, run):
    """`stavegen serve` starts uvicorn on 127.0.0.1 by default; --host elsewhere warns (no server is bound)."""
    import stavegen.serve.run as serve_run

    started = []

    class FakeServer:
        def __init__(self, config):
            started.append(config)
            self.started, self.should_exit, self.servers = False, True, []

        def run(self):
            return None

    monkeypatch.setattr(serve_run.uvicorn, "Server", FakeServer)
    result = run(["serve", MAST, "--no-browser", "--port", "0"])
    assert result.exit_code == 0, result.stderr
    assert started[-1].host == "127.0.0.1" and started[-1].port == 0
    assert "warning" not in result.stderr
    result = run(["serve", MAST, "--no-browser", "--host", "0.0.0.0", "--port", "0"])
    assert result.exit_code == 0
    assert started[-1].host == "0.0.0.0"
    assert "warning: serving on 0.0.0.0" in result.stderr
    with socket.socket() as taken:  # a port in use: one line naming --port, nothing started
        taken.bind(("127.0.0.1", 0))
        taken.listen()
        count = len(started)
        result = run(["serve", MAST, "--no-browser", "--port", taken.getsockname()[1]])
        assert result.exit_code == 2
        assert cli_message(result).startswith("serve: --port: port ")
        assert len(started) == count
    result = run(["serve", SAMPLES / "no-such-file.toml", "--no-browser"])
    assert result.exit_code == 2
    assert cli_message(result).endswith("no-such-file.toml: no such file")


# ---- a boat: its file and its spar files sent as text ------------------------------------------------------------

BOAT_FILES = sorted(p for p in SAMPLES.glob("*.toml") if "boat" in tomllib.loads(p.read_text(encoding="utf-8")))


def boat_request(path: Path, **changed: str) -> dict:
    """What the page sends for the boat file at ``path``: its text and its spar files' texts by their names."""
    from stavegen.serve.app import boat_texts

    texts = boat_texts(path)
    return {"boat": texts["text"], "spars": {**texts["spars"], **changed}}


def without_sources(value):
    """JSON without its "source" keys: the page names each file by its name, the command line by its path."""
    if isinstance(value, dict):
        return {k: without_sources(v) for k, v in value.items() if k != "source"}
    if isinstance(value, list):
        return [without_sources(v) for v in value]
    return value


@pytest.mark.parametrize("path", BOAT_FILES, ids=[p.stem for p in BOAT_FILES])
def test_boat_check_json_equals_cli(path, client, run):
    assert BOAT_FILES, "the samples hold boats"
    result = run(["check", path, "--json"])
    assert result.exit_code in (0, 1), result.stderr
    answer = client.post("/api/boat/check", params={"name": path.name}, json=boat_request(path))
    assert answer.status_code == 200, answer.text
    assert without_sources(answer.json()) == without_sources(json.loads(result.stdout))


def test_boat_build_zip_holds_what_the_cli_writes(client, run, tmp_path):
    path = SAMPLES / "daysailer.toml"
    out = tmp_path / "cli"
    result = run(["build", path, "-o", out])
    assert result.exit_code in (0, 1), result.stderr
    answer = client.post("/api/boat/build", params={"name": path.name}, json=boat_request(path))
    assert answer.status_code == 200, answer.text
    archive = zipfile.ZipFile(io.BytesIO(answer.content))
    written = sorted(p.name for p in out.iterdir())
    assert sorted(archive.namelist()) == written
    name = next(n for n in written if n.endswith(".json"))
    assert without_sources(json.loads(archive.read(name))) == \
        without_sources(json.loads((out / name).read_text(encoding="utf-8")))
    # the laid-out boat check is the build's JSON
    laid_out = client.post("/api/boat/check", params={"name": path.name, "layout": "1"}, json=boat_request(path))
    assert without_sources(laid_out.json()) == without_sources(json.loads((out / name).read_text(encoding="utf-8")))


def test_boat_bad_spar_gives_the_cli_message(client, run, tmp_path):
    """A typo in one spar of the boat: 422 with the line `stavegen check BOAT` prints (the page names the spar by
    its file name where the command line gives its path)."""
    path = SAMPLES / "daysailer.toml"
    for file in [path] + [SAMPLES / f for f in boat_request(path)["spars"]]:
        (tmp_path / file.name).write_bytes(file.read_bytes())
    boom = (tmp_path / "daysailer-boom.toml")
    boom.write_text(boom.read_text(encoding="utf-8").replace("staves = ", "stavs = "), encoding="utf-8")
    result = run(["check", tmp_path / "daysailer.toml"])
    assert result.exit_code == 2
    answer = client.post("/api/boat/check", params={"name": path.name},
                         json=boat_request(path, **{"daysailer-boom.toml": boom.read_text(encoding="utf-8")}))
    assert answer.status_code == 422
    assert answer.json()["key"] == "hollow.stavs"
    assert cli_message(result) == answer.json()["message"].replace("daysailer-boom.toml", str(boom), 1)


def test_boat_request_without_a_listed_spar_or_not_a_boat(client):
    path = SAMPLES / "daysailer.toml"
    asked = boat_request(path)
    del asked["spars"]["daysailer-gaff.toml"]
    answer = client.post("/api/boat/check", params={"name": path.name}, json=asked)
    assert answer.status_code == 422
    assert "daysailer-gaff.toml" in answer.json()["message"] and answer.json()["key"].startswith("boat.spars")
    answer = client.post("/api/boat/check", params={"name": "m.toml"},
                         json={"boat": MAST.read_text(encoding="utf-8"), "spars": {}})
    assert answer.status_code == 422 and "not a boat file" in answer.json()["message"]
    for bad in ("[1, 2]", '{"boat": 3, "spars": {}}', '{"boat": "", "spars": {"a": 1}}', "not json"):
        assert client.post("/api/boat/check", content=bad.encode()).status_code == 400


def test_start_lists_the_bundled_boats():
    from stavegen.serve.app import bundled_boats

    with make_client(boats=bundled_boats(SAMPLES)) as c:
        start = c.get("/api/start").json()
        assert set(start["boats"]) == {p.name for p in BOAT_FILES}
        assert start["boat"] is None
        sample = c.get("/api/sample/daysailer.toml").json()["boat"]
        assert sample["text"] == (SAMPLES / "daysailer.toml").read_text(encoding="utf-8")
        assert set(sample["spars"]) == {"daysailer-mast.toml", "daysailer-boom.toml", "daysailer-gaff.toml"}
