"""Doctests of ``feedcheck/`` see the shipped rule book as ``book``."""

import pytest


@pytest.fixture(autouse=True)
def _rule_book_for_doctests(doctest_namespace):
    from feedcheck.rulebook import default_rulebook

    doctest_namespace["book"] = default_rulebook()
