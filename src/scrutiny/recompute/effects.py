"""Effect sizes implied by a reported result, with confidence intervals and sensitivity.

Every number rests on a design assumption that is stated beside it (`Effect.assumption`):

| test | effect | interval |
|---|---|---|
| t, one sample or paired (n = df + 1) | d_z = t / sqrt(n) | noncentral t inverted |
| t, two independent groups (n1 + n2 = df + 2) | d = t sqrt(1/n1 + 1/n2) | noncentral t inverted |
| r (n = df + 2) | r | Fisher z: tanh(atanh r +- z_c / sqrt(n - 3)) |
| F(df1, df2) | partial eta squared = F df1 / (F df1 + df2) | noncentral F inverted, lambda / (lambda + N), N = df1 + df2 + 1 |
| chi-square(df) with N | Cohen's w = sqrt(chi2 / N) | noncentral chi-square inverted, sqrt(lambda / N) |
| z with N | r = z / sqrt(N) | (z +- z_c) / sqrt(N) |

The noncentral inversions find the noncentrality parameter at which the observed statistic
sits at the upper and lower tail quantiles (Steiger & Fouladi 1997; Steiger 2004,
Psychological Methods 9, 164-182). `scipy.special` solves them (nctdtrinc, ncfdtrinc,
chndtrinc), but those inverses leave relative errors in the noncentrality up to 2e-3 (ncfdtrinc
at F(20, 20) = 10, against mpmath) and 4e-6 (nctdtrinc), so each root is refined by secant
steps on the forward distribution function (nctdtr, ncfdtr, chndtr), accurate to machine
precision.
Formulas for the point estimates follow Lakens (2013, Frontiers in Psychology 4, 863), Cohen
(1988) and Rosenthal (1994). Partial eta squared and w are printed as the sample values
F df1 / (F df1 + df2) and sqrt(chi2 / N), while their intervals estimate the population values
lambda / (lambda + N) and sqrt(lambda / N) (Smithson 2001; Fidler & Thompson 2001): with several
df and a statistic near its df, the sample value can lie above the interval.

The *sensitivity* of a result is the effect the design could have detected with 80% power at
the chosen alpha (two-sided for t, z and r): what a non-significant result can rule out.
"""

from __future__ import annotations

import math
import sys
from dataclasses import dataclass

from scipy import special

from ..model import Effect, Interval
from ..numbers import format_count

POWER = 0.8


@dataclass(frozen=True)
class Design:
    """The sample behind a t test: two groups (n1, n2) or one sample / paired (n)."""

    kind: str  # "within" or "between"
    n1: float
    n2: float = 0.0
    stated: bool = False  # the text says which design (else it is assumed)
    sizes_printed: bool = False  # the group sizes are printed (else split equally)

    @property
    def n(self) -> float:
        return self.n1 + self.n2

    @property
    def scale(self) -> float:
        """d = t * scale: 1/sqrt(n) for one sample, sqrt(1/n1 + 1/n2) for two groups."""
        if self.kind == "within":
            return 1.0 / math.sqrt(self.n1)
        return math.sqrt(1.0 / self.n1 + 1.0 / self.n2)

    def describe(self) -> str:
        if self.kind == "within":
            text = f"one sample or paired differences, n = df + 1 = {format_count(self.n1)}"
        else:
            split = "" if self.sizes_printed else " of equal size"
            text = (f"two independent groups{split}, n = {format_count(self.n1)} + "
                    f"{format_count(self.n2)}")
        return text if self.stated else f"{text} (assumed: no design stated)"


def t_design(df: float, stated: str | None, group_sizes: tuple[float, float] | None = None) -> Design:
    """The design of a t test with `df`, from the words around it and printed group sizes."""
    if stated == "within":
        return Design("within", df + 1.0, stated=True)
    if group_sizes and abs(sum(group_sizes) - (df + 2.0)) < 0.5:
        # two printed group sizes that add up to df + 2 say "two groups" as plainly as words
        return Design("between", group_sizes[0], group_sizes[1], stated=True,
                      sizes_printed=True)
    return Design("between", (df + 2.0) / 2.0, (df + 2.0) / 2.0, stated=stated == "between")


