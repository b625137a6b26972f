"""Blueprints, one module per domain; each module has ``blp`` and is registered here.

Modules are found automatically: adding ``api/routes/<domain>.py`` with a ``blp`` is all it
takes. ``ORDER`` (optional, default 100) sorts them in the OpenAPI document.
"""

from __future__ import annotations

import importlib
import pkgutil

from flask_smorest import Blueprint


def _discover() -> list[Blueprint]:
    found = []
    for info in pkgutil.iter_modules(__path__):
        module = importlib.import_module(f"{__name__}.{info.name}")
        if isinstance(getattr(module, "blp", None), Blueprint):
            found.append((getattr(module, "ORDER", 100), info.name, module.blp))
    return [blp for _, _, blp in sorted(found, key=lambda item: (item[0], item[1]))]


ROUTES = _discover()
