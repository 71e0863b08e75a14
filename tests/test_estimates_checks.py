"""The checks of means, percentages, intervals, coefficients and sample sizes.

Each check gets sentences that must raise it and near-misses that must not, with the status the
claim gets; false alarms are worse than misses here, so the near-misses outnumber the hits.
Where an expectation rests on a number, the comment says where it comes from: exact integer
arithmetic or an enumeration of every integer data set written out in this file, a published
example (tests/data/reference/altman_bland.csv, granularity.csv), or mpmath. scipy is never the
reference.
"""

from __future__ import annotations

import csv
import functools
import itertools
import math
from fractions import Fraction

import mpmath
import pytest

from scrutiny.check import REGISTRY
from scrutiny.model import Severity, Status
from scrutiny.recompute.intervals import MIN_DF, arm_ratio, interval_facts, ratio_interval
from scrutiny.rounding import parse_printed

from conftest import DATA, flags_for, only_result, results_for

mpmath.mp.dps = 30

AB_ROWS = list(csv.DictReader((DATA / "reference" / "altman_bland.csv").open(encoding="utf-8")))


def _row(entry_id: str) -> dict:
    return next(row for row in AB_ROWS if row["id"] == entry_id)


# -- independent references ------------------------------------------------------------------

def _normal_p(z) -> mpmath.mpf:
    """Two-sided tail of the standard normal."""
    return mpmath.erfc(abs(mpmath.mpf(z)) / mpmath.sqrt(2))


def _t_p(x, df) -> mpmath.mpf:
    """Two-sided tail of Student's t: P(|T| > x) = I_{df / (df + x^2)}(df / 2, 1 / 2)."""
    if df == mpmath.inf:
        return _normal_p(x)
    x, df = mpmath.mpf(x), mpmath.mpf(df)
    return mpmath.betainc(df / 2, mpmath.mpf(1) / 2, 0, df / (df + x * x), regularized=True)


@functools.lru_cache(maxsize=None)
def _critical(confidence: str, df) -> mpmath.mpf:
    """The (1 + confidence) / 2 quantile of t (normal for df = inf), by root finding."""
    tail = 1 - mpmath.mpf(confidence)
    if df == mpmath.inf:
        return mpmath.sqrt(2) * mpmath.erfinv(1 - tail)
    return mpmath.findroot(lambda x: _t_p(x, df) - tail, 2)


def _box(printed: str) -> tuple[mpmath.mpf, mpmath.mpf]:
    """The interval a printed decimal stands for: half a unit of its last digit either side."""
    decimals = len(printed.split(".")[1]) if "." in printed else 0
    value, half = mpmath.mpf(printed), mpmath.mpf(5) / 10 ** (decimals + 1)
    return value - half, value + half


def _fraction_box(printed: str) -> tuple[Fraction, Fraction]:
    decimals = len(printed.split(".")[1]) if "." in printed else 0
    half = Fraction(5, 10 ** (decimals + 1))
    return Fraction(printed) - half, Fraction(printed) + half


def _possible(mean: str, sd: str | None, n: int, scale=range(0, 11)) -> bool:
    """Can n integer responses on `scale` give this printed mean (and SD)? By enumerating every
    data set (exact fractions; either rounding of a tie accepted)."""
    mean_low, mean_high = _fraction_box(mean)
    sd_low, sd_high = _fraction_box(sd) if sd else (None, None)
    for data in itertools.combinations_with_replacement(scale, n):
        total = sum(data)
        if not mean_low <= Fraction(total, n) <= mean_high:
            continue
        if sd is None:
            return True
        variance = Fraction(n * sum(x * x for x in data) - total * total, n * (n - 1))
        if sd_low ** 2 <= variance <= sd_high ** 2 or (sd_low < 0 and variance <= sd_high ** 2):
            return True
    return False


# -- the registry ----------------------------------------------------------------------------

def test_the_checks_are_registered_with_their_severities():
    assert {c: (REGISTRY[c].severity, REGISTRY[c].marks_inconsistent) for c in (
        "grim", "grimmer", "percent-mismatch", "ci-p-mismatch", "ci-estimate-mismatch",
        "coefficient-mismatch", "df-sample-mismatch")} == {
        "grim": (Severity.WARNING, True),
        "grimmer": (Severity.WARNING, True),
        "percent-mismatch": (Severity.WARNING, True),
        "ci-p-mismatch": (Severity.ERROR, True),
        "ci-estimate-mismatch": (Severity.WARNING, False),
        "coefficient-mismatch": (Severity.ERROR, True),
        "df-sample-mismatch": (Severity.WARNING, False),
    }


def test_the_enumeration_reference_agrees_with_the_published_examples():
    # GRIM-01 (3.48 from 20 people: only X.X0 and X.X5) and GRIMMER-02/03 (granularity.csv)
    assert not _possible("3.48", None, 20, range(1, 7))
    assert _possible("3.45", None, 20, range(1, 7))
    # the near-miss below: 3.45 with SD 1.19 exists on a 7-point scale, with SD 1.21 it does not
    witness = [1, 1, 1, 2, 3] + [4] * 14 + [5]
    mean = Fraction(sum(witness), 20)
    variance = sum((x - mean) ** 2 for x in witness) / 19
    assert f"{float(mean):.2f}" == "3.45" and f"{math.sqrt(variance):.2f}" == "1.19"
    assert not _possible("3.45", "1.21", 20, range(1, 8))
    assert not _possible("3.00", "1.07", 5) and not _possible("3.00", "1.12", 5)
    assert _possible("3.00", "1.00", 5)


