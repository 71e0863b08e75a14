"""Estimates reported with a confidence interval, and coefficients with a standard error.

The p-value implied by an estimate and its interval (Altman & Bland 2011, BMJ 343:d2304): the
interval's half-width is z_c standard errors, so SE = (upper - lower) / (2 z_c) and the test
statistic is estimate / SE; for ratios (odds, risk and hazard ratios) all of this happens on the
log scale. Altman and Bland give a closed-form approximation of the normal tail; scrutiny uses
the exact normal (and t, see below) tails instead.

Rounding: the estimate and both limits are printed rounded, so every quantity is an interval
over the box of values they stand for; the statistic is monotone in each of them (it grows with
|estimate| and shrinks with the width), so the corners of the box bound it - except that an
estimate whose rounding holds the null value (OR = 1.00, MD = 0.0) may have a statistic of 0.

An interval may come from a t distribution with unknown df (small samples): the p-value range
is then widened to what any df from `MIN_DF` up would give, because the printed numbers cannot
tell which applies (over df >= 10 the p-value moves monotonically, so the grid's ends bound it).
Altman and Bland note their method is approximate below about n = 60.

An interval that is not symmetric around its estimate (on the working scale) was not made as
estimate +- z_c SE: profile-likelihood intervals (R's default for odds ratios), exact and score
intervals, bootstrap intervals. Its p-value may come from another test (a Wald z beside a
profile interval), whose SE lies between what the two arms imply. The range of p therefore also
takes the SE of each arm, (estimate - lower) / z_c and (upper - estimate) / z_c, wherever no
symmetric interval rounds to the printed numbers; a lopsided interval gains in proportion to its
lopsidedness, one that may be symmetric gains nothing.
"""

from __future__ import annotations

import itertools
import math
from scipy import special

from ..model import Interval, IntervalFacts
from ..rounding import PrintedNumber

#: degrees of freedom considered for an interval of unknown origin: normal (inf) down to this
MIN_DF = 10.0
_DF_GRID = (math.inf, 120.0, 60.0, 30.0, 20.0, MIN_DF)


def _limits(number: PrintedNumber) -> tuple[float, float]:
    return number.value - number.half_unit, number.value + number.half_unit


def _two_sided_p(statistic: float, df: float) -> float:
    if math.isinf(df):
        return float(special.erfc(statistic / math.sqrt(2.0)))
    return float(2.0 * special.stdtr(df, -statistic))


def _critical(confidence: float, df: float) -> float:
    tail = 0.5 + confidence / 2.0
    return float(special.ndtri(tail)) if math.isinf(df) else float(special.stdtrit(df, tail))


