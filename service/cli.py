"""The ``formwise`` command line (also ``python -m service``).

Exit codes scripts can rely on: 0 success, 1 the command failed (bad data, server failure),
2 usage or input errors (argparse's convention).
"""

from __future__ import annotations

import argparse
import json
import os
import sys
from collections.abc import Sequence
from pathlib import Path

EXIT_OK = 0
EXIT_FAILED = 1
EXIT_USAGE = 2

SCHEMA_PATH = Path(__file__).resolve().parent.parent / "schemas" / "openapi.json"


def gunicorn_argv(host: str, port: int, workers: int) -> list[str]:
    """The gunicorn command line used by ``formwise serve`` and docker/Dockerfile."""
    return [
        sys.executable, "-m", "gunicorn",
        "--workers", str(workers),
        "--bind", f"{host}:{port}",
        "--access-logfile", "-",
        "service.wsgi:app",
    ]


def openapi_document() -> dict:
    """The OpenAPI document the app serves, as a dict."""
    from service import create_app

    app = create_app({"TESTING": True})
    with app.test_client() as client:
        return client.get("/v1/openapi.json").get_json()


def write_openapi(path: Path) -> None:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(json.dumps(openapi_document(), indent=2, sort_keys=True) + "\n")


def _serve(args: argparse.Namespace) -> int:
    argv = gunicorn_argv(args.host, args.port, args.workers)
    os.execv(argv[0], argv)
    return EXIT_FAILED  # execv does not return


def _schemas(args: argparse.Namespace) -> int:
    write_openapi(Path(args.output))
    print(f"wrote {args.output}")
    return EXIT_OK


def _validate_data(args: argparse.Namespace) -> int:
    from service.core import materials
    from service.core.errors import DataError

    try:
        table = materials.load_csv(args.file) if args.file else materials.load_builtin()
    except DataError as error:
        print(f"formwise: {error}", file=sys.stderr)
        return EXIT_FAILED
    print(f"ok: {len(table)} materials")
    return EXIT_OK


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="formwise", description=__doc__.splitlines()[0])
    commands = parser.add_subparsers(dest="command", required=True)

    serve = commands.add_parser("serve", help="run the HTTP service with gunicorn")
    serve.add_argument("--host", default=os.environ.get("FORMWISE_HOST", "127.0.0.1"))
    serve.add_argument("--port", type=int, default=int(os.environ.get("FORMWISE_PORT", "8000")))
    serve.add_argument(
        "--workers", type=int, default=int(os.environ.get("FORMWISE_WORKERS", "2"))
    )
    serve.set_defaults(run=_serve)

    schemas = commands.add_parser("schemas", help="write the OpenAPI document")
    schemas.add_argument("-o", "--output", default=str(SCHEMA_PATH))
    schemas.set_defaults(run=_schemas)

    validate = commands.add_parser("validate-data", help="load and check a materials CSV")
    validate.add_argument("file", nargs="?", help="a materials CSV (default: built-in data)")
    validate.set_defaults(run=_validate_data)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    args = build_parser().parse_args(argv)
    return args.run(args)