# -- grim ------------------------------------------------------------------------------------

@pytest.mark.parametrize("text, settings", [
    # GRIM-01: 3.48 x 20 = 69.6, no integer total (Brown & Heathers 2017)
    ("Voles rated the bait on a 7-point scale (M = 3.48, SD = 1.21, n = 20).", {}),
    # GRIM-09: two items, 3.47 x 20 = 69.4
    ("Calmness, a 2-item measure on a 7-point scale, was M = 3.47 (n = 10).", {}),
    # a count: 4.20 x 8 = 33.6
    ("The number of eggs per clutch was M = 4.20 (SD = 1.31, n = 8).", {}),
    # declared by the settings instead of the text: 3.48 x 20 = 69.6
    ("Boldness was higher at dusk (M = 3.48, n = 20).", {"integer_scales": True}),
    # n = 1: one integer answer has no decimals
    ("The only keeper at Drennan Fen (n = 1) rated the pen on a 7-point scale, M = 3.50.", {}),
    # GRIM-03: 5.93 x 49 = 290.57 (The Economist example)
    ("Keepers rated the feeders on a 7-point scale (M = 5.93, SD = 1.10, n = 49).", {}),
])
def test_grim_raised(text, settings):
    result = only_result(text, **settings)
    assert [f.check for f in result.flags] == ["grim"]
    assert result.status is Status.INCONSISTENT
    flag = result.flags[0]
    assert flag.severity is Severity.WARNING
    assert "assuming integer responses" in flag.message and "item" in flag.message


@pytest.mark.parametrize("text, settings, reason", [
    # GRIM-02: 3.45 x 20 = 69; with SD 1.19 from 1, 1, 1, 2, 3, 4 x 14, 5 (enumerated, below)
    ("Voles rated the bait on a 7-point scale (M = 3.45, SD = 1.19, n = 20).", {}, None),
    # GRIM-10: 9/8 = 1.125 may be printed 1.12 or 1.13
    ("Keepers rated noise on a 5-point scale (M = 1.12, n = 8).", {}, None),
    ("Keepers rated noise on a 5-point scale (M = 1.13, n = 8).", {}, None),
    # GRIM-08: 3.45 from 10 people on 2 items, S = 69 over 20
    ("Calmness, a 2-item measure on a 7-point scale, was M = 3.45 (n = 10).", {}, None),
    # five items: n x items = 100 is not below 10^2, every mean is possible
    ("Calmness, a 5-item measure on a 7-point scale, was M = 3.48 (n = 20).", {}, "not testable"),
    # one decimal: 20 is not below 10^1
    ("Voles rated the bait on a 7-point scale (M = 3.5, n = 20).", {}, "not testable"),
    # ... where an SD with so wide a rounding fits some integer data: consistent, not flagged
    ("Voles rated the bait on a 7-point scale (M = 3.5, SD = 1.2, n = 20).", {}, None),
    # GRIM-11: n = 120 is not below 10^2
    ("Keepers rated the feeders on a 7-point scale (M = 2.57, n = 120).", {}, "not testable"),
    # a continuous measure without an integer cue
    ("Body condition was higher at dusk (M = 3.48, SD = 1.21, n = 20).", {}, "integer-valued"),
    # the count cue is about something else: a unit says the mean is a measurement
    ("The number of pups weighed M = 3.48 g (SD = 1.21, n = 20).", {}, "integer-valued"),
    # ... and so does a scale whose range cannot hold the mean (21.34 > 7)
    ("Body mass (M = 21.34, SD = 2.10, n = 40) and calmness on a 7-point scale were recorded.",
     {}, "integer-valued"),
    # a count cue in another sentence does not reach the mean
    ("We recorded the number of burrows per vole. Soil was wetter (M = 3.48, SD = 1.21, n = 20).",
     {}, "integer-valued"),
    # no n printed
    ("Voles rated the bait on a 7-point scale (M = 3.48, SD = 1.21).", {}, "no n printed"),
    # n per site is not the n of the mean
    ("Voles (n = 20 per site) rated the bait on a 7-point scale, M = 3.48.", {}, "no n printed"),
])
def test_grim_not_raised(text, settings, reason):
    result = only_result(text, **settings)
    assert "grim" not in [f.check for f in result.flags]
    if reason is None:
        assert result.status is Status.CONSISTENT
    else:
        assert result.status is Status.UNCHECKED and reason in result.reason


def test_grim_of_a_sum_score_over_several_items():
    # A total over 20 items of a 4-point scale is one integer per person (a sum of integers),
    # so its mean has granularity 1/n, as a single item's does. 41.38 x 30 = 1241.4,
    # and 1241/30 = 41.367, 1242/30 = 41.400: impossible; 41.37 (S = 1241) is possible.
    # Read as a mean of item means (granularity 1/600) both would be "not testable".
    stem = "Anxiety was measured with a 20-item questionnaire on a 4-point scale; the total "
    flagged = only_result(stem + "score averaged M = 41.38 (SD = 8.22, n = 30).")
    assert [f.check for f in flagged.flags] == ["grim"]
    assert "integer sum scores over 20 items" in flagged.flags[0].message
    possible = only_result(stem + "score averaged M = 41.37 (SD = 8.22, n = 30).")
    assert possible.flags == () and possible.status is Status.CONSISTENT
    # an item mean of the same scale stays a mean over n x items = 600 answers
    item_mean = only_result(stem.replace("the total ", "the item ") + "mean was M = 2.07 "
                            "(n = 30).")
    assert item_mean.flags == () and "not testable" in item_mean.reason


