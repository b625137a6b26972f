"""gunicorn settings for heatlift, used by ``heatlift serve`` and by the container image.

The service is CPU-bound and stateless, so:

- synchronous workers, one per core by default: threads would contend for the interpreter
  lock, and asynchronous workers gain nothing without waits on I/O;
- ``preload_app``: the application and every refrigerant's property model are built once in
  the master and shared by fork, so a (re)started worker is ready at once;
- ``timeout`` above the calculation deadline (HEATLIFT_SOLVER_DEADLINE, 10 s): a worker stuck
  longer is a defect and the master replaces it;
- ``graceful_timeout``: on SIGTERM (a rolling update) requests in flight may finish;
- ``max_requests`` with jitter: workers are recycled now and then, so that slow growth of
  memory in a native library never accumulates, and not all at once.

Each setting can be changed by an environment variable with the ``HEATLIFT_`` prefix.
"""

import multiprocessing
import os
import shutil
import tempfile

bind = os.environ.get("HEATLIFT_BIND", "127.0.0.1:8080")
workers = int(os.environ.get("HEATLIFT_WORKERS", multiprocessing.cpu_count()))
worker_class = "sync"
preload_app = True
timeout = int(os.environ.get("HEATLIFT_TIMEOUT", "30"))
graceful_timeout = int(os.environ.get("HEATLIFT_GRACEFUL_TIMEOUT", "20"))
keepalive = 5  # used only behind an async worker; sync workers close each connection
max_requests = int(os.environ.get("HEATLIFT_MAX_REQUESTS", "20000"))
max_requests_jitter = int(os.environ.get("HEATLIFT_MAX_REQUESTS_JITTER", "2000"))
loglevel = os.environ.get("HEATLIFT_LOG_LEVEL", "info")
accesslog = None  # the application writes structured access logs itself (api/access_log.py)
# gunicorn's own lines in the same format (JSON by default, HEATLIFT_LOG_FORMAT)
logger_class = "api.access_log.GunicornLogger"
control_socket_disable = True
wsgi_app = "api.wsgi:app"

# Prometheus multi-process mode: every worker writes its samples into one directory, which
# must be empty when the service starts (the files of earlier processes would be summed in):
# a fresh one unless the operator names one, removed again when the master exits
_created_metrics_dir = None
if not os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
    _created_metrics_dir = tempfile.mkdtemp(prefix="heatlift-metrics-")
    os.environ["PROMETHEUS_MULTIPROC_DIR"] = _created_metrics_dir


def on_exit(server):  # type: ignore[no-untyped-def]
    if _created_metrics_dir:
        shutil.rmtree(_created_metrics_dir, ignore_errors=True)


def child_exit(server, worker):  # type: ignore[no-untyped-def]
    from prometheus_client import multiprocess

    multiprocess.mark_process_dead(worker.pid)
