"""Effect sizes, their intervals and the detectable effect checked against sources outside the
project.

* Point estimates: the published conversions of tests/data/reference/effect_sizes.csv (section 8
  of the reference compilation: ES-W-04/05/07/08 for t, ES-W-10 for F, ES-W-11/12 for
  chi-square; sources in each row), now through the whole pipeline (`scrutiny.check_text`).
* Noncentral intervals: roots found by mpmath on noncentral distribution functions written
  here in arbitrary precision (the noncentral t by the series of Lenth 1989, Applied Statistics
  38, 185-189, algorithm AS 243; noncentral F and chi-square as Poisson mixtures of the
  regularised incomplete beta and gamma functions, Johnson, Kotz & Balakrishnan 1995, ch. 29-30).
* Fisher-z intervals of r: pingouin.compute_esci, which computes the same interval.
* The effect detectable with 80% power: statsmodels' power classes (TTestIndPower, TTestPower,
  FTestAnovaPower, GofChisquarePower, NormalIndPower); the conventions are stated at each test.

scipy, which scrutiny uses, never supplies an expected value here.
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

import mpmath
import pingouin
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from statsmodels.stats.power import (
    FTestAnovaPower,
    GofChisquarePower,
    NormalIndPower,
    TTestIndPower,
    TTestPower,
)

import scrutiny
from scrutiny.model import Claim, Location, PValue, Settings, Status
from scrutiny.recompute import recompute
from scrutiny.recompute.effects import detectable_effect, implied_effect, t_design

REFERENCE = Path(__file__).parent / "data" / "reference"
LOCATION = Location(start=0, end=0, line=1)
POWER = 0.8


def _load(name: str) -> list[dict[str, str]]:
    with open(REFERENCE / name, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def rounds_to(value: float, printed: str, decimals: str | int) -> bool:
    return abs(value - float(printed)) <= 0.5 * 10.0 ** -int(decimals) * (1 + 1e-9)


def claim(test: str, df: tuple[str, ...], statistic: str, n: str | None = None,
          design: str | None = None) -> Claim:
    text = f"{test}({', '.join(df)}) = {statistic}"
    return Claim(test=test, df=df, statistic=statistic, statistic_comparator="=",
                 p=PValue("<", ".05"), location=LOCATION, text=text, sentence=text, n=n,
                 design_stated=design)


# -- the reference library: noncentral distributions in mpmath --------------------------------

mpmath.mp.dps = 30
mpf = mpmath.mpf


def mp_nct_cdf(t, df, delta):
    """P(T <= t) of the noncentral t (AS 243): for t >= 0, with x = t^2 / (t^2 + df),
    Phi(-delta) + 1/2 sum_j [p_j I_x(j + 1/2, df/2) + q_j I_x(j + 1, df/2)], p_j and q_j the
    Poisson-type weights of delta^2 / 2; for t < 0, 1 - P(T <= -t | -delta)."""
    mpmath.mp.dps = 30
    t, df, delta = mpf(t), mpf(df), mpf(delta)
    if t < 0:
        return 1 - mp_nct_cdf(-t, df, -delta)
    total = mpmath.ncdf(-delta)
    if t == 0:
        return total
    x, b, lam = t * t / (t * t + df), df / 2, delta * delta / 2
    log_x, log_rest = mpmath.log(x), mpmath.log1p(-x)
    # I_x(a, b) and its recurrence step x^a (1 - x)^b Gamma(a + b) / (Gamma(a + 1) Gamma(b))
    series = {}
    for a in (mpf(1) / 2, mpf(1)):
        series[a] = [a, mpmath.betainc(a, b, 0, x, regularized=True),
                     mpmath.exp(mpmath.loggamma(a + b) - mpmath.loggamma(a + 1)
                                - mpmath.loggamma(b) + a * log_x + b * log_rest)]
    p_weight = mpmath.exp(-lam)
    q_weight = delta * mpmath.exp(-lam) / (mpmath.sqrt(2) * mpmath.gamma(mpf(3) / 2))
    s, j = mpf(0), 0
    while j <= lam + 12 * mpmath.sqrt(lam) + 30:
        s += p_weight * series[mpf(1) / 2][1] + q_weight * series[mpf(1)][1]
        for state in series.values():
            a, value, step = state
            state[:] = [a + 1, value - step, step * x * (a + b) / (a + 1)]
        j += 1
        p_weight *= lam / j
        q_weight *= lam / (j + mpf(1) / 2)
    return total + s / 2


def _poisson_mixture(lam, first, step, ratio):
    """sum_j Poisson(j; lam/2) F_j with F_0 = `first`, F_(j+1) = F_j - step_j, step_0 = `step`
    and step_(j+1) = step_j ratio(j)."""
    mu = mpf(lam) / 2
    weight, total, j = mpmath.exp(-mu), mpf(0), 0
    while True:
        total += weight * first
        first, step = first - step, step * ratio(j)
        j += 1
        weight *= mu / j
        if j > mu and weight < mpf(10) ** -28:
            return total


def mp_ncf_cdf(f, df1, df2, lam):
    """P(F <= f) of the noncentral F: sum_j Poisson(j; lam/2) I_x(df1/2 + j, df2/2), with
    I_x(a + 1, b) = I_x(a, b) - x^a (1 - x)^b Gamma(a + b) / (Gamma(a + 1) Gamma(b))."""
    mpmath.mp.dps = 30
    f, a, b = mpf(f), mpf(df1) / 2, mpf(df2) / 2
    x = a * f / (a * f + b)
    step = mpmath.exp(mpmath.loggamma(a + b) - mpmath.loggamma(a + 1) - mpmath.loggamma(b)
                      + a * mpmath.log(x) + b * mpmath.log1p(-x))
    return _poisson_mixture(lam, mpmath.betainc(a, b, 0, x, regularized=True), step,
                            lambda j: x * (a + j + b) / (a + j + 1))


def mp_ncx2_cdf(x, df, lam):
    """P(X <= x) of the noncentral chi-square: sum_j Poisson(j; lam/2) P(df/2 + j, x/2), with
    P(a + 1, y) = P(a, y) - y^a e^-y / Gamma(a + 1)."""
    mpmath.mp.dps = 30
    a, y = mpf(df) / 2, mpf(x) / 2
    step = mpmath.exp(a * mpmath.log(y) - y - mpmath.loggamma(a + 1))
    return _poisson_mixture(lam, mpmath.gammainc(a, 0, y, regularized=True), step,
                            lambda j: y / (a + j + 1))


def mp_root(cdf, target, low, high):
    """The noncentrality at which the (decreasing) `cdf` equals `target`: widen [low, high]
    until it brackets the root, then the Illinois variant of regula falsi in mpmath."""
    while cdf(low) < target:
        low -= 2 * (abs(low) + 1)
    while cdf(high) > target:
        high += 2 * (abs(high) + 1)
    a, b = mpf(low), mpf(high)
    fa, fb = cdf(a) - target, cdf(b) - target
    side = 0
    for _ in range(200):
        c = (a * fb - b * fa) / (fb - fa)
        fc = cdf(c) - target
        if abs(fc) < mpf(10) ** -24 or abs(b - a) < mpf(10) ** -22 * (1 + abs(c)):
            return c
        if (fc > 0) == (fa > 0):
            a, fa = c, fc
            if side == -1:
                fb /= 2
            side = -1
        else:
            b, fb = c, fc
            if side == 1:
                fa /= 2
            side = 1
    raise AssertionError("no root found")


def mp_normal_quantile(probability):
    mpmath.mp.dps = 30
    return mpmath.sqrt(2) * mpmath.erfinv(2 * mpf(probability) - 1)


# -- 1. point estimates through the pipeline (section 8) ------------------------------------------

DESIGN_WORDS = {"within": "the paired samples differed, ", "between": "the two independent groups "
                "differed, ", "": "the groups differed, "}


def _sentence(row: dict[str, str]) -> str:
    df = ", ".join(row[key] for key in ("df1", "df2") if row[key])
    statistic = {"t": "t", "F": "F", "chi2": "χ2"}[row["test"]]
    n = f", N = {row['n']}" if row["n"] else ""
    return f"In the study {DESIGN_WORDS[row['design']]}{statistic}({df}{n}) = {row['statistic']}, p < .10."


POINTS = [r for r in _load("effect_sizes.csv")
          if r["function"] == "implied_effect" and r["expect"] == "agrees"]


@pytest.mark.parametrize("row", POINTS, ids=[
    f"{r['id']} {r['test']} = {r['statistic']} {r['design'] or 'no design'} -> {r['measure']} "
    f"{r['value']} [{r['source'].split(',')[0]}, {r['provenance']}]" for r in POINTS])
def test_point_estimate_through_check_text(row):
    """ES-W-04/05/07/08 (d, d_z), EX-F-05 and ES-W-10 (partial eta squared), ES-W-11/12 (w, V)."""
    results = scrutiny.check_text(_sentence(row)).claims
    assert len(results) == 1
    effect = results[0].recomputed.effect
    assert effect.measure == row["measure"]
    assert rounds_to(effect.value, row["value"], row["decimals"])


def test_d_of_printed_group_sizes():
    """ES-F-01 (Lakens 2013; seen in S8.1): d = t sqrt(1/n1 + 1/n2); ES-W-05's 10 + 10 give
    1.13, and unequal groups the same formula (evaluated in mpmath)."""
    assert rounds_to(implied_effect("t", 2.52, (18.0,), None, None, group_sizes=(10, 10)).value,
                     "1.13", 2)
    effect = implied_effect("t", 2.52, (18.0,), None, "between", group_sizes=(6.0, 14.0))
    assert effect.value == pytest.approx(float(2.52 * mpmath.sqrt(mpf(1) / 6 + mpf(1) / 14)),
                                         rel=1e-14)
    assert "n = 6 + 14" in effect.assumption and "equal size" not in effect.assumption


def test_r_from_z_through_check_text():
    """r = z / sqrt(N) (Rosenthal 1994, recalled from memory), in mpmath."""
    effect = scrutiny.check_text("The Wald test gave z = 2.10, N = 50000, p = .036.").claims[0] \
        .recomputed.effect
    assert effect.measure == "r"
    assert effect.value == pytest.approx(float(mpf("2.10") / mpmath.sqrt(50000)), rel=1e-14)


# -- 2. noncentral intervals against mpmath ---------------------------------------------------------

T_CASES = [
    # t, df, design: ES-W-05, ES-W-04, a negative t, a large df, a small t and df, a large t
    (2.52, 18, "between"), (4.74, 9, "within"), (-2.45, 28, None), (2.10, 9998, None),
    (0.5, 3, "within"), (12.62, 2408, "between"),
]


@pytest.mark.parametrize("t, df, design", T_CASES)
def test_d_interval_inverts_the_noncentral_t(t, df, design):
    """95% limits: the delta at which t is the 97.5% and 2.5% quantile, found by mpmath
    (Steiger & Fouladi 1997), times the design's scale. 90% limits: the same distribution
    function of mpmath, evaluated at scrutiny's limits, gives the 95% and 5% tail."""
    effect = implied_effect("t", t, (float(df),), None, design)
    scale = t_design(df, design).scale
    cdf = lambda delta: mp_nct_cdf(t, df, delta)  # noqa: E731
    low = mp_root(cdf, mpf("0.975"), t - 4, t + 4)
    high = mp_root(cdf, mpf("0.025"), t - 4, t + 4)
    assert effect.low == pytest.approx(float(low) * scale, rel=1e-9)
    assert effect.high == pytest.approx(float(high) * scale, rel=1e-9)
    assert float(cdf(effect.low90 / scale)) == pytest.approx(0.95, abs=1e-10)
    assert float(cdf(effect.high90 / scale)) == pytest.approx(0.05, abs=1e-10)


