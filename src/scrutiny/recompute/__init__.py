"""recompute: pure functions from a Claim to numbers (no I/O, no text, no judgement).

* `pvalues`: the p-value of the printed statistic and its interval over the statistic's
  rounding (two-sided for t, z, r; upper tail for F and chi-square);
* `effects`: the effect size the result implies, with confidence intervals, the 90% interval of
  an equivalence test and the effect detectable with 80% power, each with its assumption;
* `bayes`: Bayesian evidence for the point null (Sellke-Bayarri-Berger bound, JZS and BIC Bayes
  factors, posterior probability of the null).

`recompute(claim, settings)` returns all of it as one `Recomputed`; what cannot be computed is
left empty with the reason.
"""

from __future__ import annotations

import dataclasses

from ..model import Claim, Evidence, Interval, Recomputed, Settings
from ..rounding import (
    UnreadableNumber,
    magnitude_interval,
    parse_printed,
    reported_p_interval,
    statistic_interval,
)
from .bayes import evidence_for, minimum_bf01, posterior_null
from .effects import implied_effect, printed_effect_ranges, t_design
from .estimates import (
    coefficient_statistic,
    recompute_estimate,
    recompute_mean,
    recompute_percent,
)
from .pvalues import (
    NEEDS_DF,
    TWO_SIDED,
    _RANGE,
    p_chi2,
    p_f,
    p_interval,
    p_r,
    p_t,
    p_value,
    p_z,
    t_from_r,
)


def _evidence_unavailable(p: float | None, settings: Settings, reason: str) -> Evidence:
    minimum = minimum_bf01(p) if p is not None else None
    return Evidence(
        min_bf01=minimum,
        min_posterior_null=(posterior_null(minimum, settings.prior_null)
                            if minimum is not None else None),
        prior_null=settings.prior_null,
        reason=reason,
    )


def recompute(claim: Claim, settings: Settings) -> Recomputed:
    """Everything scrutiny can derive from one Claim; `reason` says what could not be."""
    if claim.test == "mean":
        return recompute_mean(claim, settings)
    if claim.test == "percent":
        return recompute_percent(claim, settings)
    if claim.test == "estimate":
        return recompute_estimate(claim, settings)
    recomputed = _recompute_test(claim, settings)
    if claim.estimate is not None and claim.estimate.low is not None:
        # an interval printed with the test ("r = .19, 95% CI [-.11, .47], p = .21")
        facts = recompute_estimate(claim, settings).interval_facts
        if facts is not None:
            recomputed = dataclasses.replace(recomputed, interval_facts=facts)
    return recomputed


def _recompute_test(claim: Claim, settings: Settings) -> Recomputed:
    reported = None
    if claim.p is not None:
        try:
            reported = reported_p_interval(claim.p.comparator, claim.p.reported, settings.alpha)
        except UnreadableNumber:
            reported = None
    try:
        statistic = parse_printed(claim.statistic)
        df = tuple(parse_printed(d).value for d in claim.df)
        n = parse_printed(claim.n).value if claim.n else None
    except UnreadableNumber as exc:
        return Recomputed(reported_p_interval=reported, reason=f"unreadable number ({exc})")

    if claim.test == "r" and not df and n is not None:
        df = (n - 2,)
    needed = NEEDS_DF[claim.test]
    if len(df) < needed:
        what = "degrees of freedom or N" if claim.test == "r" else "degrees of freedom"
        # without df the p cannot be recomputed, but a coefficient and its SE still give the
        # statistic ("b = 0.52, SE = 0.14, t = 2.10"): keep what that check needs
        coefficient = coefficient_statistic(claim) if claim.test == "t" else None
        values = None
        if coefficient is not None and claim.statistic_comparator == "=":
            values = statistic_interval(claim.statistic, "=", *_RANGE[claim.test])
        return Recomputed(reported_p_interval=reported, df=df, n=n,
                          statistic_interval=values, coefficient_statistic=coefficient,
                          reason=f"no {what} printed")
    if any(d <= 0 for d in df):
        return Recomputed(reported_p_interval=reported, df=df, n=n,
                          reason="degrees of freedom must be positive")
    if n is not None and n <= 0:
        return Recomputed(reported_p_interval=reported, df=df, n=n,
                          reason="a sample size must be positive")
    low, high = _RANGE[claim.test]
    if not low <= statistic.value <= high:
        return Recomputed(reported_p_interval=reported, df=df, n=n,
                          reason=f"a {claim.test} statistic cannot be {claim.statistic}")

    values = statistic_interval(claim.statistic, claim.statistic_comparator, low, high)
    two_sided = p_interval(claim.test, values, df)
    effect = evidence = point = printed_ranges = None
    group_sizes = _group_sizes(claim)
    if claim.statistic_comparator == "=":
        point = p_value(claim.test, statistic.value, df)
        effect = implied_effect(claim.test, statistic.value, df, n, claim.design_stated,
                                confidence=settings.confidence, alpha=settings.alpha,
                                group_sizes=group_sizes, significant=point < settings.alpha)
        if claim.test == "r" and abs(statistic.value) >= 1.0:
            evidence = _evidence_unavailable(point, settings, "|r| = 1: no Bayes factor")
        else:
            design = None
            if claim.test == "t":
                design = t_design(df[0], claim.design_stated, group_sizes)
            elif claim.test == "F" and df[0] == 1:  # the square of a t on df2
                design = t_design(df[1], claim.design_stated, group_sizes)
            if claim.effect_printed is not None:
                printed_ranges = printed_effect_ranges(
                    claim.test, magnitude_interval(values), df, n, design,
                    claim.effect_printed.measure, _subscript(claim.effect_printed.label))
            evidence = evidence_for(claim.test, statistic.value, df, n, point, design,
                                    prior_scale=settings.prior_scale,
                                    prior_null=settings.prior_null)
    else:
        evidence = _evidence_unavailable(None, settings, "a bound, not a single result")
    return Recomputed(
        p=point,
        p_interval=two_sided,
        two_sided=claim.test in TWO_SIDED,
        statistic_interval=values,
        reported_p_interval=reported,
        df=df,
        n=n,
        effect=effect,
        evidence=evidence,
        effect_printed_ranges=printed_ranges,
        coefficient_statistic=coefficient_statistic(claim),
    )


def _group_sizes(claim: Claim) -> tuple[float, float] | None:
    if claim.group_sizes is None:
        return None
    try:
        first, second = (parse_printed(size).value for size in claim.group_sizes)
    except UnreadableNumber:
        return None
    return first, second


def _subscript(label: str) -> str | None:
    """"z" for a d_z ("d_z", "dz", "d z"), else None."""
    compact = label.replace("_", "").replace(" ", "").lower()
    return "z" if compact.endswith("dz") else None


__all__ = [
    "NEEDS_DF",
    "TWO_SIDED",
    "evidence_for",
    "implied_effect",
    "p_chi2",
    "p_f",
    "p_interval",
    "p_r",
    "p_t",
    "p_value",
    "p_z",
    "recompute",
    "t_from_r",
]
