"""The use cases shared by the HTTP API and the command line (service/usecases.py)."""

from __future__ import annotations

import threading
import time

import pytest

from service import usecases
from service.core.materials import load_builtin
from service.core.sizing import DesignRequest, DesignResult


def test_design_requests_are_sized_one_at_a_time_per_process(monkeypatch):
    """Two threads asking at once (a gunicorn worker's threads): the second sizing starts
    only after the first has ended, and both answers come back."""
    spans: list[tuple[float, float]] = []

    def slow_sizing(request, materials, cores):
        start = time.perf_counter()
        time.sleep(0.2)
        spans.append((start, time.perf_counter()))
        return DesignResult((), ())

    monkeypatch.setattr(usecases, "family_split", lambda workers: slow_sizing)
    table = load_builtin()
    inputs = usecases.DesignInputs(DesignRequest("cantilever_end_load", span=1.0, load=10.0),
                                   table, table)
    answers = []
    threads = [threading.Thread(target=lambda: answers.append(usecases.answer(inputs)))
               for _ in range(2)]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join()
    assert len(answers) == 2
    first, second = sorted(spans)
    assert second[0] >= first[1]        # no overlap


def test_the_lock_is_released_when_a_request_is_refused(monkeypatch):
    def refused(request, materials, cores):
        raise usecases.InputError({"span": ["refused"]})

    monkeypatch.setattr(usecases, "family_split", lambda workers: refused)
    table = load_builtin()
    inputs = usecases.DesignInputs(DesignRequest("cantilever_end_load", span=1.0, load=10.0),
                                   table, table)
    for _ in range(2):      # the second would wait for ever if the first kept the lock
        with pytest.raises(usecases.InputError):
            usecases.answer(inputs)
    assert not usecases.SIZING_ONE_AT_A_TIME.locked()