F_CASES = [
    # ES-W-10's four results, a large df2, a non-significant F (lower limit 0), and
    # F(20, 20) = 10, where scipy's inverse alone was off by 1.6e-3
    (6.34, 1, 18), (4.0, 2, 57), (7.121, 4, 34), (4.846, 2, 27), (9.0, 1, 9998), (1.0, 2, 57),
    (10.0, 20, 20),
]


@pytest.mark.parametrize("f, df1, df2", F_CASES)
def test_partial_eta_squared_interval_inverts_the_noncentral_f(f, df1, df2):
    """lambda limits found by mpmath, as partial eta squared lambda / (lambda + df1 + df2 + 1)
    (Smithson 2001; Fidler & Thompson 2001); a limit is 0 where even lambda = 0 leaves F
    below the quantile."""
    effect = implied_effect("F", f, (float(df1), float(df2)), None, None)
    total = df1 + df2 + 1
    cdf = lambda lam: mp_ncf_cdf(f, df1, df2, lam)  # noqa: E731
    for confidence, low, high in ((0.95, effect.low, effect.high),
                                  (0.90, effect.low90, effect.high90)):
        tail = mpf(1 - confidence) / 2
        for limit, target in ((low, 1 - tail), (high, tail)):
            if cdf(0) <= target:
                assert limit == 0.0
                continue
            lam = mp_root(cdf, target, mpf(0), mpf(f * df1 + 20))
            assert limit == pytest.approx(float(lam / (lam + total)), rel=1e-9)


