# colstack: two commands on a fresh machine: `make demo` and `make test`.
PY ?= python3
VENV ?= .venv
BIN := $(VENV)/bin
STAMP_RUN := $(VENV)/.stamp-run
STAMP_TEST := $(VENV)/.stamp-test
STAMP_BENCH := $(VENV)/.stamp-bench

.PHONY: demo test test-fast bench bench-large lint clean

$(BIN)/python:
	$(PY) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip

$(STAMP_RUN): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e .
	touch $@

$(STAMP_TEST): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e ".[test]"
	touch $@ $(STAMP_RUN)

$(STAMP_BENCH): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e ".[bench]"
	touch $@ $(STAMP_RUN)

demo: $(STAMP_RUN)
	$(BIN)/colstack run scenarios/demo_tower.toml --out demo_out

# ruff (rules and format) over all Python code, and the type checker (strict on design/)
lint: $(STAMP_TEST)
	$(BIN)/python -m ruff check design optimizer tests bench
	$(BIN)/python -m ruff format --check design optimizer tests bench
	$(BIN)/python -m mypy

# the whole suite, after the lint and the check that DEVELOPERS.md quotes the benchmark records
test: lint
	$(BIN)/python bench/quote.py --check DEVELOPERS.md
	$(BIN)/python -m pytest -q

# the fast loop: everything but the end-to-end tests marked slow
test-fast: $(STAMP_TEST)
	$(BIN)/python -m pytest -q -m "not slow"

bench: $(STAMP_BENCH)
	$(BIN)/python bench/bench_resistance.py
	$(BIN)/python bench/bench_feasibility.py
	$(BIN)/python bench/bench_ip.py

bench-large: $(STAMP_BENCH)
	$(BIN)/python bench/bench_large_tower.py

clean:
	rm -rf $(VENV) demo_out .pytest_cache