def _critical_z(confidence: float) -> float:
    return float(special.ndtri(0.5 + confidence / 2.0))


#: a probability error of the distribution function at which a limit counts as found: the
#: noncentrality is then within about 1e-11 of its value, far below any printed digit
_GOOD_ENOUGH = 1e-13


def _refine(cdf, target: float, guess: float, floor: float = -math.inf) -> float:
    """The noncentrality at which `cdf` (decreasing in it) equals `target`, refined from the
    `guess` of a cdflib inverse by secant steps; the guess itself where no step improves on it
    or the distribution function fails (it returns nan for |t| below about 1e-100)."""
    x0 = guess
    f0 = cdf(x0) - target if math.isfinite(guess) else math.nan
    if not math.isfinite(f0):
        return guess
    best, best_error = x0, abs(f0)
    if best_error <= _GOOD_ENOUGH:  # the inverse was exact already (chndtrinc mostly is)
        return guess
    x1 = guess + 1e-4 * max(abs(guess), 1e-2)
    for _ in range(10):
        f1 = cdf(x1) - target
        if not math.isfinite(f1):
            break
        if abs(f1) < best_error:
            best, best_error = x1, abs(f1)
        if f1 == f0 or best_error <= _GOOD_ENOUGH:
            break
        x0, f0, x1 = x1, f1, max(x1 - f1 * (x1 - x0) / (f1 - f0), floor)
        if not math.isfinite(x1) or abs(x1 - x0) <= 1e-15 * max(1.0, abs(x1)):
            break
    return best


def _noncentral_t(df: float, t: float, probability: float) -> float:
    """delta with P(T <= t | df, delta) = probability."""
    return _refine(lambda delta: float(special.nctdtr(df, delta, t)), probability,
                   float(special.nctdtrinc(df, probability, t)))


def _noncentral_f(df1: float, df2: float, f: float, probability: float) -> float:
    """lambda >= 0 with P(F <= f | df1, df2, lambda) = probability."""
    return _refine(lambda nc: float(special.ncfdtr(df1, df2, nc, f)), probability,
                   float(special.ncfdtrinc(df1, df2, probability, f)), floor=0.0)


def _noncentral_chi2(x: float, df: float, probability: float) -> float:
    """lambda >= 0 with P(X <= x | df, lambda) = probability."""
    return _refine(lambda nc: float(special.chndtr(x, df, nc)), probability,
                   float(special.chndtrinc(x, df, probability)), floor=0.0)


def _noncentral_t_limits(t: float, df: float, confidence: float) -> tuple[float, float]:
    tail = (1.0 - confidence) / 2.0
    return _noncentral_t(df, t, 1.0 - tail), _noncentral_t(df, t, tail)


def _noncentral_f_limits(f: float, df1: float, df2: float, confidence: float) -> tuple[float, float]:
    tail = (1.0 - confidence) / 2.0
    central = special.fdtr(df1, df2, f)
    low = _noncentral_f(df1, df2, f, 1.0 - tail) if central > 1.0 - tail else 0.0
    high = _noncentral_f(df1, df2, f, tail) if central > tail else 0.0
    return max(low, 0.0), max(high, 0.0)


def _noncentral_chi2_limits(x: float, df: float, confidence: float) -> tuple[float, float]:
    tail = (1.0 - confidence) / 2.0
    central = special.chdtr(df, x)
    low = _noncentral_chi2(x, df, 1.0 - tail) if central > 1.0 - tail else 0.0
    high = _noncentral_chi2(x, df, tail) if central > tail else 0.0
    return max(low, 0.0), max(high, 0.0)


def _interval(test: str, statistic: float, df: tuple[float, ...], n: float | None,
              design: Design | None, confidence: float) -> tuple[float, float]:
    if test == "t":
        low, high = _noncentral_t_limits(statistic, df[0], confidence)
        return low * design.scale, high * design.scale
    if test == "r":
        size = df[0] + 2.0
        if size <= 3:
            return -1.0, 1.0
        spread = _critical_z(confidence) / math.sqrt(size - 3.0)
        centre = math.atanh(max(min(statistic, 1.0 - 1e-15), -1.0 + 1e-15))
        return math.tanh(centre - spread), math.tanh(centre + spread)
    if test == "F":
        total = df[0] + df[1] + 1.0
        low, high = _noncentral_f_limits(statistic, df[0], df[1], confidence)
        return low / (low + total), high / (high + total)
    if test == "chi2":
        low, high = _noncentral_chi2_limits(statistic, df[0], confidence)
        return math.sqrt(low / n), math.sqrt(high / n)
    if test == "z":
        spread = _critical_z(confidence)
        return (statistic - spread) / math.sqrt(n), (statistic + spread) / math.sqrt(n)
    raise ValueError(test)


