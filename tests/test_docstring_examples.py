"""The examples in the docstrings run and print what they show (numpydoc "Examples" sections).

They are checks of their own (published check values, identities) and the reader's first
usage example, so a stale one misleads twice.
"""
import doctest
import importlib
import pkgutil

import pytest

import hazards
import planner
import reports


def _modules():
    for package in (planner, hazards, reports):
        yield package.__name__
        for info in pkgutil.walk_packages(package.__path__, prefix=package.__name__ + "."):
            if not info.name.endswith(".__main__"):  # importing it runs the command line
                yield info.name


@pytest.mark.parametrize("name", sorted(_modules()))
def test_docstring_examples(name):
    module = importlib.import_module(name)
    failures, _ = doctest.testmod(module, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    assert failures == 0
