"""Granularity tests of descriptive statistics: GRIM, GRIMMER and percentages.

Means and standard deviations of integer-valued data (Likert items, counts, sum scores) cannot
take every value: with n people answering L integer items, the mean is a multiple of 1/(nL).

* GRIM (Brown & Heathers 2017, Social Psychological and Personality Science 8, 363-369): a
  printed mean is possible iff some integer total S gives S/(nL) within rounding of it. The
  test can only fail while nL < 10^decimals; above that every printed value is reachable
  ("not testable").
* GRIMMER (Anaya 2016, PeerJ Preprints 4:e2400v1), in its analytic form: with integer total S
  and integer sum of squares Q of the item sums, the sample SD is sqrt((Q - S^2/n)/(n - 1)). A
  printed SD is possible iff, for some GRIM-consistent S, an integer Q with the parity of S
  (x^2 and x have the same parity, so Q = S mod 2) gives an SD within rounding of it.
* Percentages: count / base * 100 must round to the printed percentage.

Rounding ties are accepted both ways (a true 1.125 may be printed 1.12 or 1.13): every test
uses the closed interval of half a unit around the printed value.
"""

from __future__ import annotations

import math
from ..model import Granularity
from ..rounding import PrintedNumber

#: a relative slack for floating-point error in the interval ends (not a tolerance on data)
_SLACK = 1e-9


def _totals(mean: PrintedNumber, count: int) -> list[int]:
    """Integer totals S with S / count within rounding of the printed mean."""
    low = (mean.value - mean.half_unit) * count
    high = (mean.value + mean.half_unit) * count
    slack = _SLACK * max(1.0, abs(high))
    return list(range(math.ceil(low - slack), math.floor(high + slack) + 1))


def grim(mean: PrintedNumber, n: int, items: int = 1) -> Granularity:
    """GRIM: can n people answering `items` integer items produce this printed mean?"""
    if n < 1 or items < 1:
        raise ValueError("n and the number of items must be positive")
    count = n * items
    if mean.decimals == 0 or count >= 10 ** mean.decimals:
        return Granularity(False, None, f"not testable: n x items = {count} is not below "
                                        f"10^{mean.decimals} (every mean with {mean.decimals} "
                                        f"decimals is possible)")
    totals = _totals(mean, count)
    if totals:
        return Granularity(True, True, witness=(totals[0],))
    return Granularity(True, False, f"no integer total over n x items = {count} gives a mean "
                                    f"that rounds to the printed one")


def grimmer(mean: PrintedNumber, sd: PrintedNumber, n: int, items: int = 1) -> Granularity:
    """GRIMMER: can n people answering `items` integer items produce this mean and SD?

    Works on the per-person item sums k_i (integers), whose mean is items x mean and whose SD is
    items x SD.
    """
    if n < 2 or items < 1:
        raise ValueError("GRIMMER needs n >= 2 and a positive number of items")
    mean_check = grim(mean, n, items)
    if mean_check.testable and not mean_check.consistent:
        return Granularity(True, False, "the mean itself fails GRIM")
    if sd.value < 0:
        return Granularity(True, False, "a standard deviation cannot be negative")
    # per-person sums: their total S and the rounding interval of their SD
    sd_low = max(sd.value - sd.half_unit, 0.0) * items
    sd_high = (sd.value + sd.half_unit) * items
    totals = _totals(mean, n * items)
    if not totals:
        return Granularity(True, False, "no integer total fits the mean")
    found_any_q = False
    for total in totals:
        base = total * total / n
        q_low = sd_low**2 * (n - 1) + base
        q_high = sd_high**2 * (n - 1) + base
        slack = _SLACK * max(1.0, q_high)
        first = math.ceil(q_low - slack)
        last = math.floor(q_high + slack)
        if first > last:
            continue
        found_any_q = True
        # Q must have the parity of the total (x^2 = x mod 2 for integers)
        if first % 2 != total % 2:
            first += 1
        if first <= last:
            return Granularity(True, True, witness=(total, first))
    if not found_any_q:
        # With few possible sums of squares the test bites; say when it could not.
        return Granularity(True, False, "no integer sum of squares gives an SD that rounds to "
                                        "the printed one")
    return Granularity(True, False, "only sums of squares of the wrong parity give the printed "
                                    "SD (impossible for integer data)")


def percentage(percent: PrintedNumber, count: int, base: int) -> Granularity:
    """Does count / base round to the printed percentage?"""
    if base < 1 or count < 0:
        raise ValueError("the base must be positive and the count not negative")
    if count > base:
        return Granularity(True, False, f"a count of {count} exceeds its base {base}")
    value = 100.0 * count / base
    slack = _SLACK * max(1.0, value)
    consistent = percent.value - percent.half_unit - slack <= value <= \
        percent.value + percent.half_unit + slack
    reason = "" if consistent else f"{count}/{base} = {value:.4g}%"
    return Granularity(True, consistent, reason)