def detectable_effect(test: str, df: tuple[float, ...], n: float | None, design: Design | None,
                      alpha: float, power: float = POWER) -> float | None:
    """The effect the design detects with `power` at `alpha` (two-sided for t, z and r).

    t: the noncentrality at which P(T > t_crit) = power (the far tail, beyond -t_crit, adds
    less than alpha / 2 and is left out, as in the usual power tables); F and chi-square: the
    noncentrality at which P(F > F_crit) = power, converted like the effect itself.
    """
    if test == "t":
        critical = float(special.stdtrit(df[0], 1.0 - alpha / 2.0))
        return _noncentral_t(df[0], critical, 1.0 - power) * design.scale
    if test == "F":
        critical = float(special.fdtri(df[0], df[1], 1.0 - alpha))
        noncentrality = _noncentral_f(df[0], df[1], critical, 1.0 - power)
        return noncentrality / (noncentrality + df[0] + df[1] + 1.0)
    if test == "chi2" and n:
        critical = float(special.chdtri(df[0], alpha))
        return math.sqrt(_noncentral_chi2(critical, df[0], 1.0 - power) / n)
    z_sum = float(special.ndtri(1.0 - alpha / 2.0) + special.ndtri(power))
    if test == "r" and df[0] + 2.0 > 3:
        return math.tanh(z_sum / math.sqrt(df[0] + 2.0 - 3.0))
    if test == "z" and n:
        return z_sum / math.sqrt(n)
    return None


def implied_effect(test: str, statistic: float, df: tuple[float, ...], n: float | None,
                   design_stated: str | None, *, confidence: float = 0.95, alpha: float = 0.05,
                   group_sizes: tuple[float, float] | None = None,
                   significant: bool | None = None) -> Effect | None:
    """The effect size a result implies, its `confidence` interval and 90% interval (for
    equivalence tests), the effect detectable with 80% power, and the assumption behind them.

    The 90% interval matters for significant results (is the effect equivalent to zero?) and
    the detectable effect for non-significant ones (what could the study have found?); when
    `significant` is given, only the one that matters is computed (each costs an inversion of
    a noncentral distribution). None when the result does not determine an effect (chi-square
    or z without N).
    """
    design = None
    if test == "t":
        design = t_design(df[0], design_stated, group_sizes)
        measure = "d_z" if design.kind == "within" else "d"
        value, size, assumption = statistic * design.scale, design.n, design.describe()
    elif test == "r":
        size = df[0] + 2.0
        measure, value = "r", statistic
        assumption = f"Pearson r, n = df + 2 = {format_count(size)}"
    elif test == "F":
        df1, df2 = df
        measure = "eta2_partial"
        value = statistic * df1 / (statistic * df1 + df2) if statistic * df1 + df2 > 0 else 0.0
        size = df1 + df2 + 1.0
        assumption = f"partial eta squared from F({format_count(df1)}, {format_count(df2)})"
    elif test == "chi2" and n:
        measure, value, size = "w", math.sqrt(max(statistic, 0.0) / n), n
        assumption = f"Cohen's w = sqrt(chi2 / N), N = {format_count(n)}"
    elif test == "z" and n and abs(statistic) < math.sqrt(n):  # else r = z/sqrt(N) is no r
        measure, value, size = "r", statistic / math.sqrt(n), n
        assumption = f"r = z / sqrt(N), N = {format_count(n)}"
    else:
        return None
    low, high = _interval(test, statistic, df, n, design, confidence)
    low90 = high90 = detectable = None
    if significant is not False:
        low90, high90 = _interval(test, statistic, df, n, design, 0.90)
    if significant is not True:
        detectable = detectable_effect(test, df, n, design, alpha)
    return Effect(
        measure=measure,
        value=value,
        assumption=sys.intern(assumption),  # shared by every result of the same design
        n=size,
        low=low,
        high=high,
        confidence=confidence,
        low90=low90,
        high90=high90,
        detectable=detectable,
    )