@pytest.mark.parametrize("text", [
    "The mean of the site means was 3.48 (SD = 0.40, n = 20) on the 7-point scale.",
    "The grand mean of boldness on the 7-point scale was M = 3.48 (SD = 0.51, n = 20).",
    "Ratings were averaged across the four observers. Tidiness on the 7-point scale was "
    "M = 3.48 (SD = 0.40, n = 20).",
    "The weighted mean score on the 5-point scale was M = 3.48 (SD = 0.80, n = 20).",
    "Estimated marginal means on the 5-point scale were M = 3.48 (SD = 0.80, n = 20).",
])
def test_means_of_means_and_weighted_means_are_not_checked(text):
    # 3.48 x 20 = 69.6 would fail GRIM, but a mean of means is not a mean of integers
    assert results_for(text) == []
    assert results_for(text, integer_scales=True) == []


# -- grimmer ---------------------------------------------------------------------------------

@pytest.mark.parametrize("text, mean, sd, n", [
    # GRIMMER-02 and the parity-only failure GRIMMER-03 (granularity.csv)
    ("Five keepers rated the pen on a 5-point scale (M = 3.00, SD = 1.07, n = 5).", "3.00", "1.07", 5),
    ("Five keepers rated the pen on a 5-point scale (M = 3.00, SD = 1.12, n = 5).", "3.00", "1.12", 5),
    # GRIMMER-09: parity only
    ("Ten keepers rated the pen on a 7-point scale (M = 4.50, SD = 1.13, n = 10).", "4.50", "1.13", 10),
    # SD = 0 means every answer is equal, so the mean is a whole number: 3.10 is not
    ("Ten keepers rated the pen on a 7-point scale (M = 3.10, SD = 0.00, n = 10).", "3.10", "0.00", 10),
    # a plus-minus SD where nothing says SE
    ("The number of pups per litter was 4.25 ± 0.31 (n = 8).", "4.25", "0.31", 8),
])
def test_grimmer_raised(text, mean, sd, n):
    # enumerated on the scale the sentence names (a count: 0 to 10)
    scale = range(1, 6) if "5-point" in text else range(1, 8) if "7-point" in text else range(11)
    assert not _possible(mean, sd, n, scale), "the enumeration must agree the SD is impossible"
    result = only_result(text)
    assert [f.check for f in result.flags] == ["grimmer"]
    assert result.status is Status.INCONSISTENT
    assert "no integer data with this mean give this SD" in result.flags[0].message


@pytest.mark.parametrize("text, mean, sd, n", [
    # GRIMMER-01 (2, 2, 3, 4, 4) and GRIMMER-04 (1, 3, 3, 4, 4)
    ("Five keepers rated the pen on a 5-point scale (M = 3.00, SD = 1.00, n = 5).", "3.00", "1.00", 5),
    ("Five keepers rated the pen on a 5-point scale (M = 3.00, SD = 1.22, n = 5).", "3.00", "1.22", 5),
    # GRIMMER-08
    ("Ten keepers rated the pen on a 7-point scale (M = 4.50, SD = 1.08, n = 10).", "4.50", "1.08", 10),
    # SD = 0 with a whole-number mean: every keeper answered 3
    ("Ten keepers rated the pen on a 7-point scale (M = 3.00, SD = 0.00, n = 10).", "3.00", "0.00", 10),
    # one-decimal SD: a wider rounding interval (4, 4, 4, 5, 5, 5, 5, 5, 5, 3 and the like)
    ("Ten keepers rated the pen on a 7-point scale (M = 4.50, SD = 1.1, n = 10).", "4.50", "1.1", 10),
])
def test_grimmer_not_raised_where_integer_data_exist(text, mean, sd, n):
    scale = range(1, 6) if "5-point" in text else range(1, 8)
    assert _possible(mean, sd, n, scale), "the enumeration must find a data set"
    result = only_result(text)
    assert result.flags == () and result.status is Status.CONSISTENT


@pytest.mark.parametrize("text", [
    # a failing mean is flagged once, by grim, not again by grimmer
    "Voles rated the bait on a 7-point scale (M = 3.48, SD = 1.21, n = 20).",
])
def test_grimmer_leaves_a_failing_mean_to_grim(text):
    assert flags_for(text) == ["grim"]


@pytest.mark.parametrize("text", [
    # the document's convention makes ± a standard error (4.25 ± 0.31 as an SD fails above)
    "Values are means ± SEM.\n\nThe number of pups per litter was 4.25 ± 0.31 (n = 8).",
    "The number of pups per litter was 4.25 ± 0.31 (mean ± SE, n = 8).",
    "The number of pups per litter was 4.25 ± 0.31 (mean ± 95% CI, n = 8).",
    # n = 1 has no SD to test; its mean 4.00 is a whole number
    "The only keeper (n = 1) rated the pen on a 5-point scale, M = 4.00, SD = 0.31.",
])
def test_grimmer_not_raised_where_the_number_is_not_an_sd(text):
    [result] = [r for r in results_for(text) if r.claim.test == "mean"]
    assert result.flags == () and result.status is Status.CONSISTENT


# -- percent-mismatch ------------------------------------------------------------------------

