"""The committed snapshot of the OpenAPI document, ``schemas/openapi.json``.

The document is generated from the marshmallow schemas by flask-smorest at start-up; the
snapshot lets a review see every change of the HTTP contract as a diff, and
``tests/api/test_openapi.py`` fails when the two drift apart. Regenerate it with one command::

    python -m api.openapi_snapshot            # write schemas/openapi.json
    python -m api.openapi_snapshot --check    # exit 1 (and say so) when it is out of date

The snapshot is built from the code alone: an application with the default settings
(``HEATLIFT_*`` environment variables are ignored) and no warm-up.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
from pathlib import Path
from typing import Any

SNAPSHOT = Path(__file__).resolve().parents[1] / "schemas" / "openapi.json"
COMMAND = "python -m api.openapi_snapshot"


def document() -> dict[str, Any]:
    """The OpenAPI document the service serves at /openapi.json, with default settings."""
    saved = {k: v for k, v in os.environ.items() if k.startswith("HEATLIFT_")}
    for key in saved:
        del os.environ[key]
    try:
        from api import create_app

        app = create_app({"HEATLIFT_WARM_UP": False})
    finally:
        os.environ.update(saved)
    api = app.extensions["flask-smorest"]["apis"][""]["ext_obj"]
    with app.app_context():
        return json.loads(json.dumps(api.spec.to_dict()))


def render(doc: dict[str, Any]) -> str:
    """The snapshot's text: two-space indents, keys in the generated order, a final newline."""
    return json.dumps(doc, indent=2, ensure_ascii=False) + "\n"


def committed() -> dict[str, Any] | None:
    if not SNAPSHOT.exists():
        return None
    return json.loads(SNAPSHOT.read_text("utf-8"))


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m api.openapi_snapshot",
                                     description=__doc__.split("\n\n")[0])
    parser.add_argument("--check", action="store_true",
                        help="only compare; exit 1 when the snapshot is out of date")
    args = parser.parse_args(argv)
    doc = document()
    if args.check:
        if committed() != doc:
            print(f"{SNAPSHOT} is out of date; regenerate it with: {COMMAND}", file=sys.stderr)
            return 1
        print(f"{SNAPSHOT} is up to date")
        return 0
    SNAPSHOT.write_text(render(doc), "utf-8")
    print(f"wrote {SNAPSHOT} ({len(doc.get('paths', {}))} paths)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
