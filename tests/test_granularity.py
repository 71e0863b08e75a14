"""GRIM, GRIMMER and percentage consistency against published examples and exhaustive
enumeration (tests/data/reference/granularity.csv names the source of every row)."""

from __future__ import annotations

import csv
import itertools
import math
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from scrutiny.recompute.granularity import grim, grimmer, percentage
from scrutiny.rounding import parse_printed

from conftest import DATA

ROWS = list(csv.DictReader((DATA / "reference" / "granularity.csv").open(encoding="utf-8")))


@pytest.mark.parametrize("row", ROWS, ids=[f"{r['id']}:{r['n']}:{r['mean']}:{r['sd']}" for r in ROWS])
def test_reference_verdicts(row):
    n, items = int(row["n"]), int(row["items"])
    if row["test"] == "grim":
        verdict = grim(parse_printed(row["mean"]), n, items)
    else:
        verdict = grimmer(parse_printed(row["mean"]), parse_printed(row["sd"]), n, items)
    if row["expect"] == "not testable":
        assert not verdict.testable and verdict.consistent is None
    else:
        assert verdict.testable
        assert verdict.consistent is (row["expect"] == "consistent"), verdict.reason


def _rounds_to(value: Fraction, printed: str) -> bool:
    # either way of rounding a tie is accepted (GRIM-R2)
    number = parse_printed(printed)
    return abs(float(value) - number.value) <= number.half_unit + 1e-12


@settings(max_examples=150, deadline=None)
@given(st.lists(st.integers(1, 7), min_size=2, max_size=9))
def test_every_real_data_set_passes(data):
    # means and SDs of actual integer data, correctly rounded, are never flagged
    n = len(data)
    mean = Fraction(sum(data), n)
    sd = math.sqrt(sum((x - mean) ** 2 for x in data) / (n - 1))
    mean_printed, sd_printed = f"{float(mean):.2f}", f"{sd:.2f}"
    assert grim(parse_printed(mean_printed), n).consistent in (True, None)
    assert grimmer(parse_printed(mean_printed), parse_printed(sd_printed), n).consistent


def test_grimmer_agrees_with_enumeration_for_small_samples():
    # every (mean, SD) pair printed to two decimals from all data sets of n = 4 on a 1-5 scale
    # is accepted; pairs never produced are rejected only when enumeration also never produces
    # them on any integer scale within 0-9 (the analytic test makes no false alarms)
    n = 4
    produced = set()
    for data in itertools.combinations_with_replacement(range(0, 10), n):
        mean = sum(data) / n
        sd = math.sqrt(sum((x - mean) ** 2 for x in data) / (n - 1))
        produced.add((f"{mean:.2f}", f"{sd:.2f}"))
    for mean, sd in sorted(produced)[:400]:
        assert grimmer(parse_printed(mean), parse_printed(sd), n).consistent, (mean, sd)
    rejected = [(m, s) for m in ("2.25", "2.50") for s in (f"{x / 100:.2f}" for x in range(1, 300))
                if not grimmer(parse_printed(m), parse_printed(s), n).consistent]
    assert rejected, "the test must be able to fail"
    assert not set(rejected) & produced


@pytest.mark.parametrize("printed, count, base, consistent", [
    ("45.2", 38, 84, True),     # 38/84 = 45.24%
    ("45.3", 38, 84, False),
    ("45", 38, 84, True),
    ("100", 84, 84, True),
    ("100.0", 83, 84, False),   # 98.8%
    ("0.0", 0, 12, True),
])
def test_percentages(printed, count, base, consistent):
    assert percentage(parse_printed(printed), count, base).consistent is consistent


def test_a_count_above_its_base_is_impossible():
    verdict = percentage(parse_printed("50"), 90, 84)
    assert verdict.consistent is False and "exceeds" in verdict.reason
