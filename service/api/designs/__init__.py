"""POST /v1/designs: sized material + section designs."""
