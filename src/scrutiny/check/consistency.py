"""Checks that compare the printed p-value with the one the printed statistic implies."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterator

from ..model import TEST_FAMILIES, Claim, Interval, Recomputed, Settings, Severity
from ..numbers import format_p, format_p_interval
from ..rounding import UnreadableNumber, intervals_meet, parse_printed
from . import Context, Finding, check

SYMBOLS = {"t": "t", "F": "F", "chi2": "χ2", "r": "r", "z": "z"}
TAIL_WORDS = {"t": "two-sided", "z": "two-sided", "r": "two-sided",
              "F": "upper-tail", "chi2": "upper-tail"}
_COMPARATOR_SIGNS = {"=": "=", "<": "<", ">": ">", "<=": "≤", ">=": "≥"}


def describe_statistic(claim: Claim) -> str:
    """The claim's statistic in one canonical form, e.g. "F(2, 87) = 4.12"."""
    df = ", ".join(claim.df)
    if claim.n and claim.test == "chi2":
        df = f"{df}, N = {claim.n}" if df else f"N = {claim.n}"
    bracket = f"({df})" if df else ""
    sign = _COMPARATOR_SIGNS.get(claim.statistic_comparator, claim.statistic_comparator)
    return f"{SYMBOLS[claim.test]}{bracket} {sign} {claim.statistic}"


def describe_p(claim: Claim) -> str:
    if claim.p is None:
        return "no p"
    if claim.p.comparator == "ns":
        return "ns"
    sign = _COMPARATOR_SIGNS.get(claim.p.comparator, claim.p.comparator)
    return f"p {sign} {claim.p.reported}"


@dataclass(frozen=True)
class Fit:
    """Whether the printed p can come from the printed statistic, read two- or one-sided."""

    two_sided: bool
    one_sided: bool


def fit_of(recomputed: Recomputed) -> Fit | None:
    """None when there is nothing to compare (no p printed, or nothing recomputed)."""
    if recomputed.p_interval is None or recomputed.reported_p_interval is None:
        return None
    one_sided = (recomputed.p_interval_one_sided is not None
                 and intervals_meet(recomputed.p_interval_one_sided,
                                    recomputed.reported_p_interval))
    return Fit(two_sided=intervals_meet(recomputed.p_interval, recomputed.reported_p_interval),
               one_sided=one_sided)


def _adjustment_explains(claim: Claim, recomputed: Recomputed) -> bool:
    # An adjustment for multiple comparisons only ever raises p, so a printed adjusted p at or
    # above the unadjusted one is explained by it; one below it is not.
    assert claim.p is not None and recomputed.reported_p_interval and recomputed.p_interval
    return bool(claim.p.adjusted) and \
        recomputed.reported_p_interval.high >= recomputed.p_interval.low


def _range_text(claim: Claim, interval: Interval, tails: str) -> str:
    if claim.statistic_comparator == "=":
        where = f"every {SYMBOLS[claim.test]} that rounds to {claim.statistic}"
    else:
        where = f"every {describe_statistic(claim)}"
    return f"{where} gives {tails} p in {format_p_interval(interval.low, interval.high)}"


@check("p-mismatch", Severity.ERROR, "Reported p cannot come from the printed statistic",
       applies_to=TEST_FAMILIES, marks_inconsistent=True)
def p_mismatch(claim: Claim, recomputed: Recomputed, context: Context,
               settings: Settings) -> Iterator[Finding]:
    """The p-value implied by the statistic disagrees with the printed p beyond rounding.

    "t(28) = 2.20" stands for any t in [2.195, 2.205], i.e. a two-sided p in about
    [.0355, .0364]; "p = .02" stands for [.015, .025]. The claim is flagged only when the two
    intervals cannot meet (for bounds such as "p < .05" or "F < 1": when no value satisfies
    both). t, z and r are read as two-sided and F and chi-square as upper-tail tests; a p that
    fits only a one-sided reading is left to `undeclared-one-sided` and `one-sided`.
    Known causes besides typing errors: p-values adjusted for multiple comparisons without
    saying so, corrections of df (Greenhouse-Geisser) not printed, and tests of a different
    kind than the symbol suggests. Method: recomputing p from the reported statistic and df,
    as in Bakker & Wicherts (2011, Behavior Research Methods 43, 666-678), here with the
    rounding intervals of both printed numbers instead of a fixed tolerance.
    """
    fit = fit_of(recomputed)
    if fit is None or fit.two_sided or fit.one_sided or _adjustment_explains(claim, recomputed):
        return
    assert recomputed.p_interval is not None
    yield Finding(
        f"Reported {describe_p(claim)} cannot come from {describe_statistic(claim)}: "
        f"{_range_text(claim, recomputed.p_interval, TAIL_WORDS[claim.test])}.",
        {"recomputed_low": recomputed.p_interval.low, "recomputed_high": recomputed.p_interval.high},
    )


