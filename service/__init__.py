"""Formwise: material and cross-section selection and sizing for light structural members."""

__version__ = "0.1.0"


def create_app(config: dict | None = None):
    """Build the Flask application (see :func:`service.app.create_app`)."""
    from service.app import create_app as _create_app

    return _create_app(config)


__all__ = ["__version__", "create_app"]
