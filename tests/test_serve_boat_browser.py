"""A boat on the page, in a real browser (Debian's headless Chromium, driven by Selenium): `stavegen serve BOAT`
shows the boat's spars as tabs with each spar's verdict, the boat's verdict and its one board order; an edit to one
spar changes that spar's verdict and the boat's; the boat's papers downloaded as a zip are the files a command-line
build of the same files writes, JSON equal.

Skipped only where Chromium is missing and CI is unset; .ci/run installs Chromium and sets CI.
"""

from __future__ import annotations

import json
import os
import shutil
import zipfile
from typing import Any

import pytest

from browser import chromium_available, start_chromium, start_server, stop_server
from conftest import SAMPLES
from test_serve_browser import WAIT, Page

pytestmark = pytest.mark.skipif(not chromium_available() and not os.environ.get("CI"),
                                reason="needs /usr/bin/chromium and /usr/bin/chromedriver (apt-get install chromium "
                                       "chromium-driver); never skipped in CI")


def without_sources(value: Any) -> Any:
    """JSON without its "source" keys: the page names each file by its name, the command line by its path."""
    if isinstance(value, dict):
        return {k: without_sources(v) for k, v in value.items() if k != "source"}
    if isinstance(value, list):
        return [without_sources(v) for v in value]
    return value


def boat_updates(page: Page) -> int:
    return int(page.find("body").get_attribute("data-boat-updates") or 0)


def wait_boat(page: Page, before: int) -> None:
    from selenium.webdriver.support.ui import WebDriverWait

    body = page.find("body")
    WebDriverWait(page.driver, WAIT, poll_frequency=0.05).until(
        lambda d: boat_updates(page) > before and body.get_attribute("data-boat-busy") == "0")


@pytest.fixture(scope="module")
def boat_page(tmp_path_factory):
    folder = tmp_path_factory.mktemp("boat")
    for path in SAMPLES.glob("daysailer*.toml"):
        shutil.copy(path, folder / path.name)
    downloads = folder / "downloads"
    downloads.mkdir()
    process, url = start_server(folder / "daysailer.toml")
    driver = start_chromium(downloads)
    try:
        driver.get(url)
        result = Page(driver, url, folder / "daysailer.toml", downloads)
        result.settle(0)
        wait_boat(result, 0)
        yield result
    finally:
        driver.quit()
        stop_server(process)


def test_boat_tabs_verdicts_and_one_order(boat_page, run, tmp_path):
    page = boat_page
    assert page.find("#boat-bar").is_displayed()
    tabs = page.finds("#boat-spars button")
    assert [t.get_attribute("data-file") for t in tabs] == [
        "daysailer-mast.toml", "daysailer-boom.toml", "daysailer-gaff.toml"]  # the boat file's order
    check = run(["check", page.spar, "--json"])
    assert check.exit_code == 0, check.stderr
    cli = json.loads(check.stdout)
    assert [t.get_attribute("data-passed") for t in tabs] == [str(s["passed"]).lower() for s in cli["boat"]["spars"]]
    assert page.find("#boat-verdict").get_attribute("data-passed") == "true"
    assert page.find("#file-name").text == "daysailer-mast.toml"
    assert "board feet to buy" in page.find("#boat-summary").text

    # open the boom and make its wall far too thin: the boom fails, and so does the boat
    before, boat_before = page.updates(), boat_updates(page)
    page.find('#boat-spars button[data-file="daysailer-boom.toml"]').click()
    page.settle(before)
    assert page.find("#file-name").text == "daysailer-boom.toml"
    boat_before = boat_updates(page)
    page.type_into('input[data-key="hollow.wall"]', "1/4")
    wait_boat(page, boat_before)
    assert page.find("#verdict").get_attribute("data-passed") == "false"
    assert page.find('#boat-spars button[data-file="daysailer-boom.toml"]').get_attribute("data-passed") == "false"
    assert page.find("#boat-verdict").get_attribute("data-passed") == "false"

    # the mast keeps its own text when the page goes back to it
    before = page.updates()
    page.find('#boat-spars button[data-file="daysailer-mast.toml"]').click()
    page.settle(before)
    assert page.find("#verdict").get_attribute("data-passed") == "true"

    # the edited boom as the page downloads it, beside the boat file: the command line builds what the page zips
    before = page.updates()
    page.find('#boat-spars button[data-file="daysailer-boom.toml"]').click()
    page.settle(before)
    seen = {p.name for p in page.downloads.iterdir()}
    boom = page.download("#download-toml", ".toml", seen)
    (page.spar.parent / "daysailer-boom.toml").write_bytes(boom.read_bytes())
    seen = {p.name for p in page.downloads.iterdir()}
    archive = zipfile.ZipFile(page.download("#download-boat-zip", ".zip", seen))
    out = tmp_path / "cli"
    result = run(["build", page.spar, "-o", out])
    assert result.exit_code == 1, result.stderr  # the boom misses its target
    written = sorted(p.name for p in out.iterdir())
    assert sorted(archive.namelist()) == written
    for name in written:
        if name.endswith(".json"):
            ours = json.loads(archive.read(name).decode("utf-8"))
            theirs = json.loads((out / name).read_text(encoding="utf-8"))
            assert without_sources(ours) == without_sources(theirs)
            assert ours["boat"]["passed"] is False
