"""Loading the property library and every catalogue fluid once, before a worker serves."""

from __future__ import annotations

import threading

from heatlift import properties_tables
from heatlift.properties import model
from heatlift.refrigerants import catalogue

_done = threading.Event()
_lock = threading.Lock()


def warm_up() -> None:
    """Build the property model (and its critical point) of every catalogue refrigerant."""
    with _lock:
        if _done.is_set():
            return
        for designation in catalogue():
            model(designation)
        properties_tables.preload()  # the blends' tables, built at install: read, never built
        _done.set()


def is_warm() -> bool:
    return _done.is_set()


def warm_up_in_background() -> threading.Thread:
    thread = threading.Thread(target=warm_up, name="heatlift-warm-up", daemon=True)
    thread.start()
    return thread