CHI2_CASES = [(30.07, 2, 2757), (4.0, 1, 100), (9.0, 1, 10000), (9.84, 1, 24310), (125.0, 100, 1e5)]


@pytest.mark.parametrize("x, df, n", CHI2_CASES)
def test_w_interval_inverts_the_noncentral_chi_square(x, df, n):
    """ES-W-11/12 and others: lambda limits found by mpmath, as w = sqrt(lambda / N)."""
    effect = implied_effect("chi2", x, (float(df),), float(n), None)
    cdf = lambda lam: mp_ncx2_cdf(x, df, lam)  # noqa: E731
    for confidence, low, high in ((0.95, effect.low, effect.high),
                                  (0.90, effect.low90, effect.high90)):
        tail = mpf(1 - confidence) / 2
        for limit, target in ((low, 1 - tail), (high, tail)):
            if cdf(0) <= target:
                assert limit == 0.0
                continue
            lam = mp_root(cdf, target, mpf(0), mpf(x + 20))
            assert limit == pytest.approx(float(mpmath.sqrt(lam / n)), rel=1e-9)


@pytest.mark.parametrize("r, df", [(-0.32, 48), (0.45, 28), (0.08, 998), (0.03, 12000), (0.9, 2)])
@pytest.mark.parametrize("confidence", [0.95, 0.90])
def test_r_interval_is_pingouins_fisher_z_interval(r, df, confidence):
    """pingouin.compute_esci(eftype="r"): tanh(atanh r -+ z_c / sqrt(n - 3)), n = df + 2."""
    effect = implied_effect("r", r, (float(df),), None, None, confidence=confidence)
    low, high = pingouin.compute_esci(stat=r, nx=df + 2, eftype="r", confidence=confidence,
                                      decimals=16)
    assert (effect.low, effect.high) == (pytest.approx(low, abs=1e-14), pytest.approx(high, abs=1e-14))


