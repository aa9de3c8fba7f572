"""Typed errors of the numerical core.

Every error the core raises on purpose is a :class:`FormwiseError`. Each subclass also
subclasses a built-in exception, keeps structured attributes and builds its message in
``__str__``. The HTTP layer translates them to RFC 9457 problem details in one place
(``service.api.errors``); the core never knows about HTTP.
"""

from __future__ import annotations


class FormwiseError(Exception):
    """Base of every deliberate core error."""


class InputError(FormwiseError, ValueError):
    """One or more request values are invalid.

    Attributes:
        errors: mapping of a dotted field path (``"dimensions.wall"``,
            ``"custom_materials.2.density"``) to a list of messages.
    """

    def __init__(self, errors: dict[str, list[str]]):
        super().__init__(errors)
        self.errors = {path: list(messages) for path, messages in errors.items()}

    @classmethod
    def single(cls, field: str, message: str) -> InputError:
        """An error of one field with one message."""
        return cls({field: [message]})

    def prefixed(self, prefix: str) -> InputError:
        """The same error with every field path placed under ``prefix``."""
        return InputError({f"{prefix}.{path}": messages for path, messages in self.errors.items()})

    def __str__(self) -> str:
        parts = [f"{path}: {'; '.join(messages)}" for path, messages in self.errors.items()]
        return "invalid input: " + ", ".join(parts)


class GeometryError(InputError):
    """Section dimensions that describe no real section (a wall thicker than half the tube)."""


class DataError(FormwiseError, ValueError):
    """A problem in a data file, located by file, row and column.

    Attributes:
        file: path of the file as given to the loader.
        row: 1-based data row (the header is row 0), or None for file-level problems.
        column: column name, or None.
        message: what is wrong.
    """

    def __init__(self, file: str, row: int | None, column: str | None, message: str):
        super().__init__(file, row, column, message)
        self.file = file
        self.row = row
        self.column = column
        self.message = message

    def __str__(self) -> str:
        where = self.file
        if self.row is not None:
            where += f", row {self.row}"
        if self.column is not None:
            where += f", column {self.column!r}"
        return f"{where}: {self.message}"


class UnknownResource(FormwiseError, LookupError):
    """A named thing (material id, section family id, catalogue) that does not exist.

    Attributes:
        kind: what was looked up, e.g. ``"material"``.
        identifier: the id asked for.
    """

    def __init__(self, kind: str, identifier: str):
        super().__init__(kind, identifier)
        self.kind = kind
        self.identifier = identifier

    def __str__(self) -> str:
        return f"unknown {self.kind} {self.identifier!r}"
