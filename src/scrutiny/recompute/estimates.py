"""Recomputation of claims that are not test statistics: means, percentages and estimates.

* A mean (with SD and n) gets its GRIM and GRIMMER verdicts - where they apply: the text says
  the measure is integer-valued ("7-point scale", "number of errors") or the settings declare
  all scales integer-valued; n is printed; and n x items is small enough to test.
* A percentage gets the check that count / base rounds to it (not for weighted percentages).
* An estimate with a confidence interval gets the p-values the interval implies (Altman &
  Bland 2011) and whether it excludes the null; a coefficient with an SE gets |b| / SE.
"""

from __future__ import annotations

import math

from scipy import special

from ..model import Claim, Granularity, Interval, Recomputed, Settings
from ..rounding import UnreadableNumber, parse_printed, reported_p_interval
from .granularity import grim, grimmer, percentage
from .intervals import MIN_DF, interval_facts, ratio_interval

_WORDS = {"one": 1, "two": 2, "three": 3, "four": 4, "five": 5, "six": 6, "seven": 7,
          "eight": 8, "nine": 9, "ten": 10, "eleven": 11, "twelve": 12, "fifteen": 15,
          "twenty": 20}


def _count(printed: str | None) -> int | None:
    if printed is None:
        return None
    if printed.lower() in _WORDS:
        return _WORDS[printed.lower()]
    try:
        value = parse_printed(printed).value
    except UnreadableNumber:
        return None
    return int(value) if value == int(value) and value > 0 else None


def _reported(claim: Claim, settings: Settings) -> Interval | None:
    if claim.p is None:
        return None
    try:
        return reported_p_interval(claim.p.comparator, claim.p.reported, settings.alpha)
    except UnreadableNumber:
        return None


def recompute_mean(claim: Claim, settings: Settings) -> Recomputed:
    described = claim.descriptive
    assert described is not None
    if not (described.integer_cue or settings.integer_scales):
        return Recomputed(reason="the measure is not stated to be integer-valued (GRIM and "
                                 "GRIMMER apply to integer data; --integer-scales declares it)")
    n = _count(described.n)
    if n is None:
        return Recomputed(reason="no n printed for this mean")
    # a sum score is one integer per person, however many items it adds up
    items = 1 if described.sum_score else (_count(described.items) or 1)
    try:
        mean = parse_printed(described.mean)
        sd = parse_printed(described.sd) if described.sd else None
    except UnreadableNumber as exc:
        return Recomputed(reason=f"unreadable number ({exc})")
    mean_verdict = grim(mean, n, items)
    sd_verdict = grimmer(mean, sd, n, items) if sd is not None and n >= 2 else None
    testable = mean_verdict.testable or (sd_verdict is not None and sd_verdict.testable)
    return Recomputed(
        n=float(n),
        grim=mean_verdict,
        grimmer=sd_verdict,
        reason=None if testable else mean_verdict.reason,
    )


def recompute_percent(claim: Claim, settings: Settings) -> Recomputed:
    proportion = claim.proportion
    assert proportion is not None
    if proportion.weighted:
        return Recomputed(reason="a weighted percentage need not equal count / base")
    count, base = _count(proportion.count), _count(proportion.base)
    if base is None or (count is None and proportion.count.strip() not in ("0",)):
        return Recomputed(reason="count or base unreadable")
    try:
        verdict = percentage(parse_printed(proportion.percent), count or 0, base)
    except UnreadableNumber as exc:
        return Recomputed(reason=f"unreadable number ({exc})")
    return Recomputed(n=float(base), percentage=verdict)


def _p_from_statistic(statistic: Interval) -> Interval:
    """Two-sided p over |statistic| in `statistic`, normal or t with at least MIN_DF df."""
    values = []
    for magnitude in (statistic.low, statistic.high):
        values.append(float(special.erfc(magnitude / math.sqrt(2.0))))
        values.append(float(2.0 * special.stdtr(MIN_DF, -magnitude)))
    return Interval(min(values), max(values))


def recompute_estimate(claim: Claim, settings: Settings) -> Recomputed:
    estimate = claim.estimate
    assert estimate is not None
    reported = _reported(claim, settings)
    try:
        value = parse_printed(estimate.value)
        if estimate.low is not None and estimate.high is not None:
            level = parse_printed(estimate.level).value / 100.0 if estimate.level else 0.95
            if not 0.5 <= level < 1.0:
                return Recomputed(reported_p_interval=reported,
                                  reason=f"an unusual confidence level ({estimate.level}%)")
            low, high = parse_printed(estimate.low), parse_printed(estimate.high)
            if estimate.label == "r":  # Fisher's z makes a correlation's interval symmetric
                value, low, high = (_fisher(x) for x in (value, low, high))
            facts = interval_facts(value, low, high, confidence=level, ratio=estimate.ratio)
            return Recomputed(p_interval=facts.p, reported_p_interval=reported,
                              interval_facts=facts,
                              reason=None if claim.p is not None else "no p-value printed")
        if estimate.se is not None:
            statistic = ratio_interval(value, parse_printed(estimate.se))
            return Recomputed(p_interval=_p_from_statistic(statistic),
                              reported_p_interval=reported, coefficient_statistic=statistic,
                              reason=None if claim.p is not None else "no p-value printed")
    except (UnreadableNumber, ValueError) as exc:
        return Recomputed(reported_p_interval=reported, reason=f"cannot be recomputed ({exc})")
    return Recomputed(reported_p_interval=reported, reason="no interval or standard error")


def _fisher(number):
    """A printed correlation moved to Fisher's z scale, keeping its rounding half-unit's ends."""
    from ..rounding import PrintedNumber

    low = math.atanh(max(min(number.value - number.half_unit, 0.999999), -0.999999))
    high = math.atanh(max(min(number.value + number.half_unit, 0.999999), -0.999999))
    return PrintedNumber((low + high) / 2.0, (high - low) / 2.0, number.decimals)


def coefficient_statistic(claim: Claim) -> Interval | None:
    """|b| / SE for a t or z printed with its coefficient and SE, else None."""
    estimate = claim.estimate
    if estimate is None or estimate.se is None:
        return None
    try:
        return ratio_interval(parse_printed(estimate.value), parse_printed(estimate.se))
    except (UnreadableNumber, ValueError):
        return None


__all__ = ["Granularity", "coefficient_statistic", "recompute_estimate", "recompute_mean",
           "recompute_percent"]
