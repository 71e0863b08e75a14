"""Checks of estimates with confidence intervals and of coefficients with standard errors."""

from __future__ import annotations

from typing import Iterator

from ..model import Claim, Recomputed, Settings, Severity
from ..numbers import format_p_interval
from ..recompute.intervals import arm_ratio
from ..rounding import intervals_meet, magnitude_interval, parse_printed
from . import Context, Finding, check
from .consistency import describe_p, describe_statistic


def describe_estimate(claim: Claim) -> str:
    estimate = claim.estimate
    text = f"{estimate.label} = {estimate.value}"
    if estimate.low is not None:
        text += f", {estimate.level or '95'}% CI [{estimate.low}, {estimate.high}]"
    if estimate.se is not None:
        text += f", SE = {estimate.se}"
    return text


@check("ci-p-mismatch", Severity.ERROR,
       "The p-value does not fit the estimate and its confidence interval",
       applies_to={"estimate", "r", "t", "z"}, marks_inconsistent=True)
def ci_p_mismatch(claim: Claim, recomputed: Recomputed, context: Context,
                  settings: Settings) -> Iterator[Finding]:
    """The p-value an estimate's confidence interval implies disagrees with the printed p.

    The interval's half-width is z_c standard errors, so the test statistic is estimate / SE
    and the p-value follows (Altman & Bland 2011, BMJ 343:d2304); ratios (odds, risk and hazard
    ratios) work on the log scale, correlations on Fisher's z scale. Every printed number is
    read with its rounding, and because an interval may come from a t distribution with
    unknown df, any df from 10 up is allowed; an interval that is lopsided beyond rounding
    (profile likelihood, exact, bootstrap) also lets the SE be what either arm implies. A
    second test needs no arithmetic: the interval excludes the null value (0, or 1 for
    ratios) if and only if p < 1 - confidence level. Known causes besides typing errors: a p
    from another test than the interval (Fisher's exact or a likelihood-ratio p beside a Wald
    interval), which can put the two on either side of the threshold near it.
    """
    facts = recomputed.interval_facts
    reported = recomputed.reported_p_interval
    if facts is None or reported is None or claim.p is None:
        return
    estimate = claim.estimate
    level = (float(estimate.level) / 100.0) if estimate.level else 0.95
    threshold = 1.0 - level
    null = "1" if estimate.ratio else "0"
    # "p < .05" beside an interval that holds the null, or "p > .05" beside one that excludes
    # it, contradict it at the boundary itself (1e-12: the float error of 1 - 0.95)
    if facts.excludes_null is True and reported.low >= threshold - 1e-12:
        yield Finding(f"{describe_estimate(claim)} excludes {null}, so p < {threshold:.2g}; "
                      f"the printed {describe_p(claim)} says otherwise.")
        return
    if facts.excludes_null is False and reported.high <= threshold + 1e-12:
        yield Finding(f"{describe_estimate(claim)} includes {null}, so p >= {threshold:.2g}; "
                      f"the printed {describe_p(claim)} says otherwise.")
        return
    if not intervals_meet(facts.p, reported):
        yield Finding(f"Reported {describe_p(claim)} cannot come from "
                      f"{describe_estimate(claim)}: the interval implies p in "
                      f"{format_p_interval(facts.p.low, facts.p.high)}.",
                      {"implied_low": facts.p.low, "implied_high": facts.p.high})


#: labels of estimates whose interval is t- or Wald-based almost always (mean differences):
#: checked for the middle within rounding
_SYMMETRIC_LABELS = frozenset({"MD"})
#: one arm this many times the other, beyond rounding, is more than profile-likelihood, exact
#: (a rate ratio from a single event gives about 2) or bootstrap intervals usually produce
LOPSIDED = 3.0


@check("ci-estimate-mismatch", Severity.WARNING,
       "The estimate does not sit where its confidence interval says",
       applies_to={"estimate"})
