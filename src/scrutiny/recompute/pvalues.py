"""p-values of reported statistics.

p-values come from the exact distribution functions in `scipy.special` (ufuncs, so one
recomputation costs microseconds):

* t:   p = 2 P(T_df >= |t|)                       two-sided
* z:   p = 2 P(Z >= |z|)                          two-sided
* r:   t = r sqrt(df / (1 - r^2)), df = n - 2, then as for t (two-sided)
* F:   p = P(F_{df1, df2} >= F)                   upper tail
* chi2: p = P(X^2_df >= chi2)                     upper tail

Each p is given as the point value of the printed statistic and as the interval of p over every
statistic that rounds to the printed one (see `rounding`). t, z and r also get the one-sided
interval, which is exactly half the two-sided one.
"""

from __future__ import annotations

import math

from scipy import special

from ..model import Interval
from ..rounding import magnitude_interval

TWO_SIDED = frozenset({"t", "z", "r"})
NEEDS_DF = {"t": 1, "F": 2, "chi2": 1, "r": 1, "z": 0}

#: the range each statistic can take
_RANGE = {
    "t": (-math.inf, math.inf),
    "z": (-math.inf, math.inf),
    "r": (-1.0, 1.0),
    "F": (0.0, math.inf),
    "chi2": (0.0, math.inf),
}


# -- distribution tails ----------------------------------------------------------------------

def p_t(t: float, df: float) -> float:
    """Two-sided p of Student's t with `df` degrees of freedom."""
    return float(min(1.0, 2.0 * special.stdtr(df, -abs(t))))


def p_z(z: float) -> float:
    """Two-sided p of a standard normal z (via erfc for accuracy in the far tail)."""
    return float(special.erfc(abs(z) / math.sqrt(2.0)))


def t_from_r(r: float, df: float) -> float:
    """The t statistic of a Pearson correlation: t = r sqrt(df / (1 - r^2)).

    1 - r^2 is computed as (1 - r)(1 + r), which keeps full relative precision as |r| nears 1
    (1 - r*r loses digits there, and the tail p of a large df magnifies the loss).
    """
    if abs(r) >= 1.0:
        return math.copysign(math.inf, r)
    return r * math.sqrt(df / ((1.0 - r) * (1.0 + r)))


def p_r(r: float, df: float) -> float:
    """Two-sided p of a Pearson correlation with df = n - 2."""
    return p_t(t_from_r(r, df), df)


def p_f(f: float, df1: float, df2: float) -> float:
    """Upper-tail p of F with (df1, df2) degrees of freedom."""
    return float(special.fdtrc(df1, df2, max(f, 0.0)))


def p_chi2(x: float, df: float) -> float:
    """Upper-tail p of chi-square with df degrees of freedom."""
    return float(special.chdtrc(df, max(x, 0.0)))


def p_value(test: str, statistic: float, df: tuple[float, ...]) -> float:
    """The p-value of one statistic value: two-sided for t, z, r; upper tail for F, chi2."""
    if test == "t":
        return p_t(statistic, df[0])
    if test == "z":
        return p_z(statistic)
    if test == "r":
        return p_r(statistic, df[0])
    if test == "F":
        return p_f(statistic, df[0], df[1])
    if test == "chi2":
        return p_chi2(statistic, df[0])
    raise ValueError(f"unknown test family {test!r}")


def p_interval(test: str, values: Interval, df: tuple[float, ...]) -> Interval:
    """p over every statistic in `values`; p falls as |statistic| grows, so the ends suffice."""
    if test in TWO_SIDED:
        magnitude = magnitude_interval(values)
        return Interval(p_value(test, magnitude.high, df), p_value(test, magnitude.low, df))
    return Interval(p_value(test, values.high, df), p_value(test, values.low, df))
