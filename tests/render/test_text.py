"""The terminal summary reads everything from the results: a panel's phases come from
its node, not from re-reading the voltage text."""

from __future__ import annotations

import re
import textwrap

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.render.text import _fill, render_text
from feedcheck.runner import run_job


def _phase_figures(text: str, panel: str) -> list[str]:
    m = re.search(rf"schedule {panel}: .*?phases ([0-9.,/]+) kVA", text)
    assert m, text
    return m.group(1).split("/")


@pytest.mark.parametrize(
    ("job", "panel", "phases", "shown"),
    [
        ("maple_farmhouse.toml", "SHOP", 1, 2),  # 120/240 V: lines A and B
        ("harbor_kitchen.toml", "LP1", 3, 3),  # 208Y/120 V: lines A, B and C
    ],
)
def test_phase_loads_follow_the_node_phases(samples, monkeypatch, job, panel, phases, shown):
    results = run_job(samples / job)
    node = next(n for n in results.nodes if n.id == panel)
    assert node.phases == phases

    def no_parsing(*a, **k):
        raise AssertionError("the text renderer parsed a voltage")

    monkeypatch.setattr("feedcheck.units.parse_voltage_system", no_parsing)
    assert len(_phase_figures(render_text(results), panel)) == shown


def test_unlimited_source_fault_is_a_word_not_a_symbol(write_job):
    job = write_job(
        """
[project]
name = "Infinite bus (generated)"
[source]
voltage = "480 V delta"
phases = 3
available_fault = "infinite"
x_r = 8
[[transformer]]
id = "T1"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5 %"
x_r = 4
primary_device = "110 A"
"""
    )
    results = run_job(job)
    source = next(n for n in results.nodes if n.id == "source")
    assert source.values.get("fault_max_a") == float("inf")
    text = render_text(results, show_all=True)
    assert "∞" not in text and not re.search(r"\binf\b", text) and "unlimited" in text


@settings(max_examples=400, deadline=None)
@given(text=st.text(alphabet=st.sampled_from("ab .-\t\n\r\x0b\x0c\u00a0\u2003"), max_size=130))
def test_note_wrapping_matches_textwrap(text):
    """The one-line shortcut gives exactly what ``textwrap.fill`` gives (common
    practice, no source: the wrapper is the reference)."""
    for rest in ("      ", "        "):
        expected = textwrap.fill(text, width=96, initial_indent="      ", subsequent_indent=rest)
        assert _fill(text, rest) == expected
    long_word = "x" * len(text)
    assert _fill(long_word, "      ") == textwrap.fill(
        long_word, width=96, initial_indent="      ", subsequent_indent="      "
    )


@settings(max_examples=400, deadline=None)
@given(
    text=st.text(alphabet=st.sampled_from("abF0  -.,_°–\u00a0"), max_size=400),
    word=st.integers(min_value=0, max_value=95),
)
def test_long_note_wrapping_matches_textwrap(text, word):
    """Notes of several lines (words between spaces, the shortcut's case, with a word of
    up to a line's length) wrap exactly as ``textwrap.fill`` wraps them (common
    practice, no source: the wrapper is the reference)."""
    text = text + " " + "w" * word + " " + text
    for rest in ("      ", "        "):
        expected = textwrap.fill(text, width=96, initial_indent="      ", subsequent_indent=rest)
        assert _fill(text, rest) == expected


@settings(max_examples=300, deadline=None)
@given(
    words=st.lists(
        st.sampled_from(
            [
                *("line-to-ground", "pick-up", "a-b-c-d", "F-P0997", "ab-9", "x", "kA"),
                *("co-ax-ial", "w" * 40, "e-" * 20 + "e", "12.5", "°C", "–"),
            ]
        ),
        max_size=60,
    )
)
def test_hyphenated_notes_wrap_as_textwrap(words):
    """Notes with hyphenated words, which textwrap may break after a hyphen, wrap
    exactly as ``textwrap.fill`` wraps them (common practice, no source: the wrapper is
    the reference)."""
    text = " ".join(words)
    for rest in ("      ", "        "):
        expected = textwrap.fill(text, width=96, initial_indent="      ", subsequent_indent=rest)
        assert _fill(text, rest) == expected
