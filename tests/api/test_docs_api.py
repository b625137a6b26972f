"""GET /docs: an HTML reference that works with no internet access."""

from __future__ import annotations

import re
from html.parser import HTMLParser

EXTERNAL = re.compile(r"^\s*(https?:)?//", re.IGNORECASE)


class _Resources(HTMLParser):
    """Every URL the page would load: script src, link href, img src, iframe src, and
    url(...) or @import inside inline styles."""

    def __init__(self) -> None:
        super().__init__()
        self.urls: list[tuple[str, str]] = []
        self.scripts = 0
        self._in_style = False

    def handle_starttag(self, tag, attrs):
        values = dict(attrs)
        if tag == "script":
            self.scripts += 1
        for name in ("src", "href") if tag in ("script", "link", "img", "iframe") else ():
            if values.get(name):
                self.urls.append((tag, values[name]))
        self._in_style = tag == "style"

    def handle_endtag(self, tag):
        self._in_style = False

    def handle_data(self, data):
        if self._in_style:
            for url in re.findall(r"url\(([^)]*)\)|@import\s+['\"]([^'\"]+)", data):
                self.urls.append(("style", "".join(url).strip("'\"")))


def test_docs_is_a_self_contained_html_page(http):
    r = http.get("/docs")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/html")
    page = _Resources()
    page.feed(r.text)
    assert page.scripts >= 1  # the inline script that reads /openapi.json
    external = [(tag, url) for tag, url in page.urls if EXTERNAL.match(url)]
    assert not external, external
    # nothing anywhere in the page points a browser at another host
    assert not re.search(r"""(src|href)\s*=\s*["']?\s*(https?:)?//""", r.text, re.IGNORECASE)
    assert "cdn" not in r.text.lower()
    assert "openapi.json" in r.text


def test_docs_forbids_loading_from_elsewhere(http):
    policy = http.get("/docs").headers["Content-Security-Policy"]
    assert "default-src 'none'" in policy and "connect-src 'self'" in policy


def test_docs_lists_the_units_of_every_kind(http):
    text = http.get("/docs").text
    for kind, si, ip in (("pressure", "kPa", "psi"), ("temperature_difference", "K",
                                                       "delta_degF"),
                         ("specific_enthalpy", "kJ/kg", "Btu/lb")):
        assert f"<tr><td>{kind}</td><td>{si}</td><td>{ip}</td></tr>" in text


def test_flask_smorest_cdn_pages_are_not_served(http):
    for path in ("/swagger-ui", "/redoc", "/rapidoc", "/docs/swagger-ui"):
        assert http.get(path).status_code == 404, path


def test_no_cdn_doc_routes_in_the_app():
    from api import create_app

    app = create_app({"HEATLIFT_WARM_UP": False})
    endpoints = {rule.endpoint for rule in app.url_map.iter_rules()}
    assert not {e for e in endpoints if any(w in e for w in ("swagger", "redoc", "rapidoc"))}
    assert "docs.Docs" in endpoints