def _reported_side(claim: Claim, reported: Interval, alpha: float) -> str | None:
    """"significant", "not significant", or None when the printed p does not say."""
    assert claim.p is not None
    if reported.high < alpha or (claim.p.comparator in ("<", "<=") and reported.high <= alpha):
        return "significant"
    if reported.low >= alpha:
        return "not significant"
    return None


def _recomputed_side(interval: Interval, alpha: float) -> str | None:
    if interval.high < alpha:
        return "significant"
    if interval.low >= alpha:
        return "not significant"
    return None


@check("decision-flip", Severity.ERROR,
       "The reported and the recomputed p lie on different sides of alpha",
       applies_to=TEST_FAMILIES, marks_inconsistent=True)
def decision_flip(claim: Claim, recomputed: Recomputed, context: Context,
                  settings: Settings) -> Iterator[Finding]:
    """An inconsistent p-value that changes the conclusion at the chosen alpha.

    Raised when the printed p and the p recomputed from the printed statistic (two-sided for t,
    z and r) do not fit each other under rounding, and one says "significant at alpha" while
    the other says "not significant" - for every value within rounding of both. A p that fits
    only a one-sided test counts as a flip unless the text states that the test was one-sided.
    These are the errors that matter most, because the paper's conclusion rests on them
    (Bakker & Wicherts 2011 found them in a sizeable share of psychology articles). A printed
    "p = .05" is on neither side and never flips.
    """
    fit = fit_of(recomputed)
    if fit is None or fit.two_sided:
        return
    if fit.one_sided and claim.tails_stated == "one":
        return
    if not fit.one_sided and _adjustment_explains(claim, recomputed):
        return
    assert recomputed.reported_p_interval is not None and recomputed.p_interval is not None
    reported = _reported_side(claim, recomputed.reported_p_interval, settings.alpha)
    actual = _recomputed_side(recomputed.p_interval, settings.alpha)
    if reported is None or actual is None or reported == actual:
        return
    alpha = f"{settings.alpha:g}".lstrip("0")
    point = (f"p = {format_p(recomputed.p)}" if recomputed.p is not None
             else f"p in {format_p_interval(recomputed.p_interval.low, recomputed.p_interval.high)}")
    yield Finding(
        f"Reported {describe_p(claim)} ({reported} at alpha = {alpha}), but "
        f"{describe_statistic(claim)} gives {TAIL_WORDS[claim.test]} {point} ({actual}): "
        f"the conclusion changes.",
        {"alpha": settings.alpha, "recomputed": recomputed.p},
    )


@check("undeclared-one-sided", Severity.WARNING,
       "The reported p fits only a one-sided test, and the text does not say so",
       applies_to={"t", "z", "r"}, marks_inconsistent=True)
def undeclared_one_sided(claim: Claim, recomputed: Recomputed, context: Context,
                         settings: Settings) -> Iterator[Finding]:
    """The printed p is half the two-sided p, and no one-sided test is declared.

    For t, z and r the one-sided p is exactly half the two-sided p. When the printed p cannot
    come from the two-sided test but can from the one-sided one, and neither the sentence nor
    its paragraph says that the test was one-sided (one-tailed, directional), the reader is
    likely to take a one-sided p for a two-sided one - which halves the p-value and can turn
    a non-significant result into a significant one. A one-sided test is legitimate only when
    the direction was predicted before the data were seen.
    """
    fit = fit_of(recomputed)
    if fit is None or fit.two_sided or not fit.one_sided or claim.tails_stated == "one":
        return
    assert recomputed.p_interval is not None and recomputed.p_interval_one_sided is not None
    one, two = recomputed.p_interval_one_sided, recomputed.p_interval
    yield Finding(
        f"Reported {describe_p(claim)} fits {describe_statistic(claim)} only as a one-sided "
        f"test (one-sided p in {format_p_interval(one.low, one.high)}, two-sided "
        f"{format_p_interval(two.low, two.high)}); the text does not say the test was "
        f"one-sided.",
        {"one_sided_low": one.low, "one_sided_high": one.high},
    )


