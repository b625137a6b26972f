"""/docs in a real headless browser (Debian's chromium), against the real gunicorn.

The page lists the endpoints only once its script has read /openapi.json, so the endpoints in
the rendered DOM prove the script ran; every host but the loopback resolves to nothing
(``--host-resolver-rules``), so a page that needed the internet would come out empty. The
screenshot must show the page: not one colour, and the endpoint list in its left column.

Without chromium the tests skip, except under CI (CI=true), where they fail: .ci/run installs
it (``apt-get install -y chromium``).
"""

from __future__ import annotations

import os
import shutil
import subprocess
from pathlib import Path

import pytest
import requests

from tests.api.production import operations

CHROMIUM_NAMES = ("chromium", "chromium-browser")
NAV_WIDTH = 260  # px, the endpoint list: "grid-template-columns: 260px 1fr" in docs.html


def chromium() -> str:
    for name in CHROMIUM_NAMES:
        found = shutil.which(name)
        if found:
            return found
    message = ("chromium is not installed (Debian: apt-get install -y chromium); "
               "the /docs browser tests need it")
    if os.environ.get("CI", "").lower() in ("1", "true", "yes"):
        pytest.fail(message + " and CI is set")
    pytest.skip(message)


def browse(url: str, tmp_path: Path, *args: str) -> subprocess.CompletedProcess[str]:
    profile = tmp_path / "profile"
    profile.mkdir(exist_ok=True)
    command = [
        chromium(), "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
        "--no-first-run", "--disable-background-networking", "--disable-component-update",
        "--disable-sync", "--disable-dev-shm-usage", "--hide-scrollbars",
        "--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1",
        f"--user-data-dir={profile}",
        # virtual time runs on only while nothing is loading: the script's fetch finishes
        "--virtual-time-budget=20000",
        *args, url,
    ]
    result = subprocess.run(command, capture_output=True, text=True, timeout=120)
    assert result.returncode == 0, result.stderr[-2000:]
    return result


@pytest.fixture(scope="module")
def document(server) -> dict:
    return requests.get(server + "/openapi.json", timeout=60).json()


def test_the_rendered_page_lists_every_endpoint(server, document, tmp_path):
    static = requests.get(server + "/docs", timeout=60).text
    assert "/v1/saturation" not in static  # so the DOM below is the script's work
    dom = browse(server + "/docs", tmp_path, "--dump-dom").stdout
    assert "Loading the OpenAPI document" not in dom
    for path in ("/v1/saturation", "/v1/cycle", "/v1/state", "/v1/refrigerants"):
        assert path in dom, path
    for method, path in operations(document):
        assert path in dom, (method, path)
    assert dom.count('class="op"') == len(operations(document))


def test_a_screenshot_shows_the_page(server, document, tmp_path):
    from matplotlib import image

    shot = tmp_path / "docs.png"
    browse(server + "/docs", tmp_path, f"--screenshot={shot}", "--window-size=1280,2000")
    assert shot.stat().st_size > 20_000, shot.stat().st_size
    pixels = image.imread(str(shot))[..., :3]  # floats 0..1, RGB
    height, width, _ = pixels.shape
    assert (width, height) == (1280, 2000)
    colours = {tuple(p) for p in (pixels[::7, ::7].reshape(-1, 3) * 255).round().astype(int)}
    assert len(colours) > 20, f"{len(colours)} colours: a blank page"
    ink = pixels.mean(axis=2) < 0.5
    assert 0.005 < ink.mean() < 0.5, ink.mean()  # text on a light page
    # the endpoint list: one line of dark text per operation in the left column
    rows = ink[:, 8:NAV_WIDTH - 8].any(axis=1)
    lines = int((rows[1:] & ~rows[:-1]).sum())
    assert lines >= len(operations(document)), f"{lines} lines of text in the endpoint list"
    keep = os.environ.get("HEATLIFT_KEEP_SCREENSHOT")
    if keep:
        shutil.copy(shot, keep)
