"""The builder's page, keystroke to update: Debian's headless Chromium driven by Selenium on `stavegen serve`.

Run from the repository root with the project and its test extras installed and Chromium present
(apt-get install chromium chromium-driver):

    python benchmarks/bench_page.py

For each bundled spar sample it selects the sample on the page, types four keys into the margin field
(each a new value) and reads the page's own timings (window.stavegenTimings): from the key's input event to
the last drawing ("after the keystroke", the page's 250 ms pause for more typing included) and from the
laid-out check's request to the last drawing ("server and drawing"). Prints the median and largest of the
four per sample, in milliseconds, as a table for docs/benchmarks.md. Nothing here is a test: the suite
only checks that the page follows the typing (tests/test_serve_browser.py).
"""

from __future__ import annotations

import statistics
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests"))

from browser import chromium_available, start_chromium, start_server, stop_server  # noqa: E402

SAMPLES = sorted(p for p in (ROOT / "samples").glob("*.toml") if "[boat]" not in p.read_text(encoding="utf-8"))
KEYS = "1234"
WAIT = 90  # seconds: a ceiling for a slow machine


def main() -> int:
    if not chromium_available():
        print("needs /usr/bin/chromium and /usr/bin/chromedriver (apt-get install chromium chromium-driver)")
        return 2
    from selenium.webdriver.common.by import By
    from selenium.webdriver.common.keys import Keys
    from selenium.webdriver.support.ui import Select, WebDriverWait

    with tempfile.TemporaryDirectory() as folder:
        spar = Path(folder) / SAMPLES[0].name
        spar.write_bytes(SAMPLES[0].read_bytes())
        process, url = start_server(spar)
        driver = start_chromium(Path(folder))
        try:
            driver.get(url)
            body = driver.find_element(By.CSS_SELECTOR, "body")

            def updates() -> int:
                return int(body.get_attribute("data-updates") or 0)

            def settle(before: int) -> None:
                WebDriverWait(driver, WAIT, poll_frequency=0.02).until(
                    lambda d: updates() > before and body.get_attribute("data-busy") == "0")

            settle(0)
            print("| sample | after the keystroke | server and drawing |\n| --- | ---: | ---: |")
            for sample in SAMPLES:
                before = updates()
                Select(driver.find_element(By.CSS_SELECTOR, "#samples")).select_by_value(sample.name)
                settle(before)
                field = driver.find_element(By.CSS_SELECTOR, 'input[data-key="hollow.margin"]')
                before = updates()
                field.send_keys(Keys.CONTROL, "a")
                field.send_keys("0.0")
                settle(before)
                key, req = [], []
                for k in KEYS:
                    before = updates()
                    field.send_keys(k)
                    settle(before)
                    last = driver.execute_script("return window.stavegenTimings[window.stavegenTimings.length - 1]")
                    if not last["ok"]:
                        raise SystemExit(f"{sample.name}: the page did not take the edit")
                    key.append(last["afterKeystrokeMs"])
                    req.append(last["afterRequestMs"])
                print(f"| {sample.name} | {statistics.median(key):.0f}, {max(key):.0f} "
                      f"| {statistics.median(req):.0f}, {max(req):.0f} |", flush=True)
        finally:
            driver.quit()
            stop_server(process)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
