"""Opt-in: the HTML report rendered by headless Chromium (skipped when Chromium is absent;
install it with `apt-get install chromium`)."""

from __future__ import annotations

import shutil
import subprocess

import pytest

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")


@pytest.mark.skipif(CHROMIUM is None, reason="headless Chromium is not installed")
def test_html_report_renders_in_chromium(demo_build, tmp_path):
    png = tmp_path / "page.png"
    html = demo_build.out_dir / "report.html"
    subprocess.run(
        [CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
         "--disable-component-update", "--disable-sync", "--no-first-run",
         f"--user-data-dir={tmp_path / 'profile'}", "--window-size=1200,1600",
         f"--screenshot={png}", html.as_uri()],
        check=True, capture_output=True, timeout=120)
    from PIL import Image

    with Image.open(png) as im:
        assert im.size == (1200, 1600)
        colours = im.convert("L").getextrema()
    assert colours[0] < 100 < colours[1], "the page rendered blank"
