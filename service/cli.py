"""The ``formwise`` command line (also ``python -m service``).

Exit codes scripts can rely on:

- 0 success;
- 1 the command failed (bad data, a missing optional dependency);
- 2 usage or input errors (argparse's convention; a request file the API would refuse, with one
  ``file: field.path: message`` line per problem on stderr);
- 3 no feasible design (``design`` found none; ``sweep`` found none in any case; the output is
  still written);
- 4 the output could not be written (a missing folder, a full disk, a closed pipe).

Errors are one line each on stderr, never a traceback.
"""

from __future__ import annotations

import argparse
import contextlib
import json
import os
import sys
from collections.abc import Sequence
from contextlib import contextmanager
from pathlib import Path

EXIT_OK = 0
EXIT_FAILED = 1
EXIT_USAGE = 2
EXIT_NO_DESIGN = 3
EXIT_IO = 4

SCHEMA_PATH = Path(__file__).resolve().parent.parent / "schemas" / "openapi.json"


GUNICORN_THREADS = 4
"""Threads per worker: a long sweep streams in one thread while the worker's main thread
keeps reporting to the gunicorn master, so the worker is not killed mid-response."""

GUNICORN_TIMEOUT = 120
"""s: gunicorn's worker timeout (the silent-worker limit; requests may run longer)."""


def gunicorn_argv(host: str, port: int, workers: int) -> list[str]:
    """The gunicorn command line used by ``formwise serve`` and docker/Dockerfile."""
    return [
        sys.executable, "-m", "gunicorn",
        "--workers", str(workers),
        "--worker-class", "gthread",
        "--threads", str(GUNICORN_THREADS),
        "--timeout", str(GUNICORN_TIMEOUT),
        "--bind", f"{host}:{port}",
        "--access-logfile", "-",
        "service.wsgi:app",
    ]


def openapi_document() -> dict:
    """The OpenAPI document the app serves, as a dict."""
    from service import create_app

    app = create_app({"TESTING": True, "DATABASE_URL": "sqlite://", "JOBS_WORKER": False})
    with app.test_client() as client:
        return client.get("/v1/openapi.json").get_json()


def openapi_text() -> str:
    """The OpenAPI document as committed in schemas/openapi.json."""
    return json.dumps(openapi_document(), indent=2, sort_keys=True) + "\n"


def _serve(args: argparse.Namespace) -> int:
    argv = gunicorn_argv(args.host, args.port, args.workers)
    os.execv(argv[0], argv)
    return EXIT_FAILED  # execv does not return


def _schemas(args: argparse.Namespace) -> int:
    text = openapi_text()
    if args.output == "-":
        sys.stdout.write(text)
        return EXIT_OK
    Path(args.output).write_text(text)
    print(f"wrote {args.output}", file=sys.stderr)
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


def _read_spec(path: str, schema, overrides: dict[str, object] | None = None) -> dict:
    """Load a JSON request file through an API schema; SpecError carries field messages.

    ``overrides``: dotted paths set in the document before it is validated (command-line
    options such as ``--top``), so they are checked like the file's own values.
    """
    import marshmallow as ma

    from service.api.errors import flatten_messages

    try:
        text = Path(path).read_text()
    except OSError as error:
        raise SpecError({"$": [f"cannot read {path}: {error.strerror}"]}) from None
    try:
        document = json.loads(text)
    except json.JSONDecodeError as error:
        raise SpecError({"$": [f"not valid JSON: {error}"]}) from None
    for dotted, value in (overrides or {}).items():
        if value is not None:
            _set_path(document, dotted.split("."), value)
    try:
        return schema.load(document)
    except ma.ValidationError as error:
        raise SpecError(flatten_messages(error.messages)) from None


def _set_path(document: object, path: list[str], value: object) -> None:
    """Set ``document[path[0]][path[1]]... = value``, creating objects on the way; a document
    of the wrong shape is left for the schema to report."""
    node = document
    for part in path[:-1]:
        if not isinstance(node, dict):
            return
        node = node.setdefault(part, {})
    if isinstance(node, dict):
        node[path[-1]] = value


class SpecError(Exception):
    """A request file that the API would answer with 422 (or 400)."""

    def __init__(self, errors: dict[str, list[str]]):
        super().__init__(errors)
        self.errors = errors


def _report(path: str, errors: dict[str, list[str]]) -> int:
    for field, messages in errors.items():
        for message in messages:
            print(f"{path}: {field}: {message}", file=sys.stderr)
    return EXIT_USAGE


