"""The ``heatlift`` command.

``serve`` starts the HTTP service under gunicorn, ``check`` validates a datasheet, ``prepare``
and ``warm-tables`` build what the engine keeps, once, at install or image build.
"""

from __future__ import annotations

import argparse
import importlib.util
import multiprocessing
import os
import sys
from pathlib import Path


def _serve(args: argparse.Namespace) -> int:
    # found without importing the api package: that would load the property library (seconds)
    # in this process, which exec then throws away
    spec = importlib.util.find_spec("api")
    if spec is None or spec.origin is None:
        raise SystemExit("the api package is not installed")
    config = str(Path(spec.origin).parent / "gunicorn_conf.py")
    argv = [sys.executable, "-m", "gunicorn", "--config", config]
    if args.bind:
        argv += ["--bind", args.bind]
    if args.workers:
        argv += ["--workers", str(args.workers)]
    argv.append("api.wsgi:app")
    os.execv(sys.executable, argv)
    return 0  # not reached


def _prepare(_args: argparse.Namespace) -> int:
    """Build everything the engine keeps (property models of every catalogue refrigerant) once,
    as the container image does at build time; prints how long it took."""
    import time

    from heatlift.warmup import warm_up

    started = time.perf_counter()
    warm_up()
    print(f"heatlift: property models ready in {time.perf_counter() - started:.2f} s")
    return 0


def _warm_tables(args: argparse.Namespace) -> int:
    """Build the blends' saturation tables and the property library's tables of the pure
    fluids once (install or image build); see :mod:`heatlift.properties_tables` and
    :mod:`heatlift.starts`. With ``--blend``, only those blends' saturation tables."""
    from heatlift import properties_tables, starts

    if not args.blend:
        folder = starts.build(starts.catalogue_fluids())
        print(f"library tables written to {folder}")
    path = properties_tables.build(names=args.blend or None)
    print(f"tables written to {path}")
    return 0


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
    warm = sub.add_parser(
        "warm-tables",
        help="build the blends' saturation tables and the pure fluids' library tables once "
             "(at install or image build; "
             "HEATLIFT_TABLES_DIR says where, default ~/.cache/heatlift)",
    )
    warm.add_argument("--blend", action="append",
                      help="only this blend (repeatable); default every blend of the catalogue")
    warm.set_defaults(func=_warm_tables)
    prepare = sub.add_parser("prepare", help="build the property models once (image build)")
    prepare.set_defaults(func=_prepare)
    from heatlift.check_command import add_check_parser

    add_check_parser(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    args = build_parser().parse_args(argv)
    return int(args.func(args))


if __name__ == "__main__":
    sys.exit(main())