def test_r_interval_without_enough_observations_is_the_whole_range():
    """n = 3 leaves no degrees of freedom for Fisher's z (1 / sqrt(n - 3))."""
    effect = implied_effect("r", 0.5, (1.0,), None, None)
    assert (effect.low, effect.high, effect.low90, effect.high90) == (-1.0, 1.0, -1.0, 1.0)


@pytest.mark.parametrize("z, n", [(2.10, 50000), (-3.02, 12480), (1.0, 40)])
def test_r_from_z_interval(z, n):
    """(z -+ z_c) / sqrt(N), z_c the normal quantile from mpmath's inverse error function."""
    effect = implied_effect("z", z, (), float(n), None)
    for confidence, low, high in ((0.95, effect.low, effect.high),
                                  (0.90, effect.low90, effect.high90)):
        spread = mp_normal_quantile(0.5 + confidence / 2)
        assert low == pytest.approx(float((z - spread) / mpmath.sqrt(n)), rel=1e-12)
        assert high == pytest.approx(float((z + spread) / mpmath.sqrt(n)), rel=1e-12)


def test_large_statistic_near_its_df_lies_above_its_interval():
    """The convention stated in the effects module: the printed point value of w (and of
    partial eta squared) is the sample value sqrt(chi2 / N), the interval estimates
    sqrt(lambda / N); with 100 df a chi-square of 125 (p = .046) has lambda limits below 125
    (mpmath), so the point value lies above the interval."""
    effect = implied_effect("chi2", 125.0, (100.0,), 1e5, None)
    lam_high = mp_root(lambda lam: mp_ncx2_cdf(125, 100, lam), mpf("0.025"), mpf(0), mpf(200))
    assert lam_high < 125
    assert effect.high < effect.value == pytest.approx(math.sqrt(125 / 1e5))


