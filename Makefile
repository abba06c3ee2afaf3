# colstack: two commands on a fresh machine: `make demo` and `make test`.
PY ?= python3
VENV ?= .venv
BIN := $(VENV)/bin
STAMP_RUN := $(VENV)/.stamp-run
STAMP_TEST := $(VENV)/.stamp-test
STAMP_BENCH := $(VENV)/.stamp-bench

.PHONY: demo test bench bench-large lint clean

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

test: $(STAMP_TEST)
	$(BIN)/python -m ruff check design optimizer
	$(BIN)/python -m pytest -q

bench: $(STAMP_BENCH)
	$(BIN)/python bench/bench_resistance.py
	$(BIN)/python bench/bench_feasibility.py
	$(BIN)/python bench/bench_ip.py

bench-large: $(STAMP_BENCH)
	$(BIN)/python bench/bench_large_tower.py

clean:
	rm -rf $(VENV) demo_out .pytest_cache
