"""The ``heatlift`` command: ``heatlift serve`` starts the HTTP service under gunicorn."""

from __future__ import annotations

import argparse
import multiprocessing
import os
import sys
from importlib import resources


def _serve(args: argparse.Namespace) -> int:
    config = str(resources.files("api").joinpath("gunicorn_conf.py"))
    argv = [sys.executable, "-m", "gunicorn", "--config", config]
    if args.bind:
        argv += ["--bind", args.bind]
    if args.workers:
        argv += ["--workers", str(args.workers)]
    argv.append("api.wsgi:app")
    os.execv(sys.executable, argv)
    return 0  # not reached


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="heatlift", description=__doc__)
    sub = parser.add_subparsers(dest="command", required=True)
    serve = sub.add_parser("serve", help="start the HTTP service (gunicorn)")
    serve.add_argument("--bind", help="address:port, default 127.0.0.1:8080 (HEATLIFT_BIND)")
    serve.add_argument(
        "--workers", type=int,
        help=f"worker processes, default the core count ({multiprocessing.cpu_count()})",
    )
    serve.set_defaults(func=_serve)
    return parser


def main(argv: list[str] | None = None) -> int:
    args = build_parser().parse_args(argv)
    return int(args.func(args))


if __name__ == "__main__":
    sys.exit(main())