@pytest.mark.parametrize("text, shown", [
    ("Of the tagged voles, 45.3% (38/84) survived the winter.", "45.24%"),   # 38/84 = 0.452380...
    ("In all, 38 of 84 (46.2%) tagged voles survived.", "45.24%"),
    ("All but one returned, 100.0% (83/84).", "98.81%"),                      # 83/84 = 0.988095...
    ("Mange reached 12% (95/84) of the colony.", "exceeds"),
])
def test_percent_mismatch_raised(text, shown):
    result = only_result(text)
    assert [f.check for f in result.flags] == ["percent-mismatch"]
    assert result.status is Status.INCONSISTENT and shown in result.flags[0].message


@pytest.mark.parametrize("text", [
    "Of the tagged voles, 45.2% (38/84) survived the winter.",
    "In all, 38 of 84 (45%) tagged voles survived.",
    "All marked newts returned, 100% (84/84).",
    "No marked newt strayed, 0.0% (0/84).",
    "No marked newt strayed, 0% (0/84).",
    # 1/8 = 12.5%: either rounding of the tie
    "One crossbill in eight, 1 of 8 (12%), sang at night.",
    "One crossbill in eight, 1 of 8 (13%), sang at night.",
    # 2/3 = 66.67%
    "Two of the three pens, 2 of 3 (67%), flooded.",
    "Ringed birds made up 12.4% [1,204/9,710] of the catch.",                 # 12.399...
])
def test_percent_mismatch_not_raised(text):
    result = only_result(text)
    assert result.flags == () and result.status is Status.CONSISTENT


@pytest.mark.parametrize("text", [
    "With survey weights, 41.7% (38/84) of households kept a feeder.",
    "The age-standardised prevalence of mange was 21.0% (38/210).",
    "Weighted percentages: 50.5% (38/84) of the keepers fed daily.",
])
def test_weighted_percentages_are_not_checked(text):
    result = only_result(text)
    assert result.flags == () and result.status is Status.UNCHECKED
    assert "weighted" in result.reason


# -- ci-p-mismatch ---------------------------------------------------------------------------

@pytest.mark.parametrize("text, why", [
    # the interval excludes 1, so p < .05
    ("Flooding raised the odds of failure, OR = 1.52, 95% CI [1.10, 2.10], p = .11.", "excludes 1"),
    # the interval includes 1, so p >= .05
    ("Fencing did not change the odds, OR = 1.20, 95% CI [0.90, 1.60], p = .01.", "includes 1"),
    # a correlation's interval includes 0
    ("Depth and mass were unrelated, r = .19, 95% CI [-.11, .47], p = .02.", "includes 0"),
    # at the boundary itself: the interval holds 1 even at 0.995, so p < .05 cannot be (the
    # rounding of the three numbers alone would allow p down to .049)
    ("Shade did not change the odds, OR = 1.20, 95% CI [0.99, 1.45], p < .05.", "includes 1"),
    ("Shade changed the odds, OR = 1.20, 95% CI [1.01, 1.43], p ≥ .05.", "excludes 1"),
    # the d interval printed after a t includes 0, the t's p is below .05
    ("Upland voles dug deeper, t(58) = 2.10, p = .040, d = 0.54, 95% CI [-0.02, 1.10].",
     "includes 0"),
    # HR 0.71 (0.55 to 0.92): z = 2.61, p = .009 (AB-01 on the log scale; mpmath below); a
    # p of .0009 is ten times too small even allowing any df from 10 up
    ("Flooded burrows were abandoned sooner (HR 0.71 (95% CI 0.55 to 0.92; P = 0.0009)).",
     "cannot come from"),
])
def test_ci_p_mismatch_raised(text, why):
    [result] = [r for r in results_for(text) if "ci-p-mismatch" in [f.check for f in r.flags]]
    assert result.status is Status.INCONSISTENT
    flag = next(f for f in result.flags if f.check == "ci-p-mismatch")
    assert flag.severity is Severity.ERROR and why in flag.message


def test_the_hazard_ratio_example_by_mpmath():
    # the p the interval implies at face value, exact normal tail on the log scale
    se = (mpmath.log("0.92") - mpmath.log("0.55")) / (2 * _critical("0.95", mpmath.inf))
    p = _normal_p(mpmath.log("0.71") / se)
    assert 0.0085 < p < 0.0095
    facts = interval_facts(parse_printed("0.71"), parse_printed("0.55"), parse_printed("0.92"),
                           ratio=True)
    assert facts.p.low <= p <= facts.p.high and facts.p.low > 0.00095


