"""GET /v1/materials and the material schemas other endpoints reuse (see schemas.py)."""
