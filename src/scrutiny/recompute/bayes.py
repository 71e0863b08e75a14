"""Bayesian evidence for a point null hypothesis, from a reported test result.

Three measures, each with the prior it assumes:

* The Sellke-Bayarri-Berger bound (Sellke, Bayarri & Berger 2001, The American Statistician 55,
  62-71): for any prior in a wide class, BF01 >= -e p ln p when p < 1/e (and >= 1 otherwise).
  It needs nothing but p and says how much a p-value can at most speak against the null.
* The default "JZS" Bayes factor for t tests (Rouder, Speckman, Sun, Morey & Iverson 2009,
  Psychonomic Bulletin & Review 16, 225-237): a Cauchy prior with scale r on the standardised
  effect delta under H1 (r = sqrt(2)/2 by default), computed by numerical integration over the
  mixing variance g of eq. 1 of that paper. A correlation r(df) enters through its t with
  N = df + 2 observations and df degrees of freedom: this is exactly the default Bayes factor
  for a correlation of Wetzels & Wagenmakers (2012, Psychonomic Bulletin & Review 19,
  1057-1064), the Zellner-Siow regression Bayes factor with one predictor.
* The unit-information (BIC) approximation (Kass & Raftery 1995; Wagenmakers 2007, Psychonomic
  Bulletin & Review 14, 779-804) for z and chi-square results with N: BF01 ~ N^(k/2) exp(-X2/2)
  for a chi-square statistic on k df (z: X2 = z^2, k = 1).

With a prior probability pi0 of the null, the posterior probability of the null is
1 / (1 + (1 - pi0) / pi0 / BF01).
"""

from __future__ import annotations

import math
import sys

import numpy

from ..model import Evidence
from ..numbers import format_count

#: grid in u = ln g for the JZS integral; the integrand is smooth in u and negligible outside
#: [-14, 50] (the inverse-gamma prior on g vanishes double-exponentially below, and the
#: integrand falls as exp(-u) above), so the trapezoidal rule converges geometrically: 321
#: points (a step of 0.2) agree with 1281 points to 2e-14 over t from 0 to 50 and n from 2 to
#: 10^6, and with 161 points to 2e-10
_LOG_G = numpy.linspace(-14.0, 50.0, 321)
_STEP = _LOG_G[1] - _LOG_G[0]
_G = numpy.exp(_LOG_G)
# ln of the inverse-gamma(1/2, 1/2) density of g, times the Jacobian g of u = ln g
_LOG_PRIOR = -0.5 * math.log(2.0 * math.pi) - 0.5 * _LOG_G - 0.5 / _G


def jzs_bf10(t: float, n_effective: float, df: float, prior_scale: float = math.sqrt(2) / 2) -> float:
    """Rouder et al. (2009) eq. 1: BF10 of a t test with a Cauchy(0, `prior_scale`) prior on
    the standardised effect.

    One sample or paired differences: `n_effective` = n and `df` = n - 1. Two independent
    groups: `n_effective` = n1 n2 / (n1 + n2) and `df` = n1 + n2 - 2.
    """
    if not (n_effective > 0 and df > 0 and prior_scale > 0):
        raise ValueError("n, df and the prior scale must be positive")
    spread = 1.0 + n_effective * prior_scale**2 * _G
    half = (df + 1.0) / 2.0
    log_alternative = (-0.5 * numpy.log(spread)
                       - half * numpy.log1p(t * t / (spread * df))
                       + _LOG_PRIOR)
    top = log_alternative.max()
    integral = top + math.log(numpy.exp(log_alternative - top).sum() * _STEP)
    log_null = -half * math.log1p(t * t / df)
    return math.exp(min(integral - log_null, 700.0))


def bic_bf01(chi_square: float, df: float, n: float) -> float:
    """Unit-information (BIC) approximation: BF01 = exp((df ln N - X2) / 2)."""
    if not (n > 1 and df > 0):
        raise ValueError("N must exceed 1 and df must be positive")
    return math.exp(min((df * math.log(n) - chi_square) / 2.0, 700.0))


