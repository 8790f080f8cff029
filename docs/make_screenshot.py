"""Take the README's picture of the builder's page: `stavegen serve` on the demo boat's mast, in Debian's
headless Chromium driven by Selenium (the same set-up as tests/test_serve_browser.py).

    python docs/make_screenshot.py            # writes docs/images/serve-page.png

Needs `apt-get install chromium chromium-driver` and the test extra (`pip install -e ".[test]"`).
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests"))

from browser import start_chromium, start_server, stop_server  # noqa: E402

OUT = ROOT / "docs" / "images" / "serve-page.png"
SPAR = Path("samples") / "daysailer-mast.toml"  # as a builder would type it, from the repository's top


def main() -> None:
    process, url = start_server(SPAR, cwd=ROOT)
    driver = start_chromium(Path(tempfile.mkdtemp(prefix="stavegen-shot-")), width=1440, height=1240)
    try:
        driver.get(url)
        deadline = time.monotonic() + 90
        body = driver.find_element("css selector", "body")
        while time.monotonic() < deadline:
            if int(body.get_attribute("data-updates") or 0) > 0 and body.get_attribute("data-busy") == "0":
                break
            time.sleep(0.1)
        else:
            raise SystemExit("the page did not finish its first update")
        OUT.parent.mkdir(parents=True, exist_ok=True)
        driver.save_screenshot(str(OUT))
    finally:
        driver.quit()
        stop_server(process)
    print(f"wrote {OUT.relative_to(ROOT)}")


if __name__ == "__main__":
    main()
