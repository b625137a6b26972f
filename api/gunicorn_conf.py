"""gunicorn settings for heatlift, used by ``heatlift serve`` and by the container image.

The service is CPU-bound and stateless: synchronous workers, one per core, are the right fit
(threads would contend for the interpreter lock; async workers gain nothing without I/O waits).
Each setting can be changed by an environment variable with the ``HEATLIFT_`` prefix.
"""

import multiprocessing
import os

bind = os.environ.get("HEATLIFT_BIND", "127.0.0.1:8080")
workers = int(os.environ.get("HEATLIFT_WORKERS", multiprocessing.cpu_count()))
worker_class = "sync"
# a solver that runs longer than this is a defect; the master replaces the worker
timeout = int(os.environ.get("HEATLIFT_TIMEOUT", "30"))
graceful_timeout = int(os.environ.get("HEATLIFT_GRACEFUL_TIMEOUT", "20"))
keepalive = 5
# recycle workers now and then so that slow growth of memory never accumulates;
# the jitter keeps the workers from restarting all at once
max_requests = int(os.environ.get("HEATLIFT_MAX_REQUESTS", "20000"))
max_requests_jitter = int(os.environ.get("HEATLIFT_MAX_REQUESTS_JITTER", "2000"))
loglevel = os.environ.get("HEATLIFT_LOG_LEVEL", "info")
accesslog = os.environ.get("HEATLIFT_ACCESS_LOG", "-")
wsgi_app = "api.wsgi:app"
