"""Shared fixtures: a real gunicorn serving heatlift on a free loopback port."""

from __future__ import annotations

import contextlib
import os
import socket
import subprocess
import sys
import time
from collections.abc import Iterator
from pathlib import Path

import pytest
import requests

ROOT = Path(__file__).resolve().parents[1]


def free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return int(sock.getsockname()[1])


def start_server(
    env: dict[str, str] | None = None, workers: int = 2
) -> tuple[subprocess.Popen, str]:
    """Start ``heatlift serve`` (the same command as the README and the image) and wait for it."""
    port = free_port()
    url = f"http://127.0.0.1:{port}"
    log = open(Path(os.environ.get("TMPDIR", "/tmp")) / f"heatlift-test-{port}.log", "w")
    proc = subprocess.Popen(
        [sys.executable, "-m", "heatlift.cli", "serve", "--bind", f"127.0.0.1:{port}",
         "--workers", str(workers)],
        cwd=ROOT, env={**os.environ, **(env or {})}, stdout=log, stderr=subprocess.STDOUT,
    )
    deadline = time.monotonic() + 120
    while time.monotonic() < deadline:
        if proc.poll() is not None:
            raise RuntimeError(f"heatlift serve exited with {proc.returncode}; see {log.name}")
        with contextlib.suppress(requests.ConnectionError, requests.Timeout):  # not up yet
            if requests.get(url + "/v1/ready", timeout=5).status_code == 200:
                return proc, url
        time.sleep(0.2)
    proc.terminate()
    raise RuntimeError("heatlift serve did not become ready within 120 s")


def stop_server(proc: subprocess.Popen) -> None:
    proc.terminate()
    try:
        proc.wait(timeout=30)
    except subprocess.TimeoutExpired:
        proc.kill()


@pytest.fixture(scope="session")
def server() -> Iterator[str]:
    """Base URL of a gunicorn running heatlift with two workers."""
    proc, url = start_server()
    yield url
    stop_server(proc)


@pytest.fixture(scope="session")
def http(server: str) -> Iterator[Client]:
    with requests.Session() as session:
        yield Client(server, session)


class Client:
    """A thin helper over requests for the API tests: ``http.get(path, **params)``."""

    def __init__(self, base: str, session: requests.Session) -> None:
        self.base = base
        self.session = session

    def get(self, path: str, **params: object) -> requests.Response:
        return self.session.get(self.base + path, params=params, timeout=60)

    def post(self, path: str, body: object = None, **kwargs: object) -> requests.Response:
        return self.session.post(self.base + path, json=body, timeout=60, **kwargs)  # type: ignore[arg-type]
