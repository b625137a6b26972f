"""WSGI entry point: ``gunicorn api.wsgi:app``.

The property models are built before the first request (in gunicorn's master, which preloads
the application, so that every worker starts warm).
"""

from api import create_app

app = create_app({"HEATLIFT_WARM_UP": "now"})