def _design(args: argparse.Namespace) -> int:
    from service.api.designs.schemas import DesignRequestSchema, design_response
    from service.core.errors import InputError
    from service.core.materials import load_builtin
    from service.usecases import answer, design_inputs

    overrides = {"top": args.top, "objective": args.objective}
    try:
        spec = _read_spec(args.file, DesignRequestSchema(), overrides)
        inputs = design_inputs(spec, load_builtin())
        found = answer(inputs)
    except (SpecError, InputError) as error:
        return _report(args.file, error.errors)
    response = design_response(found, inputs)
    text = json.dumps(response, indent=2) if args.json else design_table(response)
    status = _write_text(sys.stdout, text + "\n", "standard output")
    if status != EXIT_OK:
        return status
    return EXIT_OK if response["designs"] else EXIT_NO_DESIGN


def design_table(response: dict) -> str:
    """A readable table of a /v1/designs response (dimensions in mm)."""
    header = ("rank", "material", "section", "dimensions (mm)", "mass kg", "cost", "CO2e kg",
              "governing")
    lines = [header]
    for design in response["designs"]:
        dims = " x ".join(
            f"{name} {value * 1000:.2f}" for name, value in design["section"]["dimensions"].items()
        )
        lines.append((
            str(design["rank"]), design["material"]["id"], design["section"]["family"], dims,
            f"{design['mass']:.4g}", f"{design['cost']:.4g}", f"{design['carbon']:.4g}",
            design["governing"],
        ))
    widths = [max(len(row[i]) for row in lines) for i in range(len(header))]
    text = ["  ".join(cell.ljust(width) for cell, width in zip(row, widths, strict=True)).rstrip()
            for row in lines]
    if not response["designs"]:
        text.append("no feasible design; first reasons:")
        text.extend(f"  {_rejection_line(r)}" for r in response["rejected"][:5])
    text.extend(f"warning: {warning}" for warning in response.get("warnings", ()))
    text.append("")
    text.append(response["caution"])
    return "\n".join(text)


def _rejection_line(rejection: dict) -> str:
    """One entry of a response's ``rejected``: a group of its reason (the default), or one
    material and family (``"rejections": "all"``)."""
    if "count" in rejection:
        shown = rejection["materials"][:4]
        more = len(rejection["materials"]) - len(shown)
        names = ", ".join(shown) + (f" and {more} more" if more else "")
        return (f"{rejection['reason']} ({rejection['count']} pairs: {names} as "
                f"{', '.join(rejection['sections'])})")
    return f"{rejection['material']['id']} {rejection['section']}: {rejection['reason']}"


def _sweep(args: argparse.Namespace) -> int:
    from service.api.sweeps.schemas import SweepRequestSchema
    from service.config import load_config
    from service.core.errors import InputError
    from service.core.materials import load_builtin
    from service.usecases import sweep_inputs

    fmt = args.format or OUTPUT_SUFFIXES.get(Path(args.output).suffix.lower())
    if args.output == "-" and fmt is None:
        fmt = "csv"
    if fmt is None:
        print(f"formwise: {args.output}: use .csv, .jsonl, .json or .parquet, or --format",
              file=sys.stderr)
        return EXIT_USAGE
    overrides = {"top": args.top, "base.objective": args.objective}
    try:
        spec = _read_spec(args.file, SweepRequestSchema(), overrides)
        inputs = sweep_inputs(spec, load_builtin(), int(load_config()["SWEEP_MAX_CASES"]))
    except (SpecError, InputError) as error:
        return _report(args.file, error.errors)
    sweep = inputs.sweep
    rows = _sweep_rows(inputs, args.dask, args.workers)
    columns = sweep.columns()
    progress = Progress(len(sweep.cases), enabled=args.progress or sys.stderr.isatty())
    designed = DesignedCases(columns)
    writer, mode = OUTPUT_FORMATS[fmt]
    target = "standard output" if args.output == "-" else args.output
    try:
        with _output(args.output, mode) as handle:
            writer(handle, columns, designed.track(progress.track(rows, case_column=0)))
    except RuntimeError as error:  # an optional dependency (pyarrow, dask) is missing
        print(f"formwise: {error}", file=sys.stderr)
        return EXIT_FAILED
    except OSError as error:
        return _io_error(target, error)
    progress.finish()
    print(f"wrote {len(sweep.cases)} cases ({designed.count} with a design) to {target}",
          file=sys.stderr)
    return EXIT_OK if designed.count else EXIT_NO_DESIGN