@pytest.mark.parametrize("text", [
    # AB-04 and AB-05 in sentences of the project's own
    "Recovery was more common with the mineral lick, a difference of 17 percentage points "
    "(95% CI 1.4 to 32.6; P = 0.032).",
    "Fencing cut the risk of predation, RR 0.30 (95% CI 0.10 to 0.91), P = 0.034.",
    # an estimate that rounds to the null: p may be anything up to 1
    "Shade did not change the odds, OR = 1.00, 95% CI [0.70, 1.43], p = .99.",
    "Shade did not change depth, MD = 0.0, 95% CI [-1.2, 1.2], p = .97.",
    # a limit printed exactly at the null: the rounding leaves p either side of .05
    "The odds rose, OR = 1.20, 95% CI [1.00, 1.44], p = .05.",
    "The odds rose, OR = 1.20, 95% CI [1.00, 1.44], p = .049.",
    "The odds rose, OR = 1.20, 95% CI [1.00, 1.44], p = .06.",
    "Depth rose, MD = 0.50, 95% CI [0.00, 1.00], p = .05.",
    # near the boundary, a p printed with its rounding may lie either side
    "Shade did not change the odds, OR = 1.20, 95% CI [0.99, 1.45], p = .06.",
    "Shade did not change the odds, OR = 1.20, 95% CI [0.99, 1.45], p = .05.",
    "Shade changed the odds, OR = 1.20, 95% CI [1.01, 1.43], p = .05.",
    "Shade changed the odds, OR = 1.20, 95% CI [1.01, 1.43], p ≤ .05.",
    # a 90% interval excludes 0 while p = .07 < .10 (a 95% reading would cry foul)
    "Wing length fell, MD = -1.20, 90% CI [-2.30, -0.10], p = .07.",
    # a profile-likelihood interval beside a Wald p: 5/40 v 12/40 events, Wald p = .058
    "Nest failure rose, OR = 3.00, 95% CI [0.99, 10.37], p = .058.",
    # a small sample's t-based interval: the normal reading allows p in [.0286, .0303], a t
    # with 10 df gives .0327 (test_small_sample_interval_by_mpmath)
    "Burrows were deeper, MD = 2.00, 95% CI [0.20, 3.80], p = .033.",
    "Flooded burrows were abandoned sooner (HR 0.42 (95% CI 0.30 to 0.59; P < 0.001)).",
    "Depth and mass were unrelated, r = .19, 95% CI [-.11, .47], p = .21.",
    "Upland voles dug deeper, t(58) = 2.10, p = .040, d = 0.54, 95% CI [0.02, 1.06].",
])
def test_ci_p_mismatch_not_raised(text):
    for result in results_for(text):
        assert "ci-p-mismatch" not in [f.check for f in result.flags], result.flags
        assert result.status is not Status.INCONSISTENT


def test_small_sample_interval_by_mpmath():
    # MD = 2.00 [0.20, 3.80]: the normal reading over the rounding box, and a t with 10 df
    normal = [_normal_p(e * 2 * _critical("0.95", mpmath.inf) / (hi - lo))
              for e, lo, hi in itertools.product(_box("2.00"), _box("0.20"), _box("3.80"))]
    assert 0.0285 < min(normal) and max(normal) < 0.0304
    t10 = _t_p(2 * 2 * _critical("0.95", 10) / (mpmath.mpf("3.80") - mpmath.mpf("0.20")), 10)
    assert 0.0325 < t10 < 0.0330


@pytest.mark.parametrize("text", [
    # the p belongs to the second interval (and the second coefficient) only
    "Failure rose at the upland sites (OR = 1.52, 95% CI [1.10, 2.10]) but not at the lowland "
    "sites (OR = 0.80, 95% CI [0.60, 1.07], p = .13).",
    "Mass predicted range at upland sites (b = 0.34, SE = 0.12) but not at lowland sites "
    "(b = 0.04, SE = 0.11, p = .72).",
])
def test_a_p_is_not_lent_to_an_earlier_estimate(text):
    first, second = results_for(text)
    assert first.flags == () and first.status is Status.UNCHECKED
    assert second.flags == () and second.status is Status.CONSISTENT


def test_an_interval_without_a_p_is_unchecked():
    result = only_result("The effect of the playback was moderate, d = 0.45, 95% CI [0.10, 0.80].")
    assert result.status is Status.UNCHECKED and result.reason == "no p-value printed"


def test_a_correlation_without_df_is_checked_through_its_interval():
    # r = .19, 95% CI [-.11, .47]: Fisher's z gives SE = (atanh .47 - atanh -.11) / 3.92 =
    # 0.158 and z = atanh .19 / 0.158 = 1.22, p = .22 (within the rounding of the printed
    # numbers p may be .18 to .25): p = .21 fits, p = .02 does not. Without the interval the
    # r has no df or N and stays unchecked.
    fits = only_result("The correlation was r = .19, 95% CI [-.11, .47], p = .21.")
    assert fits.status is Status.CONSISTENT and fits.flags == ()
    wrong = only_result("The correlation was r = .19, 95% CI [-.11, .47], p = .02.")
    assert [f.check for f in wrong.flags] == ["ci-p-mismatch"]
    bare = only_result("The correlation was r = .19, p = .21.")
    assert bare.status is Status.UNCHECKED and "no degrees of freedom" in bare.reason


# -- ci-estimate-mismatch --------------------------------------------------------------------

@pytest.mark.parametrize("text, why", [
    ("Flooding raised the odds, OR = 2.52, 95% CI [1.10, 2.10], p = .011.", "outside"),
    ("Burrows were deeper, B = 4.1, 95% CI 1.1-3.5, p < .001.", "outside"),
    # MD: the middle of [1.10, 3.70] is 2.40; rounding allows 0.01 (see the check's docstring)
    ("Burrows were deeper, MD = 2.30, 95% CI [1.10, 3.70], p = .001.", "middle"),
    # a limit with a misplaced decimal point: log arms 0.32 and 2.62
    ("Flooding raised the odds, OR = 1.52, 95% CI [1.10, 21.0], p = .011.", "times the other"),
])
def test_ci_estimate_mismatch_raised(text, why):
    result = only_result(text)
    flag = next(f for f in result.flags if f.check == "ci-estimate-mismatch")
    assert flag.severity is Severity.WARNING and why in flag.message