# -- 3. the effect detectable with 80% power against statsmodels ------------------------------------
# scrutiny's power for t, z and r counts only the tail in the direction of the effect: the
# noncentrality at which P(T > t_(1 - alpha/2)) = .8 (as the usual power tables). statsmodels'
# "two-sided" power adds the far tail P(T < -t_(1 - alpha/2)); its "larger" alternative at
# alpha/2 is exactly scrutiny's convention. So: statsmodels' one-tailed power at alpha/2 of
# scrutiny's effect must be .8 to 1e-9; its two-sided power of it exceeds .8 by the far tail,
# which is below alpha/2 by construction and below 1e-5 for these samples; and statsmodels'
# own solve_power agrees to its root finder's tolerance (about 1e-5 relative; 1e-4 allowed).

ALPHAS = [0.05, 0.01]


@pytest.mark.parametrize("alpha", ALPHAS)
@pytest.mark.parametrize("df", [8, 18, 38, 98, 998, 9998])
def test_detectable_d_two_independent_groups(df, alpha):
    design = t_design(df, "between")
    d = detectable_effect("t", (float(df),), None, design, alpha)
    n1 = (df + 2) / 2
    power = TTestIndPower()
    assert power.power(effect_size=d, nobs1=n1, alpha=alpha / 2, ratio=1.0,
                       alternative="larger") == pytest.approx(POWER, abs=1e-9)
    far_tail = power.power(effect_size=d, nobs1=n1, alpha=alpha, ratio=1.0,
                           alternative="two-sided") - POWER
    assert 0.0 <= far_tail < min(alpha / 2, 1e-5)
    assert d == pytest.approx(power.solve_power(effect_size=None, nobs1=n1, alpha=alpha / 2,
                                                power=POWER, ratio=1.0, alternative="larger"),
                              rel=1e-4)


@pytest.mark.parametrize("alpha", ALPHAS)
@pytest.mark.parametrize("df", [4, 9, 29, 299, 9999])
def test_detectable_d_z_one_sample_or_paired(df, alpha):
    design = t_design(df, "within")
    d = detectable_effect("t", (float(df),), None, design, alpha)
    power = TTestPower()
    assert power.power(effect_size=d, nobs=df + 1, alpha=alpha / 2,
                       alternative="larger") == pytest.approx(POWER, abs=1e-9)
    far_tail = power.power(effect_size=d, nobs=df + 1, alpha=alpha,
                           alternative="two-sided") - POWER
    assert 0.0 <= far_tail < min(alpha / 2, 1e-5)


