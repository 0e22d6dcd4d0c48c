"""A transformer whose 450.3(B) limit lies above every standard device rating: the limit
shown is the computed figure, never 'inf' (issue: figures a person should never see)."""

from __future__ import annotations

import json
import math
import re

import pytest
from click.testing import CliRunner

from feedcheck.cli import main


def test_secondary_limit_is_the_computed_figure(write_job, samples):
    text = (samples / "harbor_kitchen.toml").read_text(encoding="utf-8")
    text = re.sub(r'rating = "[0-9.]+ kVA"', 'rating = "5000 kVA"', text, count=1)
    job = write_job(text)
    r = CliRunner().invoke(main, ["check", str(job), "--format", "json"])
    assert r.exit_code in (0, 1), r.output
    found = [
        f
        for f in json.loads(r.stdout)["findings"]
        if f["subject"] == "T1" and f["check"] == "secondary device"
    ]
    assert found
    # rated secondary current S / (√3·V) (IEEE Std 141-1993 ch. 4) at 208 V: 13,879 A;
    # NFPA 70-2023 Table 450.3(B), both sides protected, secondary 125 %: 17,348 A
    rated = 5000e3 / (math.sqrt(3) * 208.0)
    assert found[0]["limit"] == pytest.approx(1.25 * rated, rel=1e-6)
    assert "inf" not in found[0]["note"]
    text_out = CliRunner().invoke(main, ["check", str(job), "--all"]).output
    assert "inf A" not in text_out and "unlimited A" not in text_out
