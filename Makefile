# Every target creates .venv on first use, so a fresh machine needs only Python and pip.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP_RUN := $(VENV)/.installed-run
STAMP_TEST := $(VENV)/.installed-test
HOST ?= 127.0.0.1
PORT ?= 8000

.PHONY: serve test test-fast test-deep lint bench browser screenshots clean

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/pip install --quiet --upgrade pip

$(STAMP_RUN): pyproject.toml | $(BIN)/python
	$(BIN)/pip install --quiet -e .
	touch $@

$(STAMP_TEST): pyproject.toml | $(BIN)/python
	$(BIN)/pip install --quiet -e '.[test]'
	touch $@ $(STAMP_RUN)

serve: $(STAMP_RUN)
	$(BIN)/electrosieve serve --host $(HOST) --port $(PORT)

browser:
	@sh tools/ensure-chromium.sh

test: $(STAMP_TEST) browser
	$(BIN)/python -m pytest

# the engine and API tests alone (no browser, PostgreSQL, real servers or fuzzing): under a minute
test-fast: $(STAMP_TEST)
	$(BIN)/python -m pytest -q -m "not browser and not postgres and not slow"

lint: $(STAMP_TEST)
	$(BIN)/ruff check .

# random property-test examples, many more of them (the derandomised "ci" profile is the default)
test-deep: $(STAMP_TEST) browser
	HYPOTHESIS_PROFILE=deep $(BIN)/python -m pytest

bench: $(STAMP_TEST)
	$(BIN)/python bench/run.py

# docs/screenshots/<page>-<width>x<height>.png of the main pages, from a real server and Chromium
screenshots: $(STAMP_TEST) browser
	$(BIN)/python tools/screenshots.py

clean:
	rm -rf $(VENV) build *.egg-info