class DesignedCases:
    """Counts the cases that have at least one design as their rows stream past."""

    def __init__(self, columns: Sequence[str]):
        self._case = list(columns).index("case")
        self._rank = list(columns).index("rank")
        self._cases: set[int] = set()

    @property
    def count(self) -> int:
        return len(self._cases)

    def track(self, rows):
        for row in rows:
            if row[self._rank] is not None:
                self._cases.add(row[self._case])
            yield row


@contextlib.contextmanager
def _output(path: str, mode: str):
    """The output stream: standard output for ``-``, else the file (text or binary)."""
    if path == "-":
        yield sys.stdout.buffer if mode == "b" else sys.stdout
        sys.stdout.flush()
        return
    with open(path, "wb" if mode == "b" else "w", newline="" if mode == "t" else None) as handle:
        yield handle


def _write_text(handle, text: str, target: str) -> int:
    try:
        handle.write(text)
        handle.flush()
    except OSError as error:
        return _io_error(target, error)
    return EXIT_OK


def _io_error(target: str, error: OSError) -> int:
    if isinstance(error, BrokenPipeError):
        # The reader went away (``| head``): nothing more can be written to it, and Python
        # would report the broken pipe again at exit unless stdout points elsewhere.
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return EXIT_IO
    print(f"formwise: cannot write {target}: {error.strerror or error}", file=sys.stderr)
    return EXIT_IO


def _sweep_rows(inputs, dask_address: str | None, workers: int = 1):
    if dask_address:
        from service.dask_backend import dask_sweep_rows

        return dask_sweep_rows(inputs.sweep, inputs.sizer(), dask_address)
    return inputs.rows(workers=workers)


class Progress:
    """A one-line progress bar on stderr, updated as cases complete."""

    WIDTH = 30

    def __init__(self, total: int, enabled: bool):
        self.total = total
        self.enabled = enabled
        self.done = 0

    def track(self, rows, case_column: int):
        for row in rows:
            self._update(row[case_column] + 1)
            yield row

    def _update(self, done: int) -> None:
        if not self.enabled or done == self.done:
            return
        self.done = done
        filled = self.WIDTH * done // max(self.total, 1)
        bar = "#" * filled + "." * (self.WIDTH - filled)
        print(f"\r[{bar}] {done}/{self.total} cases", end="", file=sys.stderr, flush=True)

    def finish(self) -> None:
        if self.enabled:
            print(file=sys.stderr)


def _write_csv(handle, columns, rows) -> None:
    from service.formats import csv_chunks

    for chunk in csv_chunks(columns, rows):
        handle.write(chunk)


def _write_jsonl(handle, columns, rows) -> None:
    from service.formats import ndjson_chunks

    for chunk in ndjson_chunks(columns, rows):
        handle.write(chunk)


def _write_json(handle, columns, rows) -> None:
    from service.formats import json_table

    rows = list(rows)
    cases = len({row[0] for row in rows})
    handle.write(json.dumps(json_table(columns, rows, cases)) + "\n")


def _write_parquet(handle, columns, rows) -> None:
    from service.core.sweeps import column_type
    from service.formats import parquet_bytes

    try:
        import pyarrow  # noqa: F401  (pandas needs it for parquet)
    except ImportError as error:
        raise RuntimeError("writing .parquet needs pyarrow (pip install pyarrow)") from error
    handle.write(parquet_bytes(columns, rows, column_type))


OUTPUT_FORMATS = {
    "csv": (_write_csv, "t"),
    "jsonl": (_write_jsonl, "t"),
    "json": (_write_json, "t"),
    "parquet": (_write_parquet, "b"),
}
"""Format name -> (writer of a table to an open stream, stream mode: text or binary)."""

OUTPUT_SUFFIXES = {
    ".csv": "csv", ".jsonl": "jsonl", ".ndjson": "jsonl", ".json": "json", ".parquet": "parquet",
}


@contextmanager
def _team_session():
    """A transaction on the service's database, as ``formwise serve`` would open it
    (migrated first)."""
    from flask import Flask

    from service.api.teams import open_storage
    from service.config import load_config

    storage = open_storage(load_config(), Flask("service").instance_path)
    try:
        with storage.transaction() as session:
            yield session
    finally:
        storage.dispose()


