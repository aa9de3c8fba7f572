"""gzip for answers a client accepts compressed (``Accept-Encoding: gzip``).

Whole bodies only: a streamed answer (a sweep as CSV or NDJSON, a job's rows) is sent as it
is computed, uncompressed, so that its first rows arrive at once.
"""

from __future__ import annotations

import gzip

from flask import Response, request

MIN_BYTES = 500
"""Smaller bodies are sent as they are: gzip's header and the work would outweigh the gain
(common practice)."""

LEVEL = 6
"""zlib's default level: most of the gain of level 9 at a fraction of its time."""


def gzip_response(response: Response) -> Response:
    """``response`` gzipped when the client accepts gzip and the body is whole, not yet
    encoded and at least :data:`MIN_BYTES` long; every such body says it varies with
    Accept-Encoding, so caches keep both forms apart."""
    if response.direct_passthrough or response.is_streamed \
            or "Content-Encoding" in response.headers or response.status_code in (204, 304):
        return response
    body = response.get_data()
    if len(body) < MIN_BYTES:
        return response
    response.vary.add("Accept-Encoding")
    if not request.accept_encodings.quality("gzip"):
        return response
    response.set_data(gzip.compress(body, compresslevel=LEVEL, mtime=0))
    response.headers["Content-Encoding"] = "gzip"
    return response
