"""A gunicorn server on loopback for the HTTP benchmarks, as ``formwise serve`` runs it, and
the peak memory of a process tree (the server and its sweep worker processes)."""

from __future__ import annotations

import contextlib
import os
import socket
import subprocess
import threading
import time
import urllib.request
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

from service.cli import gunicorn_argv

ROOT = Path(__file__).resolve().parents[2]


def free_port() -> int:
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        return probe.getsockname()[1]


@dataclass(frozen=True)
class Server:
    url: str
    pid: int


@contextlib.contextmanager
def gunicorn(workers: int = 2, env: dict[str, str] | None = None) -> Iterator[Server]:
    """A gunicorn server (``formwise serve``'s command line) with ``workers`` workers on a
    free loopback port, serving this checkout with a scratch database; stopped on exit."""
    port = free_port()
    scratch = Path(os.environ.get("TMPDIR", "/tmp")) / f"formwise-bench-{port}.db"
    environment = {**os.environ, "PYTHONPATH": str(ROOT),
                   "FORMWISE_DATABASE_URL": f"sqlite:///{scratch}", **(env or {})}
    argv = gunicorn_argv("127.0.0.1", port, workers)
    argv[argv.index("--access-logfile") + 1] = "/dev/null"
    server = subprocess.Popen(argv, cwd=ROOT, env=environment, stdout=subprocess.DEVNULL,
                              stderr=subprocess.DEVNULL)
    url = f"http://127.0.0.1:{port}"
    try:
        deadline = time.monotonic() + 60
        while True:
            try:
                with urllib.request.urlopen(f"{url}/v1/health", timeout=2):
                    break
            except OSError:
                if time.monotonic() > deadline or server.poll() is not None:
                    raise RuntimeError("gunicorn did not start") from None
                time.sleep(0.2)
        yield Server(url, server.pid)
    finally:
        server.terminate()
        try:  # gunicorn finishes the requests in flight first, for up to 30 s
            server.wait(timeout=40)
        except subprocess.TimeoutExpired:
            server.kill()
            server.wait()
        scratch.unlink(missing_ok=True)


def _tree_rss(root: int) -> int:
    """Resident bytes of ``root`` and every process below it (Linux /proc)."""
    children: dict[int, list[int]] = {}
    rss: dict[int, int] = {}
    for entry in Path("/proc").iterdir():
        if not entry.name.isdigit():
            continue
        try:
            fields = (entry / "stat").read_text().rsplit(")", 1)[1].split()
            children.setdefault(int(fields[1]), []).append(int(entry.name))
            rss[int(entry.name)] = int(fields[21]) * os.sysconf("SC_PAGE_SIZE")
        except (OSError, IndexError, ValueError):
            continue
    total, stack = 0, [root]
    while stack:
        pid = stack.pop()
        total += rss.get(pid, 0)
        stack.extend(children.get(pid, ()))
    return total


@contextlib.contextmanager
def peak_tree_rss(root: int, every: float = 0.2) -> Iterator[list[int]]:
    """Samples the resident memory of the process tree under ``root`` while the block runs;
    the yielded list holds the peak in bytes once it ends."""
    peak = [0]
    stop = threading.Event()

    def sample() -> None:
        while not stop.is_set():
            peak[0] = max(peak[0], _tree_rss(root))
            stop.wait(every)

    thread = threading.Thread(target=sample, daemon=True)
    thread.start()
    try:
        yield peak
    finally:
        stop.set()
        thread.join()