@pytest.mark.parametrize("text", [
    # Wald: log arms 0.323 and 0.323
    "Flooding raised the odds, OR = 1.52, 95% CI [1.10, 2.10], p = .011.",
    # profile likelihood (5/40 v 12/40 events): log arms 1.11 and 1.24
    "Nest failure rose, OR = 3.00, 95% CI [0.99, 10.37], p = .058.",
    # an exact interval of a rate ratio from 2 v 10 events: log arms 2.25 and 1.52
    "Calls fell after the fire, IRR = 0.20, 95% CI [0.02, 0.91].",
    # a bootstrap interval of an indirect effect: arms 0.04 and 0.07
    "The indirect effect was reliable, b = 0.05, 95% CI [0.01, 0.12].",
    # MD within rounding of the middle: 2.3 against a middle of 2.35, one-decimal rounding
    "Burrows were deeper, MD = 2.3, 95% CI [1.1, 3.6], p < .001.",
    # standardised effects are only checked for containing the estimate
    "The playback effect was moderate, d = 0.45, 95% CI [0.05, 0.80].",
    # the estimate at its limit only within rounding
    "Calls rose, B = 0.01, 95% CI [0.00, 0.05], p = .30.",
])
def test_ci_estimate_mismatch_not_raised(text):
    result = only_result(text)
    assert "ci-estimate-mismatch" not in [f.check for f in result.flags]


def test_arm_ratio_by_hand():
    # MD = 2.30 [1.10, 3.70]: arms 1.20 and 1.40; within rounding the lower arm is at most
    # 2.305 - 1.095 = 1.21 and the upper at least 3.695 - 2.305 = 1.39
    assert arm_ratio(parse_printed("2.30"), parse_printed("1.10"), parse_printed("3.70")) == \
        pytest.approx(1.39 / 1.21)
    # the same numbers may be symmetric at one decimal: 2.3 [1.1, 3.6]
    assert arm_ratio(parse_printed("2.3"), parse_printed("1.1"), parse_printed("3.6")) == 1.0
    # outside the interval: infinite
    assert math.isinf(arm_ratio(parse_printed("2.52"), parse_printed("1.10"),
                                parse_printed("2.10"), ratio=True))


# -- coefficient-mismatch --------------------------------------------------------------------

@pytest.mark.parametrize("text", [
    # |b| / SE in [0.325 / 0.135, 0.335 / 0.125] = [2.41, 2.68]; t(120) = 3.53 gives p = .0006
    "The interaction was reliable, b = 0.33, SE = 0.13, t(120) = 3.53, p < .001.",
    # [1.15 / 0.45, 1.25 / 0.35] = [2.56, 3.57]; z = 2.0 gives p = .0455
    "Rainfall predicted calling, B = 1.2 (SE = 0.4), z = 2.0, p = .046.",
    # [0.335 / 0.125, 0.345 / 0.115] = [2.68, 3.00]: p at most .0074 (normal) or .023 (t, 10 df)
    "Body mass predicted home range, b = 0.34, SE = 0.12, p = .05.",
])
def test_coefficient_mismatch_raised(text):
    result = only_result(text)
    assert [f.check for f in result.flags] == ["coefficient-mismatch"]
    assert result.status is Status.INCONSISTENT and result.flags[0].severity is Severity.ERROR


def test_the_coefficient_p_bound_by_mpmath():
    # the largest p the printed b and SE allow: t with 10 df at |b| / SE = 0.335 / 0.125
    assert _t_p(mpmath.mpf("0.335") / mpmath.mpf("0.125"), 10) < 0.0455
    assert _normal_p(mpmath.mpf("0.335") / mpmath.mpf("0.125")) < 0.0075


@pytest.mark.parametrize("text", [
    "The interaction was reliable, b = 0.33, SE = 0.13, t(120) = 2.53, p = .013.",
    # at the edge of rounding: 1.25 / 0.35 = 3.571
    "Rainfall predicted calling, B = 1.2 (SE = 0.4), z = 3.5, p < .001.",
    "Body mass predicted home range, b = 0.34, SE = 0.12, p = .005.",
    "Boldness predicted range, β = .23, SE = .08, t(120) = 2.80, p = .006.",
    # a negative coefficient and t
    "Older voles ranged less, b = -0.63, SE = 0.18, t(96) = -3.50, p < .001.",
])
def test_coefficient_mismatch_not_raised(text):
    result = only_result(text)
    assert result.flags == () and result.status is Status.CONSISTENT


@pytest.mark.parametrize("text", [
    # no SE: nothing to recompute
    "Body mass predicted home range, β = .23, t(120) = 2.80, p = .006.",
    # the SE belongs to B, the β stands between them and the t: not attached
    "Boldness predicted range, B = 0.49, SE = 0.12, β = .23, t(120) = 4.08, p < .001.",
])
def test_coefficient_mismatch_silent_without_a_coefficient_of_the_test(text):
    for result in results_for(text):
        assert "coefficient-mismatch" not in [f.check for f in result.flags]


# -- df-sample-mismatch ----------------------------------------------------------------------

