"""WSGI entry point for gunicorn: ``gunicorn service.wsgi:app``."""

from service import create_app

app = create_app()
