"""The examples in the docstrings of every engine and app module run as tests."""

import doctest
import importlib
import pkgutil

import pytest

import electrosieve.app
import electrosieve.engine

MODULES = sorted(
    info.name
    for package in (electrosieve.engine, electrosieve.app)
    for info in pkgutil.walk_packages(package.__path__, prefix=package.__name__ + ".")
)


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    module = importlib.import_module(name)
    failures, _ = doctest.testmod(module, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    assert failures == 0, f"{failures} docstring example(s) failed in {name}"