def _keys_create(args: argparse.Namespace) -> int:
    from service.storage.keys import create_key

    with _team_session() as session:
        key_id, key = create_key(session, args.team)
    print(f"created key {key_id} for team {args.team}; it is shown only now:")
    print(key)
    return EXIT_OK


def _keys_list(args: argparse.Namespace) -> int:
    from service.storage.keys import list_keys

    with _team_session() as session:
        found = list_keys(session)
    for key in found:
        print(f"{key.id}  {key.team}  created {key.created_at}"
              f"{'  revoked' if key.revoked else ''}")
    return EXIT_OK


def _keys_revoke(args: argparse.Namespace) -> int:
    from service.storage.keys import revoke_key

    with _team_session() as session:
        found = revoke_key(session, args.key_id)
    if not found:
        print(f"formwise: no key {args.key_id}", file=sys.stderr)
        return EXIT_USAGE
    print(f"revoked {args.key_id}")
    return EXIT_OK


def _migrate(args: argparse.Namespace) -> int:
    with _team_session():
        pass
    print("database schema is up to date")
    return EXIT_OK


def _worker(args: argparse.Namespace) -> int:
    from service import create_app

    app = create_app({"JOBS_WORKER": False})
    app.extensions["formwise_jobs"].run_worker(args.threads)
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

    schemas = commands.add_parser("schemas", help="print (or write) the OpenAPI document")
    schemas.add_argument("-o", "--output", default="-",
                         help=f"a file (default: standard output; the committed copy is "
                              f"{SCHEMA_PATH.relative_to(SCHEMA_PATH.parent.parent)})")
    schemas.set_defaults(run=_schemas)

    validate = commands.add_parser("validate-data", help="load and check a materials CSV")
    validate.add_argument("file", nargs="?", help="a materials CSV (default: built-in data)")
    validate.set_defaults(run=_validate_data)

    design = commands.add_parser("design", help="size one /v1/designs request file")
    design.add_argument("file", help="a JSON file with a /v1/designs request body")
    design.add_argument("--json", action="store_true", help="print the API's JSON response")
    _add_overrides(design)
    design.set_defaults(run=_design)

    sweep = commands.add_parser("sweep", help="run a /v1/sweeps request file to a table")
    sweep.add_argument("file", help="a JSON file with a /v1/sweeps request body")
    sweep.add_argument("-o", "--output", required=True,
                       help="output file: .csv, .jsonl, .json or .parquet; - for standard output")
    sweep.add_argument("--format", choices=sorted(OUTPUT_FORMATS),
                       help="table format (default: from the file suffix; csv for -o -)")
    sweep.add_argument("--dask", metavar="SCHEDULER_ADDRESS",
                       help="run the cases on a dask cluster (pip install formwise[dask])")
    sweep.add_argument("--workers", type=int, default=os.cpu_count() or 1,
                       help="processes that size the cases (default: one per CPU)")
    sweep.add_argument("--progress", action="store_true",
                       help="show a progress bar even when stderr is not a terminal")
    _add_overrides(sweep)
    sweep.set_defaults(run=_sweep)

    keys = commands.add_parser("keys", help="API keys of teams").add_subparsers(
        dest="keys_command", required=True)
    create = keys.add_parser("create", help="create a key; it is the last line printed")
    create.add_argument("--team", required=True, help="team name (created if new)")
    create.set_defaults(run=_keys_create)
    keys.add_parser("list", help="list keys (never their secrets)").set_defaults(run=_keys_list)
    revoke = keys.add_parser("revoke", help="revoke a key by its id")
    revoke.add_argument("key_id")
    revoke.set_defaults(run=_keys_revoke)

    commands.add_parser("migrate", help="create or upgrade the database schema").set_defaults(
        run=_migrate)
    worker = commands.add_parser("worker", help="run jobs from the shared queue")
    worker.add_argument("--threads", type=int, default=1, help="jobs run at once")
    worker.set_defaults(run=_worker)
    return parser


def _add_overrides(command: argparse.ArgumentParser) -> None:
    command.add_argument("--top", type=int, help="designs kept (per case): overrides the file")
    command.add_argument("--objective", choices=("mass", "cost", "carbon"),
                         help="what the best design minimises: overrides the file")


def main(argv: Sequence[str] | None = None) -> int:
    args = build_parser().parse_args(argv)
    return args.run(args)
