# Set-up and everyday commands. Each target creates .venv when it is missing.
PYTHON ?= python3
VENV   := .venv
PY     := $(VENV)/bin/python
STAMP_CORE := $(VENV)/.installed-core
STAMP_TEST := $(VENV)/.installed-test

.PHONY: demo test test-slow bench typecheck lint clean install

$(PY):
	$(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip

$(STAMP_CORE): pyproject.toml | $(PY)
	$(PY) -m pip install --quiet -e '.[plot,progress,fast]'
	touch $@

$(STAMP_TEST): pyproject.toml | $(PY)
	$(PY) -m pip install --quiet -e '.[test]'
	touch $@ $(STAMP_CORE)

install: $(STAMP_CORE)

demo: $(STAMP_CORE)
	$(VENV)/bin/sweepwidth demo

test: $(STAMP_TEST)
	$(PY) -m pytest -q

test-slow: $(STAMP_TEST)
	$(PY) -m pytest -q -m slow

bench: $(STAMP_TEST)
	$(PY) benchmarks/run_all.py

typecheck: $(STAMP_TEST)
	$(PY) -m pip install --quiet 'mypy==2.4.1'  # pinned: a newer mypy may report new things
	$(PY) -m mypy sweepwidth

clean:
	rm -rf $(VENV) build *.egg-info .pytest_cache .hypothesis demo-output
