# Formwise developer commands. Every target sets up .venv itself, so each works on a fresh clone.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin
FORMWISE_HOST ?= 127.0.0.1
FORMWISE_PORT ?= 8000
FORMWISE_WORKERS ?= 2

.PHONY: serve test bench schemas lint clean

$(BIN)/activate:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/pip install --quiet --upgrade pip

$(VENV)/.installed: $(BIN)/activate pyproject.toml
	$(BIN)/pip install --quiet -e .
	touch $@

$(VENV)/.installed-dev: $(BIN)/activate pyproject.toml
	$(BIN)/pip install --quiet -e '.[dev]'
	touch $(VENV)/.installed $@

serve: $(VENV)/.installed
	FORMWISE_HOST=$(FORMWISE_HOST) FORMWISE_PORT=$(FORMWISE_PORT) FORMWISE_WORKERS=$(FORMWISE_WORKERS) \
		$(BIN)/formwise serve

test: $(VENV)/.installed-dev
	$(BIN)/python -m pytest

bench: $(VENV)/.installed-dev
	$(BIN)/python -m pytest tests/benchmarks --benchmark-only --benchmark-columns=min,median,mean,max,rounds

schemas: $(VENV)/.installed
	$(BIN)/python -m service schemas -o schemas/openapi.json

lint: $(VENV)/.installed-dev
	$(BIN)/ruff check service tests
	$(BIN)/mypy

clean:
	rm -rf $(VENV) .pytest_cache .benchmarks build *.egg-info
