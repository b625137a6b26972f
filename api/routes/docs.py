"""GET /docs: a reference page for the API that needs no internet access.

The page (``api/static/docs.html``) is self-contained: its style and script are inline, it loads
nothing but ``/openapi.json`` from this service and lists every path, method, summary,
parameter and request/response field with its quantity kind. The table of SI and IP units of
each kind is filled in here from :mod:`schemas.units`, so it cannot drift from the unit layer.
flask-smorest's own documentation pages (which load their scripts from a CDN) are not enabled.
"""

from __future__ import annotations

import html
from functools import cache
from importlib import resources

from flask import Response
from flask.views import MethodView
from flask_smorest import Blueprint

from schemas.units import _KINDS

ORDER = 90
blp = Blueprint("docs", __name__, description="This reference page")

# the page may talk to this service only: no scripts, styles or images from elsewhere
_POLICY = ("default-src 'none'; connect-src 'self'; script-src 'unsafe-inline'; "
           "style-src 'unsafe-inline'; img-src 'self' data:; base-uri 'none'; form-action 'none'")


@cache
def page() -> str:
    """The documentation page with the unit table filled in (built once)."""
    template = resources.files("api").joinpath("static/docs.html").read_text("utf-8")
    rows = "".join(
        f"<tr><td>{html.escape(kind)}</td><td>{html.escape(si)}</td><td>{html.escape(ip)}</td>"
        "</tr>"
        for kind, (_base, si, ip) in _KINDS.items()
    )
    return template.replace("__UNITS_TABLE__", rows)


@blp.route("/docs")
class Docs(MethodView):
    @blp.doc(responses={"200": {"description": "the reference page",
                                "content": {"text/html": {"schema": {"type": "string"}}}}})
    def get(self):
        """This API reference as one HTML page that works offline."""
        response = Response(page(), mimetype="text/html")
        response.headers["Content-Security-Policy"] = _POLICY
        return response