@pytest.mark.parametrize("text, most", [
    ("Ninety voles (N = 90) were trapped; those near water were heavier, t(120) = 2.80, p = .006.",
     "89"),
    ("Heavier voles dug deeper, t(120) = 2.80, N = 80, p = .006.", "79"),
    # a correlation has N - 2 df: r(89) with N = 90 is one too many
    ("Depth rose with mass in the sample (N = 90), r(89) = .30, p = .004.", "88"),
    ("We trapped 62 voles at Larkhaugh (N = 62). Voles near the stream were heavier, "
     "t(70) = 2.31, p = .024.", "61"),
])
def test_df_sample_mismatch_raised(text, most):
    [result] = [r for r in results_for(text) if r.claim.test in ("t", "r")]
    assert [f.check for f in result.flags] == ["df-sample-mismatch"]
    flag = result.flags[0]
    assert flag.severity is Severity.WARNING and f"at most {most}" in flag.message
    # a warning about the sample, not about the test: the result stays consistent
    assert result.status is Status.CONSISTENT


@pytest.mark.parametrize("text", [
    "Ninety voles (N = 90) were trapped; those near water were heavier, t(88) = 2.80, p = .006.",
    "Ninety voles (N = 90) were weighed twice; they gained mass, t(89) = 2.80, p = .006.",
    "Depth rose with mass in the sample (N = 90), r(88) = .30, p = .004.",
    # an N per group
    "Voles (N = 80 per group) differed in mass, t(158) = 2.80, p = .006.",
    # trials, observations, a mixed model
    "Keepers (N = 48) made 40 judgements each; speed rose with practice, t(1879) = 6.26, p < .001.",
    "In a linear mixed model of the 48 keepers (N = 48), speed rose, t(1879) = 6.26, p < .001.",
    # a mixed model's decimal df with the N of participants
    "Speed rose with practice (N = 48), b = 0.63, SE = 0.10, t(1879.70) = 6.26, p < .001.",
    # a repeated-measures F: df2 = (3 - 1)(48 - 1) = 94 exceeds N, as it should
    "Voles (N = 48) rated three baits; ratings differed, F(2, 94) = 5.10, p = .008.",
    # the N belongs to the chi-square printed with it
    "Sex ratios differed, χ2(1, N = 80) = 4.10, p = .043, and males were heavier, "
    "t(120) = 2.80, p = .006.",
    # two results in the paragraph: its N reaches neither
    "We trapped 62 voles (N = 62). Voles near the stream were heavier, t(70) = 2.31, p = .024, "
    "and older, t(70) = 2.05, p = .044.",
])
def test_df_sample_mismatch_not_raised(text):
    for result in results_for(text):
        assert "df-sample-mismatch" not in [f.check for f in result.flags]


def test_df_sample_mismatch_ignores_an_n_far_away_in_text_without_blank_lines():
    filler = "Pikas were weighed and released at the burrow mouth.\n" * 60
    text = "We trapped 62 voles (N = 62).\n" + filler + \
        "Voles near the stream were heavier, t(70) = 2.31, p = .024.\n"
    assert flags_for(text) == []
    assert flags_for(filler + text.splitlines()[0] + "\n" + text.splitlines()[-1]) == \
        ["df-sample-mismatch"]


# -- Altman & Bland (2011): the p-value from a confidence interval ----------------------------

@pytest.mark.parametrize("entry_id", ["AB-04", "AB-05"])
def test_altman_bland_examples_are_consistent(entry_id):
    row = _row(entry_id)
    ratio = row["ratio"] == "yes"
    facts = interval_facts(parse_printed(row["estimate"]), parse_printed(row["lower"]),
                           parse_printed(row["upper"]), ratio=ratio)
    published = Fraction(row["published"])
    half = Fraction(1, 2 * 10 ** len(row["published"].split(".")[1]))
    # the rounding interval of the published P meets what the interval implies
    assert facts.p.low <= published + half and published - half <= facts.p.high
    assert facts.excludes_null is True
    # the p of the printed numbers at face value (exact normal tail, mpmath) lies inside
    transform = mpmath.log if ratio else (lambda x: mpmath.mpf(x))
    se = (transform(row["upper"]) - transform(row["lower"])) / (2 * _critical("0.95", mpmath.inf))
    face_value = _normal_p(transform(row["estimate"]) / se)
    assert facts.p.low <= face_value <= facts.p.high


@pytest.mark.parametrize("entry_id", ["AB-07", "AB-08"])
def test_altman_bland_round_trips_by_mpmath(entry_id):
    # the compilation's exact normal p and z of the printed numbers, recomputed with mpmath
    row = _row(entry_id)
    transform = mpmath.log if row["ratio"] == "yes" else (lambda x: mpmath.mpf(x))
    se = (transform(row["upper"]) - transform(row["lower"])) / (2 * _critical("0.95", mpmath.inf))
    z = abs(transform(row["estimate"])) / se
    assert abs(z - mpmath.mpf(row["z"])) <= 0.00005
    assert abs(_normal_p(z) - mpmath.mpf(row["published"])) <= 0.00005
    # the approximation AB-01 gives the compilation's other number
    approximation = mpmath.exp(-0.717 * z - 0.416 * z * z)
    assert abs(approximation - mpmath.mpf(row["approximation"])) <= 0.00005
    facts = interval_facts(parse_printed(row["estimate"]), parse_printed(row["lower"]),
                           parse_printed(row["upper"]), ratio=row["ratio"] == "yes")
    assert facts.statistic.low <= z <= facts.statistic.high


@pytest.mark.parametrize("row", [r for r in AB_ROWS if r["id"] == "AB-09"],
                         ids=lambda r: f"z={r['z']}")
