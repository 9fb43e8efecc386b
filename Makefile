# Both entry points bootstrap .venv from pyproject.toml, so they work on a fresh machine.
PYTHON ?= python3
VENV := .venv
STAMP := $(VENV)/.installed
export NUMBA_CACHE_DIR := $(CURDIR)/.numba-cache
export MPLBACKEND := Agg

.PHONY: survey test bench venv clean

$(STAMP): pyproject.toml
	test -x $(VENV)/bin/python || $(PYTHON) -m venv $(VENV)
	$(VENV)/bin/python -m pip install --quiet --upgrade pip
	$(VENV)/bin/python -m pip install --quiet -e '.[test]'
	touch $(STAMP)

venv: $(STAMP)

survey: $(STAMP)
	$(VENV)/bin/cprobe survey configs/eca-survey.toml
	$(VENV)/bin/cprobe report outputs/eca-survey

bench: $(STAMP)
	$(VENV)/bin/python benchmarks/probe_bench.py

test: $(STAMP)
	$(VENV)/bin/python -m pytest

clean:
	rm -rf $(VENV) .numba-cache