@pytest.mark.parametrize("alpha", ALPHAS)
@pytest.mark.parametrize("df1, df2", [(1, 18), (2, 57), (4, 34), (3, 996), (1, 9998), (6, 200)])
def test_detectable_partial_eta_squared(df1, df2, alpha):
    """FTestAnovaPower: Cohen's f with N = df1 + df2 + 1 observations in df1 + 1 groups
    (noncentrality f^2 N, the same as scrutiny's lambda); eta squared = f^2 / (1 + f^2). The
    F test is one-tailed in both, so no convention differs."""
    eta = detectable_effect("F", (float(df1), float(df2)), None, None, alpha)
    f = math.sqrt(eta / (1.0 - eta))
    power = FTestAnovaPower()
    assert power.power(effect_size=f, nobs=df1 + df2 + 1, alpha=alpha,
                       k_groups=df1 + 1) == pytest.approx(POWER, abs=1e-9)
    assert f == pytest.approx(power.solve_power(effect_size=None, nobs=df1 + df2 + 1,
                                                alpha=alpha, power=POWER, k_groups=df1 + 1),
                              rel=1e-4)


@pytest.mark.parametrize("alpha", ALPHAS)
@pytest.mark.parametrize("df, n", [(1, 100), (2, 2757), (4, 500), (1, 24310), (7, 60)])
def test_detectable_w(df, n, alpha):
    """GofChisquarePower with df + 1 bins: noncentrality N w^2, upper tail in both."""
    w = detectable_effect("chi2", (float(df),), float(n), None, alpha)
    power = GofChisquarePower()
    assert power.power(effect_size=w, nobs=n, alpha=alpha, n_bins=df + 1) == pytest.approx(
        POWER, abs=1e-9)


@pytest.mark.parametrize("alpha", ALPHAS)
@pytest.mark.parametrize("n", [20, 50, 1000, 12480])
def test_detectable_r_of_z_and_of_r(n, alpha):
    """NormalIndPower with one sample (ratio = 0): z with N gives r = (z_(1 - alpha/2) +
    z_.8) / sqrt(N); r(n - 2) gives tanh of that with n - 3 in place of N (Fisher's z).
    statsmodels' one-tailed test at alpha/2 is scrutiny's convention, as for t."""
    power = NormalIndPower()
    r_of_z = detectable_effect("z", (), float(n), None, alpha)
    assert power.power(effect_size=r_of_z, nobs1=n, alpha=alpha / 2, ratio=0,
                       alternative="larger") == pytest.approx(POWER, abs=1e-9)
    r = detectable_effect("r", (float(n - 2),), None, None, alpha)
    assert power.power(effect_size=math.atanh(r), nobs1=n - 3, alpha=alpha / 2, ratio=0,
                       alternative="larger") == pytest.approx(POWER, abs=1e-9)


def test_no_detectable_effect_without_n():
    assert detectable_effect("z", (), None, None, 0.05) is None
    assert detectable_effect("chi2", (1.0,), None, None, 0.05) is None
    assert detectable_effect("r", (1.0,), None, None, 0.05) is None


# -- 4. intervals and their point estimates (properties) --------------------------------------------

def _contains(effect) -> bool:
    return (effect.low <= effect.low90 <= effect.value <= effect.high90 <= effect.high
            and effect.confidence == 0.95)


def _contains_unless_degenerate(effect) -> bool:
    """F and chi-square: a statistic so small that it lies in the lower tail even at
    lambda = 0 gives the degenerate interval [0, 0] (no noncentrality fits it); otherwise the
    interval contains the estimate."""
    if effect.high90 == 0.0:
        return effect.low90 == effect.low == 0.0 and effect.value >= 0.0
    return _contains(effect)