def _hedges_j(df: float) -> float:
    """Hedges' small-sample correction J = Gamma(df/2) / (sqrt(df/2) Gamma((df-1)/2))."""
    if df <= 1:
        return 1.0
    return math.exp(special.gammaln(df / 2.0) - special.gammaln((df - 1.0) / 2.0)) / math.sqrt(df / 2.0)


def printed_effect_ranges(test: str, magnitude: Interval, df: tuple[float, ...], n: float | None,
                          design: Design | None, measure: str,
                          subscript: str | None = None) -> tuple[Interval, ...] | None:
    """The values (in absolute value) a printed effect of `measure` may take, given the range
    `magnitude` of |statistic| the printed statistic stands for; None when the result does not
    determine it.

    Where conventions differ, every common one is allowed, so that only a number no convention
    produces is flagged:
    * d and g from t (or F(1, df) as t^2): one sample or paired, d_z = t/sqrt(n) or t/sqrt(df)
      (Lakens 2013 and the effectsize convention); two groups, d = t sqrt(1/n1 + 1/n2), exact
      when the group sizes are printed, else anything from equal groups (its smallest value)
      to one group of one; with no design stated, anything from d_z up. A paired "d" without a
      z subscript may be d_av or d_rm, which need the correlation: not checked. g is d times
      Hedges' J, or d itself (some software prints the uncorrected value).
    * r from t: sqrt(t^2 / (t^2 + df)); from z with N: z / sqrt(N).
    * partial eta squared and R squared from F: F df1 / (F df1 + df2); eta squared can only be
      smaller (it equals the partial one in a one-way design), so it is checked from above.
    * phi (and w) from chi-square with N: sqrt(chi2 / N); Cramer's V: sqrt(chi2 / (N m)) with
      m = min(rows, columns) - 1, any divisor of df up to sqrt(df).
    """
    low, high = magnitude.low, magnitude.high
    if test == "F" and df[0] == 1 and measure in ("d", "g", "r"):
        test, low, high, df = "t", math.sqrt(low), math.sqrt(high), (df[1],)
    if test == "t" and measure in ("d", "g"):
        nu = df[0]
        if design is not None and design.kind == "within" and design.stated:
            if subscript != "z":
                return None
            bounds = (low / math.sqrt(nu + 1.0), high / math.sqrt(nu))
        elif design is not None and design.sizes_printed:
            bounds = (low * design.scale, high * design.scale)
        elif design is not None and design.stated:
            bounds = (2.0 * low / math.sqrt(nu + 2.0), high * math.sqrt(1.0 + 1.0 / (nu + 1.0)))
        else:
            bounds = (low / math.sqrt(nu + 1.0), high * math.sqrt(1.0 + 1.0 / (nu + 1.0)))
        if measure == "g":
            bounds = (bounds[0] * _hedges_j(nu), bounds[1])
        return (Interval(*bounds),)
    if measure == "r":
        if test == "t":
            nu = df[0]
            return (Interval(low / math.sqrt(low * low + nu), high / math.sqrt(high * high + nu)),)
        if test == "z" and n:
            return (Interval(low / math.sqrt(n), min(high / math.sqrt(n), 1.0)),)
        return None
    if measure in ("eta2_partial", "R2", "eta2"):
        if test == "t":
            top = high * high / (high * high + df[0])
            bottom = low * low / (low * low + df[0])
        elif test == "F":
            df1, df2 = df
            top = high * df1 / (high * df1 + df2)
            bottom = low * df1 / (low * df1 + df2)
        else:
            return None
        return (Interval(0.0 if measure == "eta2" else bottom, top),)
    if measure in ("phi", "V") and test == "chi2" and n:
        divisors = [1] if measure == "phi" else [m for m in range(1, int(math.isqrt(int(df[0]))) + 1)
                                                 if df[0] % m == 0] or [1]
        return tuple(Interval(math.sqrt(low / (n * m)), math.sqrt(high / (n * m)))
                     for m in divisors)
    return None