def interval_facts(estimate: PrintedNumber, lower: PrintedNumber, upper: PrintedNumber,
                   confidence: float = 0.95, ratio: bool = False,
                   null: float | None = None) -> IntervalFacts:
    """p-values and sanity facts of `estimate [lower, upper]` at `confidence`.

    `ratio` puts everything on the log scale (the null is then 1, else 0 unless given).
    """
    null = (1.0 if ratio else 0.0) if null is None else null
    transform = math.log if ratio else (lambda x: x)
    corners = []
    for e, lo, hi in itertools.product(_limits(estimate), _limits(lower), _limits(upper)):
        if ratio and min(e, lo, hi) <= 0:
            continue
        if hi <= lo:
            continue
        corners.append((transform(e), transform(lo), transform(hi)))
    if not corners:
        raise ValueError("the interval has no width, or a ratio is not positive")
    p_values, statistics = [], []
    e_low, e_high = _limits(estimate)
    if e_low <= null <= e_high:
        # the estimate may be the null value itself: |estimate| / SE is not monotone across 0,
        # and its smallest value, 0, is not at a corner of the box
        p_values.append(1.0)
        statistics.append(0.0)
    centre = transform(null)
    # the SE from the whole width; from each arm too where no symmetric interval rounds to
    # the printed numbers
    lopsided = arm_ratio(estimate, lower, upper, ratio=ratio) > 1.0
    for df in _DF_GRID:
        critical = _critical(confidence, df)
        for e, lo, hi in corners:
            for spread in ((hi - lo) / 2.0, e - lo, hi - e) if lopsided else ((hi - lo) / 2.0,):
                if spread <= 0:
                    continue
                statistic = abs(e - centre) / (spread / critical)
                if math.isinf(df):
                    statistics.append(statistic)
                p_values.append(_two_sided_p(statistic, df))
    # does the interval exclude the null value? decided only where rounding cannot change it
    if lower.value - lower.half_unit > null or upper.value + upper.half_unit < null:
        excludes: bool | None = True
    elif lower.value + lower.half_unit <= null <= upper.value - upper.half_unit:
        excludes = False
    else:
        excludes = None
    # where the estimate sits: the middle of the interval on the working scale
    middle = (transform(lower.value) + transform(upper.value)) / 2.0
    slack = (abs(transform(lower.value + lower.half_unit) - transform(lower.value))
             + abs(transform(upper.value + upper.half_unit) - transform(upper.value))) / 2.0 \
        + abs(transform(estimate.value + estimate.half_unit) - transform(estimate.value))
    offset = abs(transform(estimate.value) - middle) / slack if slack > 0 else math.inf
    return IntervalFacts(
        p=Interval(min(p_values), max(p_values)),
        statistic=Interval(min(statistics), max(statistics)),
        excludes_null=excludes,
        centre_offset=offset,
        ratio=ratio,
    )


def ratio_interval(estimate: PrintedNumber, standard_error: PrintedNumber) -> Interval:
    """|estimate| / SE over the rounding of both: the test statistic of a coefficient
    ("b = 0.34, SE = 0.12" gives z or t in about [2.65, 3.13])."""
    e_low, e_high = _limits(estimate)
    s_low, s_high = _limits(standard_error)
    s_low = max(s_low, 1e-300)
    magnitudes = [abs(e_low), abs(e_high)]
    smallest = 0.0 if e_low <= 0.0 <= e_high else min(magnitudes)
    return Interval(smallest / s_high, max(magnitudes) / s_low)


def arm_ratio(estimate: PrintedNumber, lower: PrintedNumber, upper: PrintedNumber,
              ratio: bool = False) -> float:
    """How lopsided an interval is around its estimate: the longer arm (estimate to limit)
    over the shorter one, on the log scale for ratios, as small as the rounding of the three
    numbers allows. 1 when the estimate may sit in the middle; inf when it may not lie strictly
    inside its interval.

    A Wald interval (estimate +- z_c SE) has arms of equal length; profile-likelihood, exact
    and bootstrap intervals do not, so a lopsided interval is a prompt to look, not an error.
    """
    transform = math.log if ratio else (lambda x: x)
    e_low, e_high = _limits(estimate)
    l_low, l_high = _limits(lower)
    u_low, u_high = _limits(upper)
    if ratio:
        if min(e_high, l_high, u_high) <= 0:
            return math.inf
        floor = 1e-300
        e_low, l_low, u_low = max(e_low, floor), max(l_low, floor), max(u_low, floor)
    # arms: lower arm grows with the estimate and shrinks with the lower limit, and so on
    lower_arm = (transform(e_low) - transform(l_high), transform(e_high) - transform(l_low))
    upper_arm = (transform(u_low) - transform(e_high), transform(u_high) - transform(e_low))
    if lower_arm[1] <= 0 or upper_arm[1] <= 0:
        return math.inf
    if lower_arm[0] > upper_arm[1]:      # the lower arm is longer whatever the rounding
        return lower_arm[0] / upper_arm[1]
    if upper_arm[0] > lower_arm[1]:      # the upper arm is longer whatever the rounding
        return upper_arm[0] / lower_arm[1]
    return 1.0