@settings(max_examples=200, deadline=None)
@given(t=st.floats(-50.0, 50.0), df=st.one_of(st.integers(1, 100000).map(float),
                                               st.floats(1.0, 5000.0)),
       design=st.sampled_from([None, "within", "between"]))
def test_t_intervals_contain_the_estimate_and_are_symmetric(t, df, design):
    effect = implied_effect("t", t, (df,), None, design)
    assert _contains(effect)
    mirror = implied_effect("t", -t, (df,), None, design)
    assert mirror.low == pytest.approx(-effect.high, rel=1e-8, abs=1e-12)
    assert mirror.high == pytest.approx(-effect.low, rel=1e-8, abs=1e-12)


@settings(max_examples=200, deadline=None)
@given(r=st.floats(-0.999, 0.999), df=st.integers(2, 100000))
def test_r_intervals_contain_the_estimate(r, df):
    assert _contains(implied_effect("r", r, (float(df),), None, None))


@settings(max_examples=200, deadline=None)
@given(z=st.floats(-40.0, 40.0), n=st.integers(2, 10**7))
def test_z_intervals_contain_the_estimate(z, n):
    effect = implied_effect("z", z, (), float(n), None)
    if abs(z) >= math.sqrt(n):
        assert effect is None  # r = z / sqrt(N) would reach or pass 1: no r is implied
    else:
        assert _contains(effect)


@settings(max_examples=200, deadline=None)
@given(t=st.floats(0.0, 30.0), df2=st.integers(1, 100000))
def test_f_with_one_df_intervals_contain_the_estimate(t, df2):
    """F(1, df2) = t^2: the sample partial eta squared lies in its interval (with several df
    it need not: see test_large_statistic_near_its_df_lies_above_its_interval)."""
    effect = implied_effect("F", t * t, (1.0, float(df2)), None, None)
    assert _contains_unless_degenerate(effect) and 0.0 <= effect.low and effect.high <= 1.0


@settings(max_examples=200, deadline=None)
@given(x=st.floats(0.0, 400.0), n=st.integers(10, 10**6))
def test_chi_square_with_one_df_intervals_contain_the_estimate(x, n):
    """chi2(1) = (Z + sqrt(lambda))^2: at lambda = x the observed value sits between the
    quantiles, so sqrt(x / N) lies in the interval."""
    assert _contains_unless_degenerate(implied_effect("chi2", x, (1.0,), float(n), None))


@settings(max_examples=150, deadline=None)
@given(f=st.floats(0.0, 60.0), df1=st.integers(1, 20), df2=st.integers(1, 5000),
       x=st.floats(0.0, 200.0), df=st.integers(1, 30))
def test_f_and_chi_square_intervals_are_nested_and_in_range(f, df1, df2, x, df):
    eta = implied_effect("F", f, (float(df1), float(df2)), None, None)
    assert 0.0 <= eta.low <= eta.low90 <= eta.high90 <= eta.high < 1.0
    w = implied_effect("chi2", x, (float(df),), 500.0, None)
    assert 0.0 <= w.low <= w.low90 <= w.high90 <= w.high


# -- 5. bad input: no effect or evidence with a reason, never an exception ---------------------------

@pytest.mark.parametrize("text", [
    "The groups differed, t(0) = 2.10, p = .04.",
    "The main effect was reliable, F(0, 20) = 3.10, p = .04.",
    "The main effect was reliable, F(2, 0) = 3.10, p = .04.",
])
def test_zero_df_gives_no_effect_and_a_reason(text):
    result = scrutiny.check_text(text).claims[0]
    assert result.recomputed.effect is None and result.recomputed.evidence is None
    assert result.recomputed.reason == "degrees of freedom must be positive"


def test_correlation_of_one_has_an_effect_but_no_bayes_factor():
    result = scrutiny.check_text("Mass and depth correlated, r(28) = 1.00, p < .001.").claims[0]
    assert result.recomputed.effect.measure == "r"
    assert result.recomputed.evidence.bf01 is None
    assert result.recomputed.evidence.reason == "|r| = 1: no Bayes factor"