def minimum_bf01(p: float) -> float:
    """Sellke-Bayarri-Berger lower bound on BF01: -e p ln p for p < 1/e, else 1."""
    if not 0.0 <= p <= 1.0:
        raise ValueError(f"p must lie in [0, 1], got {p}")
    if p == 0.0:
        return 0.0
    if p >= 1.0 / math.e:
        return 1.0
    return -math.e * p * math.log(p)


def posterior_null(bf01: float, prior_null: float = 0.5) -> float:
    """P(H0 | data) from BF01 and the prior probability of the null."""
    if not 0.0 < prior_null < 1.0:
        raise ValueError("the prior probability of the null must lie strictly between 0 and 1")
    if math.isinf(bf01):
        return 1.0
    prior_odds = prior_null / (1.0 - prior_null)
    posterior_odds = prior_odds * bf01
    if posterior_odds == 0.0:
        return 0.0
    # 1 / (1 + 1/odds) rather than odds / (1 + odds): monotone in the odds to the last bit
    return 1.0 / (1.0 + 1.0 / posterior_odds)


def evidence_for(test: str, statistic: float, df: tuple[float, ...], n: float | None,
                 p: float | None, design, *, prior_scale: float, prior_null: float) -> Evidence:
    """The evidence measures of one result (see the module docstring for each method).

    `design` is the `effects.Design` of a t test (None for the other families).
    """
    minimum = minimum_bf01(p) if p is not None else None
    base = dict(
        min_bf01=minimum,
        min_posterior_null=posterior_null(minimum, prior_null) if minimum is not None else None,
        prior_null=prior_null,
    )
    if test == "t" or (test == "F" and df[0] == 1):
        # F(1, df) is the square of a t on df; `design` is then the design of that t
        t, nu = (math.sqrt(max(statistic, 0.0)), df[1]) if test == "F" else (statistic, df[0])
        n_effective = design.n1 if design.kind == "within" else \
            design.n1 * design.n2 / (design.n1 + design.n2)
        assumption = design.describe()
        if test == "F":
            assumption = f"F(1, df) as the t = sqrt(F) of {assumption}"
        bf01 = 1.0 / jzs_bf10(t, n_effective, nu, prior_scale)
        return Evidence(**base, bf01=bf01, method="jzs", prior_scale=prior_scale,
                        posterior_null=posterior_null(bf01, prior_null),
                        assumption=sys.intern(assumption))
    if test == "r":
        nu = df[0]
        t = statistic * math.sqrt(nu / (1.0 - statistic**2)) if abs(statistic) < 1 else math.inf
        if math.isinf(t):
            return Evidence(**base, reason="|r| = 1: no Bayes factor")
        # N = df + 2 observations (not df): with it eq. 1 of Rouder et al. becomes the
        # correlation Bayes factor of Wetzels & Wagenmakers (2012)
        bf01 = 1.0 / jzs_bf10(t, nu + 2.0, nu, prior_scale)
        return Evidence(**base, bf01=bf01, method="jzs", prior_scale=prior_scale,
                        posterior_null=posterior_null(bf01, prior_null),
                        assumption=f"the t of r, t = r sqrt(df / (1 - r^2)), with N = df + 2 = "
                                   f"{format_count(nu + 2.0)}")
    if test == "F":
        # The unit-information prior puts one observation's worth of information on each of
        # df1 parameters; for several at once it favours the null so strongly (BF01 near 300
        # for F(5, 160) = 2.85, p = .017) that it would mislead more than inform.
        return Evidence(**base, reason="no default Bayes factor for F with more than one "
                                       "numerator df (the bound min_bf01 still applies)")
    if test in ("z", "chi2"):
        if not n:
            return Evidence(**base, reason=f"no N printed for the {test} result")
        if n <= 1:
            return Evidence(**base,
                            reason=f"N = {format_count(n)}: the BIC approximation needs N > 1")
        chi_square, k = (statistic**2, 1.0) if test == "z" else (statistic, df[0])
        bf01 = bic_bf01(chi_square, k, n)
        return Evidence(**base, bf01=bf01, method="bic",
                        posterior_null=posterior_null(bf01, prior_null),
                        assumption=f"unit-information prior, N = {format_count(n)}")
    raise ValueError(test)
