# PumpSketch: `make run` opens the window on a sample project, `make test` runs the whole suite headless.
PYTHON ?= python3
VENV := .venv
PY := $(VENV)/bin/python
STAMP := $(VENV)/.installed
SAMPLE := hilltop_booster

.PHONY: run test lint typecheck bench stress install clean

$(PY):
	$(PYTHON) -m venv $(VENV)

$(STAMP): $(PY) pyproject.toml constraints.txt
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -c constraints.txt -e ".[test]"
	touch $(STAMP)

install: $(STAMP)

# The check installs (as root with apt-get) or names the missing X11 libraries of Qt, exit status 2.
run: $(STAMP)
	$(PY) -m app.platform_check
	$(PY) -m app --sample $(SAMPLE)

test: lint typecheck
	QT_QPA_PLATFORM=offscreen $(PY) -m pytest

lint: $(STAMP)
	$(PY) -m ruff check .

typecheck: $(STAMP)
	$(PY) -m mypy

bench: $(STAMP)
	QT_QPA_PLATFORM=offscreen $(PY) benchmarks/run_benchmarks.py

# Not part of `make test`: generated inputs, 100 kills during a save, kills after an edit; prints a summary.
stress: $(STAMP)
	QT_QPA_PLATFORM=offscreen $(PY) benchmarks/stress.py

clean:
	rm -rf $(VENV) .pytest_cache build *.egg-info