def test_chi_square_without_n_has_no_effect_and_says_why():
    result = scrutiny.check_text("Colour and site were related, χ2(1) = 9.00, p = .003.").claims[0]
    assert result.status is Status.CONSISTENT
    assert result.recomputed.effect is None
    assert result.recomputed.evidence.reason == "no N printed for the chi2 result"


@pytest.mark.parametrize("text", [
    "Colour and site were related, χ2(1, N = 1) = 4.00, p = .046.",
    "The Wald test gave z = 2.10, N = 1, p = .036.",
])
def test_sample_of_one_does_not_stop_the_check(text):
    """BIC needs N > 1; a printed N = 1 once raised an exception that stopped the document."""
    document = scrutiny.check_text(text + " The groups differed, t(28) = 2.45, p = .021.")
    assert len(document.claims) == 2
    assert document.claims[0].recomputed.evidence.reason == \
        "N = 1: the BIC approximation needs N > 1"
    assert document.claims[1].recomputed.evidence.bf01 is not None


@pytest.mark.parametrize("test, df, statistic, n", [
    ("t", ("1",), "1000", None), ("t", ("1e6",), "0", None), ("t", ("0.5",), "3", None),
    ("F", ("1", "1"), "1e5", None), ("F", ("30", "2"), "0", None), ("r", ("1",), ".999", None),
    ("r", ("1e6",), "-.999999", None), ("chi2", ("50",), "0", "2"), ("z", (), "40", "3"),
])
def test_extreme_inputs_give_finite_numbers(test, df, statistic, n):
    recomputed = recompute(claim(test, df, statistic, n=n), Settings())
    effect = recomputed.effect
    if effect is None:
        # z = 40 with N = 3: r = z / sqrt(N) would exceed 1, so no r is implied
        assert (test, statistic) == ("z", "40")
    else:
        for value in (effect.value, effect.low, effect.high):
            assert math.isfinite(value)
        # the 90% interval is computed for significant results, the detectable effect for
        # non-significant ones (recompute asks only for the one that matters)
        if recomputed.p < 0.05:
            assert math.isfinite(effect.low90) and math.isfinite(effect.high90)
            assert effect.detectable is None
        else:
            assert effect.low90 is None and effect.high90 is None
            assert effect.detectable is None or math.isfinite(effect.detectable)
    evidence = recomputed.evidence
    if evidence.bf01 is None:
        # F with several numerator df gets no default Bayes factor, only the bound
        assert test == "F" and float(df[0]) > 1 and evidence.reason
        assert 0.0 <= evidence.min_bf01 <= 1.0
    else:
        assert 0.0 <= evidence.bf01 < math.inf
        assert 0.0 <= evidence.posterior_null <= 1.0


# -- 6. the default smallest effects of interest (section 8.2) ----------------------------------------

CONVENTIONS = {row["measure"]: row for row in _load("effect_conventions.csv")}


def test_default_smallest_effects_of_interest_are_cohens_small_effects():
    """ES-C-01/02/03 (Cohen 1988, via Wuensch 2015, seen): d = .20, r = .10, w = .10; partial
    eta squared .01 is the rounded eta squared of f = .10 (ES-C-04: f^2 / (1 + f^2) = .0099,
    computed in mpmath; ES-C-06, common practice)."""
    defaults = Settings()
    assert defaults.sesoi_d == float(CONVENTIONS["d"]["small"])
    assert defaults.sesoi_r == float(CONVENTIONS["r"]["small"])
    assert defaults.sesoi_w == float(CONVENTIONS["w"]["small"])
    assert defaults.sesoi_eta2 == float(CONVENTIONS["eta2_partial"]["small"])
    f = mpf(CONVENTIONS["f"]["small"])
    assert rounds_to(float(f * f / (1 + f * f)), CONVENTIONS["eta2_partial"]["small"],
                     CONVENTIONS["eta2_partial"]["decimals"])