def test_exact_normal_tails_not_the_approximation(row):
    z = mpmath.mpf(row["z"])
    exact = _normal_p(z)
    digits = row["published"].lower().split("e")[0].replace(".", "").lstrip("0")
    assert mpmath.almosteq(exact, mpmath.mpf(row["published"]),
                           rel_eps=0.6 * 10.0 ** -(len(digits) - 1), abs_eps=0)
    # an interval printed to ten decimals, with the estimate z standard errors from 0
    critical = _critical("0.95", mpmath.inf)
    lower, upper = z - critical, z + critical
    facts = interval_facts(parse_printed(f"{float(z):.10f}"), parse_printed(f"{float(lower):.10f}"),
                           parse_printed(f"{float(upper):.10f}"))
    # for z above the critical value the normal tail is the smallest p over df >= 10, below it
    # the largest (see test_interval_facts_against_mpmath)
    normal_end = facts.p.low if z > critical else facts.p.high
    assert mpmath.almosteq(normal_end, exact, rel_eps=1e-6, abs_eps=0)
    approximation = mpmath.mpf(row["approximation"])
    if z >= 3:
        assert not mpmath.almosteq(normal_end, approximation, rel_eps=0.02, abs_eps=0)


# -- interval_facts and ratio_interval against mpmath ----------------------------------------

_DENSE_DF = (10, 10.5, 11, 13, 16, 20, 30, 45, 60, 120, 500, mpmath.inf)


def _reference_p_range(estimate: str, lower: str, upper: str, confidence: str,
                       ratio: bool) -> tuple[mpmath.mpf, mpmath.mpf]:
    """The range of the two-sided p over the rounding box of the three numbers and any df
    from 10 up (dense grid), with the SE from the full width, and from each arm wherever no
    symmetric interval rounds to the printed numbers (the documented reading)."""
    transform = mpmath.log if ratio else (lambda x: x)
    null = transform(mpmath.mpf(1)) if ratio else mpmath.mpf(0)
    (e0, e1), (l0, l1), (u0, u1) = _box(estimate), _box(lower), _box(upper)
    lower_arm = (transform(e0) - transform(l1), transform(e1) - transform(l0))
    upper_arm = (transform(u0) - transform(e1), transform(u1) - transform(e0))
    lopsided = lower_arm[0] > upper_arm[1] or upper_arm[0] > lower_arm[1]
    values = [mpmath.mpf(1)] if e0 <= (1 if ratio else 0) <= e1 else []
    for df in _DENSE_DF:
        critical = _critical(confidence, df)
        for e, lo, hi in itertools.product((e0, e1), (l0, l1), (u0, u1)):
            e, lo, hi = transform(e), transform(lo), transform(hi)
            spreads = [(hi - lo) / 2] + ([e - lo, hi - e] if lopsided else [])
            for spread in spreads:
                if spread > 0:
                    values.append(_t_p(abs(e - null) * critical / spread, df))
    return min(values), max(values)


@pytest.mark.parametrize("estimate, lower, upper, confidence, ratio", [
    ("0.50", "0.10", "0.90", "0.95", False),
    ("-0.85", "-1.60", "-0.10", "0.95", False),
    ("2.3", "1.1", "3.5", "0.95", False),
    ("-1.20", "-2.30", "-0.10", "0.90", False),
    ("0.4", "-0.6", "1.4", "0.99", False),
    ("1.52", "1.10", "2.10", "0.95", True),
    ("0.71", "0.55", "0.92", "0.95", True),
    ("3.00", "0.99", "10.37", "0.95", True),    # lopsided: the arms count
    ("1.00", "0.70", "1.43", "0.95", True),     # the estimate rounds to the null
])
def test_interval_facts_against_mpmath(estimate, lower, upper, confidence, ratio):
    facts = interval_facts(parse_printed(estimate), parse_printed(lower), parse_printed(upper),
                           confidence=float(confidence), ratio=ratio)
    low, high = _reference_p_range(estimate, lower, upper, confidence, ratio)
    # the dense df grid finds no p outside scrutiny's range (p is monotone in df), and the
    # ends agree: they are attained at df = 10 or at the normal
    assert mpmath.almosteq(facts.p.low, low, rel_eps=1e-9, abs_eps=0)
    assert mpmath.almosteq(facts.p.high, high, rel_eps=1e-9, abs_eps=0)
    assert MIN_DF == 10


def _reference_ratio(estimate: str, se: str) -> tuple[mpmath.mpf, mpmath.mpf]:
    """min and max of |b| / SE over a fine grid of the rounding box (zero included)."""
    (e0, e1), (s0, s1) = _box(estimate), _box(se)
    steps = [mpmath.mpf(i) / 20 for i in range(21)]
    estimates = [e0 + (e1 - e0) * t for t in steps] + ([mpmath.mpf(0)] if e0 <= 0 <= e1 else [])
    errors = [s0 + (s1 - s0) * t for t in steps]
    values = [abs(e) / s for e in estimates for s in errors if s > 0]
    return min(values), max(values)


@pytest.mark.parametrize("estimate, se", [
    (estimate, se)
    for estimate in ("0.34", "-0.63", "1.2", ".23", "-.05", "0.00", "12.4", "0.004")
    for se in ("0.12", "0.4", ".08", "0.05", "1.0", "0.003")
])
def test_ratio_interval_against_mpmath(estimate, se):
    found = ratio_interval(parse_printed(estimate), parse_printed(se))
    low, high = _reference_ratio(estimate, se)
    assert mpmath.almosteq(found.low, low, rel_eps=1e-12, abs_eps=1e-15)
    assert mpmath.almosteq(found.high, high, rel_eps=1e-12, abs_eps=0)