def ci_estimate_mismatch(claim: Claim, recomputed: Recomputed, context: Context,
                         settings: Settings) -> Iterator[Finding]:
    """An estimate outside its own interval, or far off its middle.

    A Wald interval is estimate +- z_c SE: the estimate lies in the middle of its interval, on
    the log scale for ratios. A mean difference (MD), whose interval comes from a t or normal
    distribution, is checked for the middle within the rounding of the three numbers. Other
    intervals may honestly be lopsided: profile-likelihood intervals of odds ratios (R's
    default), exact and score intervals of rates and risk differences, bootstrap intervals of
    coefficients and indirect effects. For ratios and coefficients (OR, HR, RR, B, b,
    differences) the check only fires when one arm is at least three times the other even
    after rounding, which a misplaced decimal point or a mistyped limit produces and those
    methods rarely do. Intervals of standardised effects (d, g, r) are only checked for
    containing the estimate.
    """
    facts = recomputed.interval_facts
    estimate = claim.estimate
    if facts is None or estimate is None:
        return
    value = parse_printed(estimate.value)
    low, high = parse_printed(estimate.low), parse_printed(estimate.high)
    if value.value + value.half_unit < low.value - low.half_unit or \
            value.value - value.half_unit > high.value + high.half_unit:
        yield Finding(f"{describe_estimate(claim)}: the estimate lies outside its own interval.")
        return
    if estimate.label in _SYMMETRIC_LABELS:
        if facts.centre_offset > 1.0:
            yield Finding(f"{describe_estimate(claim)}: the estimate is not in the middle of its "
                          f"interval (off by {facts.centre_offset:.1f} times what rounding "
                          f"allows).", {"centre_offset": facts.centre_offset})
        return
    if estimate.label in ("d", "g", "r", "SMD"):
        return
    lopsided = arm_ratio(value, low, high, ratio=estimate.ratio)
    if LOPSIDED <= lopsided < float("inf"):
        scale = " on the log scale" if estimate.ratio else ""
        yield Finding(f"{describe_estimate(claim)}: one arm of the interval is {lopsided:.1f} "
                      f"times the other{scale}, even allowing for rounding; a Wald interval is "
                      f"symmetric, and profile-likelihood, exact or bootstrap intervals are rarely "
                      f"this lopsided.", {"arm_ratio": lopsided})


@check("coefficient-mismatch", Severity.ERROR,
       "A coefficient and its standard error do not give the printed statistic or p",
       applies_to={"t", "z", "estimate"}, marks_inconsistent=True)
def coefficient_mismatch(claim: Claim, recomputed: Recomputed, context: Context,
                         settings: Settings) -> Iterator[Finding]:
    """The test statistic of a coefficient is b / SE.

    For "b = 0.34, SE = 0.12, t(120) = 2.80" the printed t must be within rounding of |b| / SE
    (which, with both rounded, is an interval); for "b = 0.34, SE = 0.12, p = .005" the printed
    p must fit the p of that statistic under a normal or t distribution (any df from 10 up).
    Known causes besides typing errors: a robust or clustered SE printed beside a model-based
    statistic, a standardised coefficient printed with an unstandardised SE.
    """
    statistic = recomputed.coefficient_statistic
    if statistic is None:
        return
    estimate = claim.estimate
    if claim.test in ("t", "z"):
        printed = recomputed.statistic_interval
        if printed is None or claim.statistic_comparator != "=":
            return
        magnitude = magnitude_interval(printed)
        if not intervals_meet(magnitude, statistic):
            yield Finding(f"{estimate.label} = {estimate.value}, SE = {estimate.se} gives "
                          f"|{claim.test}| in [{statistic.low:.2f}, {statistic.high:.2f}], not "
                          f"the printed {describe_statistic(claim)}.",
                          {"implied_low": statistic.low, "implied_high": statistic.high})
        return
    reported = recomputed.reported_p_interval
    if reported is None or recomputed.p_interval is None:
        return
    if not intervals_meet(recomputed.p_interval, reported):
        yield Finding(f"Reported {describe_p(claim)} cannot come from {describe_estimate(claim)}:"
                      f" |b| / SE in [{statistic.low:.2f}, {statistic.high:.2f}] gives p in "
                      f"{format_p_interval(recomputed.p_interval.low, recomputed.p_interval.high)}.",
                      {"implied_low": recomputed.p_interval.low,
                       "implied_high": recomputed.p_interval.high})
