"""The examples in the core's docstrings run and print what they say (Python's doctest)."""

import doctest
import importlib
import pkgutil

import pytest

import hydraulics

MODULES = sorted(m.name for m in pkgutil.walk_packages(hydraulics.__path__, "hydraulics."))


@pytest.mark.parametrize("name", MODULES)
def test_examples(name):
    result = doctest.testmod(importlib.import_module(name), optionflags=doctest.ELLIPSIS)
    assert result.failed == 0


def test_the_examples_are_found():
    counted = sum(doctest.testmod(importlib.import_module(n), optionflags=doctest.ELLIPSIS).attempted for n in MODULES)
    assert counted >= 5  # normal_depth, critical_depth, worded... each carry one
