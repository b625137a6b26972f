"""WSGI entry point: ``gunicorn api.wsgi:app``.

The property models are built before the first request (in gunicorn's master, which preloads
the application, so that every worker starts warm). Everything built so far then lives as
long as the process: ``gc.freeze()`` moves it out of the cyclic collector's reach, so that
the collector's sweeps in a worker cover only what requests create (and forked workers share
those pages instead of copying them when the collector would touch them).
"""

import gc

from api import create_app

app = create_app({"HEATLIFT_WARM_UP": "now"})
gc.freeze()
