"""A real browser on the page: Debian's headless Chromium driven by Selenium, and `stavegen serve` run as
the builder runs it. Shared by tests/test_serve_browser.py and docs/make_screenshot.py."""

from __future__ import annotations

import os
import re
import subprocess
import sys
import tempfile
import time
from pathlib import Path

CHROMIUM = Path("/usr/bin/chromium")
CHROMEDRIVER = Path("/usr/bin/chromedriver")
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         "--disable-dev-shm-usage"]


def chromium_available() -> bool:
    return CHROMIUM.exists() and CHROMEDRIVER.exists()


def start_chromium(download_dir: Path, width: int = 1500, height: int = 1100):
    """A headless Chromium with a fresh profile that saves downloads into ``download_dir``."""
    from selenium import webdriver
    from selenium.webdriver.chrome.service import Service

    options = webdriver.ChromeOptions()
    options.binary_location = str(CHROMIUM)
    for flag in FLAGS:
        options.add_argument(flag)
    profile = tempfile.mkdtemp(prefix="stavegen-chromium-")
    options.add_argument(f"--user-data-dir={profile}")
    options.add_argument(f"--window-size={width},{height}")
    options.add_experimental_option("prefs", {
        "download.default_directory": str(download_dir),
        "download.prompt_for_download": False,
        "safebrowsing.enabled": False,
    })
    driver = webdriver.Chrome(service=Service(str(CHROMEDRIVER)), options=options)
    driver.execute_cdp_cmd("Page.setDownloadBehavior", {"behavior": "allow", "downloadPath": str(download_dir)})
    return driver


def start_server(spar: Path | None, timeout: float = 90.0, cwd: Path | None = None) -> tuple[subprocess.Popen, str]:
    """`stavegen serve SPAR --no-browser --port 0` as a child process (in ``cwd``); returns it and the page's
    address."""
    args = [sys.executable, "-m", "stavegen", "serve", "--no-browser", "--port", "0"]
    if spar is not None:
        args.insert(4, str(spar))
    env = dict(os.environ, PYTHONUNBUFFERED="1")
    process = subprocess.Popen(args, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=env, cwd=cwd)
    deadline = time.monotonic() + timeout
    while time.monotonic() < deadline:
        line = process.stdout.readline()
        if not line:
            break
        found = re.search(r"(http://\S+/)", line)
        if found:
            return process, found.group(1)
    process.kill()
    raise RuntimeError(f"stavegen serve did not start: {process.stderr.read()}")


def stop_server(process: subprocess.Popen) -> None:
    process.terminate()
    try:
        process.wait(timeout=20)
    except subprocess.TimeoutExpired:
        process.kill()
        process.wait()
