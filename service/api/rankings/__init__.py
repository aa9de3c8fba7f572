"""POST /v1/rankings: materials and section families ranked by material index x shape factor."""