@check("one-sided", Severity.NOTE, "The reported p is that of a declared one-sided test",
       applies_to={"t", "z", "r"})
def one_sided(claim: Claim, recomputed: Recomputed, context: Context,
              settings: Settings) -> Iterator[Finding]:
    """The printed p is the one-sided p, and the text says the test was one-sided.

    The claim is consistent; the note tells the reader that the p-value is half of the
    two-sided one, so that it is not compared with two-sided results elsewhere.
    """
    fit = fit_of(recomputed)
    if fit is None or fit.two_sided or not fit.one_sided or claim.tails_stated != "one":
        return
    assert recomputed.p_interval is not None
    yield Finding(
        f"Reported {describe_p(claim)} is the one-sided p of {describe_statistic(claim)} "
        f"(two-sided: {format_p_interval(recomputed.p_interval.low, recomputed.p_interval.high)}"
        f"); the text states a one-sided test.",
    )


def _number(printed: str | None) -> float | None:
    if not printed:
        return None
    try:
        return parse_printed(printed).value
    except UnreadableNumber:
        return None


@check("impossible-value", Severity.ERROR, "A printed number is outside its possible range",
       applies_to=TEST_FAMILIES, marks_inconsistent=True)
def impossible_value(claim: Claim, recomputed: Recomputed, context: Context,
                     settings: Settings) -> Iterator[Finding]:
    """A number that no data can produce.

    A correlation lies in [-1, 1]; a p-value in [0, 1]; F and chi-square are sums of squares
    and cannot be negative; degrees of freedom and sample sizes are positive. Such a value is
    a typing or transcription error, or the symbol names a different statistic.
    """
    problems = []
    statistic = _number(claim.statistic)
    if statistic is not None:
        if claim.test == "r" and abs(statistic) > 1:
            problems.append(f"a correlation cannot be {claim.statistic} (|r| <= 1)")
        if claim.test in ("F", "chi2") and statistic < 0:
            problems.append(f"{SYMBOLS[claim.test]} cannot be negative ({claim.statistic})")
    for printed in claim.df:
        value = _number(printed)
        if value is not None and value <= 0:
            problems.append(f"degrees of freedom must be positive ({printed})")
    n = _number(claim.n)
    if n is not None and n <= 0:
        problems.append(f"a sample size must be positive (N = {claim.n})")
    if claim.test == "r" and not claim.df and n is not None and 0 < n <= 2:
        problems.append(f"a correlation needs N > 2 to be tested (N = {claim.n})")
    if claim.p is not None and claim.p.comparator != "ns":
        p = _number(claim.p.reported)
        if p is not None and not 0 <= p <= 1:
            problems.append(f"a p-value lies in [0, 1], not {claim.p.reported}")
    for problem in problems:
        yield Finding(f"Impossible value in {describe_statistic(claim)}: {problem}.")


@check("p-zero", Severity.WARNING, "p is printed as exactly zero")
def p_zero(claim: Claim, recomputed: Recomputed, context: Context,
           settings: Settings) -> Iterator[Finding]:
    """A p-value printed as zero ("p = .000", "p = 0").

    A p-value is never exactly zero; statistical software prints ".000" when p < .0005. The
    p is read here as p < .0005 (the rounding rule), and should be reported as "p < .001"
    (APA Publication Manual, 7th ed.).
    """
    if claim.p is None or claim.p.comparator != "=":
        return
    p = _number(claim.p.reported)
    if p == 0.0:
        yield Finding(f"{describe_p(claim)} is printed as exactly zero; a p-value is never "
                      f"zero (read here as p < {format_p(parse_printed(claim.p.reported).half_unit)}"
                      f"; report it as p < .001).")
