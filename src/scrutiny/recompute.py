"""recompute: pure functions from a Claim to numbers (no I/O, no text, no judgement).

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

from .model import Claim, Effect, Interval, Recomputed, Settings
from .numbers import format_count as _count
from .rounding import (
    UnreadableNumber,
    magnitude_interval,
    parse_printed,
    reported_p_interval,
    statistic_interval,
)

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


# -- implied effect sizes --------------------------------------------------------------------

def implied_effect(test: str, statistic: float, df: tuple[float, ...], n: float | None,
                   design: str | None) -> Effect | None:
    """The effect size a result implies, with the design assumption it rests on.

    * t, paired or one sample: d_z = t / sqrt(n), n = df + 1 (Lakens 2013, eq. for d_z);
    * t, otherwise two independent groups of equal size: d = t sqrt(1/n1 + 1/n2) = 2t / sqrt(N)
      with N = df + 2 (Lakens 2013, eq. 2);
    * r: r itself, n = df + 2;
    * F: partial eta squared = F df1 / (F df1 + df2) (Lakens 2013);
    * chi2 with N: Cohen's w = sqrt(chi2 / N) (phi for a 2 x 2 table; Cohen 1988);
    * z with N: r = z / sqrt(N) (Rosenthal 1994).
    """
    if test == "t":
        if design == "within":
            size = df[0] + 1
            return Effect("d_z", statistic / math.sqrt(size),
                          f"one sample or paired differences, n = df + 1 = {_count(size)}", n=size)
        size = df[0] + 2
        stated = "" if design == "between" else " (assumed: no design stated)"
        return Effect("d", 2.0 * statistic / math.sqrt(size),
                      f"two independent groups of equal size, n = {_count(size / 2)} + "
                      f"{_count(size / 2)}{stated}", n=size)
    if test == "r":
        return Effect("r", statistic, f"Pearson r, n = df + 2 = {_count(df[0] + 2)}",
                      n=df[0] + 2)
    if test == "F":
        df1, df2 = df
        eta = statistic * df1 / (statistic * df1 + df2) if statistic * df1 + df2 > 0 else 0.0
        return Effect("eta2_partial", eta, f"partial eta squared from F({_count(df1)}, "
                      f"{_count(df2)})", n=df1 + df2 + 1)
    if test == "chi2" and n:
        return Effect("w", math.sqrt(max(statistic, 0.0) / n),
                      f"Cohen's w = sqrt(chi2 / N), N = {_count(n)}", n=n)
    if test == "z" and n:
        return Effect("r", statistic / math.sqrt(n), f"r = z / sqrt(N), N = {_count(n)}", n=n)
    return None


# -- the whole recomputation of one claim ----------------------------------------------------

def recompute(claim: Claim, settings: Settings) -> Recomputed:
    """Everything scrutiny can derive from one Claim; `reason` says what could not be."""
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
        return Recomputed(reported_p_interval=reported, df=df, n=n,
                          reason=f"no {what} printed")
    if any(d <= 0 for d in df):
        return Recomputed(reported_p_interval=reported, df=df, n=n,
                          reason="degrees of freedom must be positive")
    low, high = _RANGE[claim.test]
    if not low <= statistic.value <= high:
        return Recomputed(reported_p_interval=reported, df=df, n=n,
                          reason=f"a {claim.test} statistic cannot be {claim.statistic}")

    values = statistic_interval(claim.statistic, claim.statistic_comparator, low, high)
    two_sided = p_interval(claim.test, values, df)
    one_sided = (Interval(two_sided.low / 2.0, two_sided.high / 2.0)
                 if claim.test in TWO_SIDED else None)
    point = p_value(claim.test, statistic.value, df) if claim.statistic_comparator == "=" else None
    effect = (implied_effect(claim.test, statistic.value, df, n, claim.design_stated)
              if claim.statistic_comparator == "=" else None)
    return Recomputed(
        p=point,
        p_interval=two_sided,
        p_interval_one_sided=one_sided,
        statistic_interval=values,
        reported_p_interval=reported,
        df=df,
        n=n,
        effect=effect,
    )
