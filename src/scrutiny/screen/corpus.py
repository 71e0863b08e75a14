"""Corpus-level tests for selective reporting: p-curve and the caliper test.

**p-curve** (Simonsohn, Nelson & Simmons 2014, Journal of Experimental Psychology: General 143,
534-547; Simonsohn, Simmons & Nelson 2015, "Better p-curves", JEP: General 144, 1146-1152). The
distribution of significant p-values says whether a set of findings has evidential value: with a
true effect small p-values are more common than p-values just below .05 (right skew). Each
significant result is harmonised (t -> F(1, df) = t^2, z -> chi2(1) = z^2, r -> its t) and gets
two pp-values: under the null of no effect (p / .05) and under 33% power (where its statistic
falls in the noncentral distribution whose power is 1/3). Stouffer's method combines them for
the full curve (p < .05) and the half curve (p < .025), and binomial tests count the results
below .025. Decision rule of the 2015 version: evidential value if the half curve's right-skew
test gives p < .05, or both the full and the half curve give p < .10; inadequate evidence (a
flat curve) if the 33% test of the full curve gives p < .05, or both the half curve's 33% test
and its binomial test give p < .10.

**Caliper test** (Gerber & Malhotra 2008, Quarterly Journal of Political Science 3, 313-326):
with no selection, test statistics just above and just below the significance threshold
(z = 1.96) should be about equally common. Each result's p is turned into z = Phi^-1(1 - p/2);
within a caliper of w% around 1.96 the counts over and under are compared with a one-sided
binomial test (probability 1/2 under no selection), for w = 5, 10, 15 and 20%.

p-curve assumes independent results, one per study and hypothesis; a corpus screen includes
every significant result it found, which the summary states.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass

import numpy
from scipy import special, stats

from ..recompute.effects import _noncentral_chi2, _noncentral_f

#: pp-values are kept within these bounds before Stouffer's method (as the authors' code does)
_EPSILON = 2.2e-16
CALIPERS = (0.05, 0.10, 0.15, 0.20)
Z_CRITICAL = 1.959963984540054


@dataclass(frozen=True)
class Harmonised:
    """A significant result as an F(df1, df2) or a chi-square(df) statistic."""

    family: str  # "F" or "chi2"
    statistic: float
    df: tuple[float, ...]
    p: float


def harmonise(test: str, statistic: float, df: tuple[float, ...]) -> Harmonised | None:
    """t -> F(1, df) = t^2; z -> chi2(1) = z^2; r -> t -> F(1, df); F and chi2 as they are."""
    if test == "t":
        family, value, dfs = "F", statistic * statistic, (1.0, df[0])
    elif test == "r":
        if abs(statistic) >= 1:
            return None
        t = statistic * math.sqrt(df[0] / (1.0 - statistic * statistic))
        family, value, dfs = "F", t * t, (1.0, df[0])
    elif test == "z":
        family, value, dfs = "chi2", statistic * statistic, (1.0,)
    elif test == "F":
        family, value, dfs = "F", statistic, df
    elif test == "chi2":
        family, value, dfs = "chi2", statistic, df
    else:
        return None
    return Harmonised(family, value, dfs, _upper_p(family, value, dfs))


def _upper_p(family: str, value: float, df: tuple[float, ...]) -> float:
    if family == "F":
        return float(special.fdtrc(df[0], df[1], value))
    return float(special.chdtrc(df[0], value))


@functools.lru_cache(maxsize=8192)
def _critical(family: str, df: tuple[float, ...], alpha: float) -> float:
    if family == "F":
        return float(special.fdtri(df[0], df[1], 1.0 - alpha))
    return float(special.chdtri(df[0], alpha))


def _noncentral_cdf(family: str, value: float, df: tuple[float, ...], noncentrality: float) -> float:
    if family == "F":
        return float(special.ncfdtr(df[0], df[1], noncentrality, value))
    return float(special.chndtr(value, df[0], noncentrality))


@functools.lru_cache(maxsize=4096)
def power_33_noncentrality(family: str, df: tuple[float, ...]) -> float:
    """The noncentrality at which the test has 1/3 power at alpha = .05."""
    critical = _critical(family, df, 0.05)
    if family == "F":
        return _noncentral_f(df[0], df[1], critical, 2.0 / 3.0)
    return _noncentral_chi2(critical, df[0], 2.0 / 3.0)


@dataclass(frozen=True)
class PpValues:
    """The pp-values of one significant result (None where it is not in the half curve)."""

    p: float
    right: float
    power33: float
    right_half: float | None
    power33_half: float | None
    proportion_below_025: float  # P(p < .025 | p < .05) under 33% power


def pp_values(result: Harmonised) -> PpValues:
    noncentrality = power_33_noncentrality(result.family, result.df)
    cdf = _noncentral_cdf(result.family, result.statistic, result.df, noncentrality)
    critical_half = _critical(result.family, result.df, 0.025)
    proportion = 3.0 * (1.0 - _noncentral_cdf(result.family, critical_half, result.df,
                                              noncentrality))
    half = result.p < 0.025
    return PpValues(
        p=result.p,
        right=result.p / 0.05,
        power33=3.0 * (cdf - 2.0 / 3.0),
        right_half=result.p / 0.025 if half else None,
        power33_half=(cdf - (1.0 - proportion)) / proportion if half else None,
        proportion_below_025=proportion,
    )


def _stouffer(pp: list[float]) -> tuple[float, float]:
    """Stouffer's Z of pp-values and its p = Phi(Z)."""
    clipped = [min(max(value, _EPSILON), 1.0 - _EPSILON) for value in pp]
    z = sum(float(special.ndtri(value)) for value in clipped) / math.sqrt(len(clipped))
    return z, float(special.ndtr(z))


