"""Fixtures shared by the report tests."""
from __future__ import annotations

import pytest


@pytest.fixture(scope="module")
def teaching_lab():
    """(setup, assessment) of the teaching-lab example: twelve identical stations."""
    from tests.conftest import assessed_example

    return assessed_example("teaching-lab-stations")