def _poisson_binomial_cdf(successes: int, probabilities: list[float]) -> float:
    """P(X <= successes) for a sum of independent Bernoulli variables."""
    distribution = numpy.zeros(len(probabilities) + 1)
    distribution[0] = 1.0
    for size, probability in enumerate(probabilities, start=1):
        # after `size` trials the counts 0..size carry mass; shift the successes up by one
        distribution[1:size + 1] = (distribution[1:size + 1] * (1.0 - probability)
                                    + distribution[:size] * probability)
        distribution[0] *= 1.0 - probability
    return float(min(1.0, distribution[:successes + 1].sum()))


@dataclass(frozen=True)
class PCurve:
    """The p-curve of a set of significant results."""

    significant: int                 # results with p < .05 (the full curve)
    below_025: int                   # results with p < .025 (the half curve)
    right_skew_full: tuple[float, float] | None      # (Stouffer Z, p)
    right_skew_half: tuple[float, float] | None
    flatness_full: tuple[float, float] | None        # 33% power test
    flatness_half: tuple[float, float] | None
    binomial_right_skew: float | None                # P(X >= below_025 | Bin(k, .5))
    binomial_flatness: float | None                  # P(X <= below_025 | 33% power)
    verdict: str

    @property
    def evidential_value(self) -> bool:
        return self.verdict == "evidential value"


def p_curve(results: list[Harmonised]) -> PCurve:
    """p-curve of the significant ones among `results` (app 4 of the authors, 2015)."""
    significant = [pp_values(r) for r in results if r.p < 0.05]
    half = [pp for pp in significant if pp.right_half is not None]
    if not significant:
        return PCurve(0, 0, None, None, None, None, None, None,
                      "no significant results: no p-curve")
    right_full = _stouffer([pp.right for pp in significant])
    flat_full = _stouffer([pp.power33 for pp in significant])
    right_half = _stouffer([pp.right_half for pp in half]) if half else None
    flat_half = _stouffer([pp.power33_half for pp in half]) if half else None
    k, below = len(significant), len(half)
    binomial_right = float(stats.binom.sf(below - 1, k, 0.5))
    binomial_flat = _poisson_binomial_cdf(below, [pp.proportion_below_025 for pp in significant])
    evidential = (right_half is not None and right_half[1] < 0.05) or (
        right_half is not None and right_full[1] < 0.10 and right_half[1] < 0.10)
    inadequate = flat_full[1] < 0.05 or (
        flat_half is not None and flat_half[1] < 0.10 and binomial_flat < 0.10)
    if evidential:
        verdict = "evidential value"
    elif inadequate:
        verdict = "evidential value inadequate (flat or left-skewed curve)"
    else:
        verdict = "inconclusive"
    return PCurve(k, below, right_full, right_half, flat_full, flat_half, binomial_right,
                  binomial_flat, verdict)


@dataclass(frozen=True)
class Caliper:
    """Counts just over and just under z = 1.96 within a caliper of `width`, and the
    one-sided binomial p of that many over."""

    width: float
    over: int
    under: int
    p: float | None


def z_of_p(p: float) -> float:
    """The |z| of a two-sided p-value: Phi^-1(1 - p/2)."""
    return float(-special.ndtri(p / 2.0)) if p > 0 else math.inf


def caliper_tests(p_values: list[float], widths: tuple[float, ...] = CALIPERS) -> list[Caliper]:
    """The caliper test of Gerber & Malhotra (2008) at each width."""
    zs = [z_of_p(p) for p in p_values if 0.0 < p <= 1.0]
    found = []
    for width in widths:
        over = sum(1 for z in zs if Z_CRITICAL <= z <= Z_CRITICAL * (1.0 + width))
        under = sum(1 for z in zs if Z_CRITICAL * (1.0 - width) <= z < Z_CRITICAL)
        total = over + under
        p = float(stats.binom.sf(over - 1, total, 0.5)) if total else None
        found.append(Caliper(width, over, under, p))
    return found
