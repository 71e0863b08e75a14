"""Bayesian evidence for the point null checked against sources outside the project.

Expected values come from published tables and worked examples copied into tests/data/reference/
(sellke_bayarri_berger.csv, bayes_factors.csv, lindley.csv; entry IDs SBB-*, JZS-*, BIC-*, LIN-*
and their sources are in each row, see the README there), from pingouin (`bayesfactor_ttest`,
the JZS Bayes factor of Rouder et al. 2009 by scipy's adaptive quadrature;
`bayesfactor_pearson(method="wetzels")`, the correlation Bayes factor of Wetzels & Wagenmakers
2012), and from mpmath (the same integrals and closed forms in arbitrary precision). Each check
names its source beside it. scipy is used only to generate inputs (a t for a given p), never
for an expected value.
"""

from __future__ import annotations

import csv
import math
import warnings
from pathlib import Path

import mpmath
import pingouin
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import special

from scrutiny.model import Claim, Location, PValue, Settings
from scrutiny.recompute import recompute
from scrutiny.recompute.bayes import (
    bic_bf01,
    jzs_bf10,
    minimum_bf01,
    posterior_null,
)

REFERENCE = Path(__file__).parent / "data" / "reference"
SQRT_HALF = math.sqrt(2.0) / 2.0
LOCATION = Location(start=0, end=0, line=1)


def _load(name: str) -> list[dict[str, str]]:
    with open(REFERENCE / name, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def _source(row: dict[str, str]) -> str:
    return f"[{row['source'].split(',')[0]}, {row['provenance']}]"


def rounds_to(value: float, printed: str, decimals: str | int) -> bool:
    """`value` rounded as the source printed it gives the printed number (half-unit rule)."""
    return abs(value - float(printed)) <= 0.5 * 10.0 ** -int(decimals) * (1 + 1e-9)


def claim(test: str, df: tuple[str, ...], statistic: str, n: str | None = None,
          design: str | None = None) -> Claim:
    text = f"{test}({', '.join(df)}) = {statistic}"
    return Claim(test=test, df=df, statistic=statistic, statistic_comparator="=",
                 p=PValue("<", ".05"), location=LOCATION, text=text, sentence=text, n=n,
                 design_stated=design)


def sample(design: str, n1: float, n2: float | None) -> tuple[float, float]:
    """(N, df) of eq. 1 of Rouder et al. (2009): n and n - 1 for one sample or paired
    differences, n1 n2 / (n1 + n2) and n1 + n2 - 2 for two independent groups (JZS-01)."""
    if design in ("one-sample", "paired"):
        return n1, n1 - 1.0
    return n1 * n2 / (n1 + n2), n1 + n2 - 2.0


def pingouin_bf10(t: float, n1: int, n2: int | None, paired: bool, scale: float) -> float:
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # quad's accuracy warnings on extreme inputs
        try:
            return float(pingouin.bayesfactor_ttest(t, n1, n2, paired=paired, r=scale))
        except ZeroDivisionError:  # its null likelihood underflows to zero
            return math.inf


# -- the reference library: the JZS integral in mpmath ------------------------------------------

def mp_log_bf10(t: float, n: float, df: float, scale: float) -> mpmath.mpf:
    """ln BF10 by eq. 1 of Rouder et al. (2009) in mpmath (JZS-01), integrated over u = ln g
    around the peak of the integrand, found by a coarse scan, so that extreme t and n (BF10
    beyond the range of a float) come out right too."""
    mpmath.mp.dps = 20
    t, n, df, scale = (mpmath.mpf(x) for x in (t, n, df, scale))
    half = (df + 1) / 2

    def log_integrand(u):
        g = mpmath.exp(u)
        spread = 1 + n * g * scale**2
        return (-mpmath.log(spread) / 2 - half * mpmath.log1p(t * t / (spread * df))
                - mpmath.log(2 * mpmath.pi) / 2 - u / 2 - 1 / (2 * g))

    peak = max((mpmath.mpf(k) / 4 for k in range(-40, 240)), key=log_integrand)
    top = log_integrand(peak)
    # finite ends: below u = -30 the prior is exp(-e^30 / 2); above 120 the integrand is e^-120
    points = sorted({max(min(peak + k, mpmath.mpf(120)), mpmath.mpf(-30))
                     for k in (-60, -16, -8, -4, -2, -1, 0, 1, 2, 4, 8, 16, 32, 150)})
    integral = mpmath.quad(lambda u: mpmath.exp(log_integrand(u) - top), points)
    return top + mpmath.log(integral) + half * mpmath.log1p(t * t / df)


# -- 1. the Sellke-Bayarri-Berger bound (section 5) -----------------------------------------------

SBB = _load("sellke_bayarri_berger.csv")


@pytest.mark.parametrize("row", SBB, ids=[
    f"{r['id']} p = {r['p']}, pi0 = {r['prior_null']} {_source(r)}" for r in SBB])
def test_minimum_bf01_and_posterior_match_published_table(row):
    """SBB-03..10: -e p ln p and the minimum P(H0 | p) it implies, rounded as printed."""
    p, prior = float(row["p"]), float(row["prior_null"])
    bound = minimum_bf01(p)
    if row["min_bf01"]:
        assert rounds_to(bound, row["min_bf01"], row["min_bf01_decimals"])
    assert rounds_to(posterior_null(bound, prior), row["min_posterior_null"],
                     row["posterior_decimals"])


@pytest.mark.parametrize("p", [1e-12, 1e-6, 0.0001, 0.003, 0.049, 0.2, 0.3678])
def test_minimum_bf01_equals_the_formula_in_mpmath(p):
    """SBB-01 (Sellke, Bayarri & Berger 2001; seen in S5.2): B = -e p ln p below 1/e."""
    mpmath.mp.dps = 30
    expected = -mpmath.e * mpmath.mpf(p) * mpmath.log(mpmath.mpf(p))
    assert minimum_bf01(p) == pytest.approx(float(expected), rel=1e-13)


def test_minimum_bf01_is_one_from_one_over_e():
    """SBB-01: the bound is 1 for p >= 1/e, and the formula meets it there (continuity)."""
    assert minimum_bf01(1.0 / math.e) == 1.0
    assert minimum_bf01(0.5) == minimum_bf01(1.0) == 1.0
    assert minimum_bf01(1.0 / math.e - 1e-9) == pytest.approx(1.0, abs=1e-12)
    assert minimum_bf01(0.0) == 0.0
    with pytest.raises(ValueError):
        minimum_bf01(1.5)


def test_posterior_null_formula():
    """SBB-02/03 [memory]: P(H0 | x) = [1 + (1 - pi0) / pi0 / B]^-1, exactly in mpmath."""
    mpmath.mp.dps = 30
    for bf01, prior in [(0.407, 0.5), (3.0, 0.2), (1e-5, 0.9), (250.0, 0.01)]:
        expected = 1 / (1 + (1 - mpmath.mpf(prior)) / mpmath.mpf(prior) / mpmath.mpf(bf01))
        assert posterior_null(bf01, prior) == pytest.approx(float(expected), rel=1e-13)
    assert posterior_null(math.inf, 0.5) == 1.0
    assert posterior_null(0.0, 0.5) == 0.0
    with pytest.raises(ValueError):
        posterior_null(1.0, 1.0)


@settings(max_examples=300, deadline=None)
@given(bf01=st.floats(1e-300, 1e300), low=st.floats(1e-6, 1 - 1e-6),
       high=st.floats(1e-6, 1 - 1e-6))
def test_posterior_null_within_unit_interval_and_monotone_in_prior(bf01, low, high):
    low, high = min(low, high), max(low, high)
    first, second = posterior_null(bf01, low), posterior_null(bf01, high)
    assert 0.0 <= first <= second <= 1.0


@settings(max_examples=200, deadline=None)
@given(p=st.floats(1e-300, 1.0), q=st.floats(1e-300, 1.0), prior=st.floats(0.01, 0.99))
def test_minimum_posterior_grows_with_p(p, q, prior):
    """The bound increases on (0, 1/e) and is 1 beyond: a larger p never speaks more
    strongly against the null."""
    p, q = min(p, q), max(p, q)
    assert 0.0 <= minimum_bf01(p) <= minimum_bf01(q) <= 1.0
    assert posterior_null(minimum_bf01(p), prior) <= posterior_null(minimum_bf01(q), prior)


# -- 2. the JZS Bayes factor (section 6) ----------------------------------------------------------

BAYES_FACTORS = _load("bayes_factors.csv")
JZS = [r for r in BAYES_FACTORS if r["method"] == "jzs"]
BIC_T = [r for r in BAYES_FACTORS if r["method"] == "bic-t"]


def _jzs_id(row: dict[str, str]) -> str:
    n = row["n1"] + (f" + {row['n2']}" if row["n2"] else "")
    return (f"{row['id']} t = {row['t']}, n = {n} {row['design']}, r = {row['prior_scale']} "
            f"-> {row['quantity']} {row['value']} {_source(row)}")


@pytest.mark.parametrize("row", JZS, ids=[_jzs_id(r) for r in JZS])
def test_jzs_bf10_matches_published_values(row):
    n, df = sample(row["design"], float(row["n1"]), float(row["n2"] or 0))
    bf10 = jzs_bf10(float(row["t"]), n, df, float(row["prior_scale"]))
    value = bf10 if row["quantity"] == "bf10" else 1.0 / bf10
    if row["relative_tolerance"]:   # a printed digit beyond its source's accuracy (see note)
        assert value == pytest.approx(float(row["value"]), rel=float(row["relative_tolerance"]))
        assert not rounds_to(value, row["value"], row["decimals"])
    else:
        assert rounds_to(value, row["value"], row["decimals"])


@pytest.mark.parametrize("row", [r for r in JZS if r["id"] in ("JZS-02", "JZS-06", "JZS-09")],
                         ids=lambda r: f"{r['id']} r = {r['prior_scale']} [mpmath]")
def test_jzs_bf10_equals_mpmath_integral(row):
    """The published rows again, now against eq. 1 integrated by mpmath (JZS-01)."""
    n, df = sample(row["design"], float(row["n1"]), float(row["n2"] or 0))
    t, scale = float(row["t"]), float(row["prior_scale"])
    assert math.log(jzs_bf10(t, n, df, scale)) == pytest.approx(
        float(mp_log_bf10(t, n, df, scale)), abs=1e-8)


@pytest.mark.parametrize("text, design, t, n1, n2", [
    ("JZS-06", "between", "3.5", 20, 20),
    ("JZS-07", "within", "3.5", 20, None),
])
def test_recompute_gives_the_published_jzs_evidence(text, design, t, n1, n2):
    """JZS-06/07 (pingouin's docstring, seen) through `recompute`: the design words pick the
    JZS sample size; BF01 is reported, so 1 / BF01 must round to the published BF10."""
    row = next(r for r in JZS if r["id"] == text)
    df = str(n1 + n2 - 2) if n2 else str(n1 - 1)
    evidence = recompute(claim("t", (df,), t, design=design), Settings(prior_scale=0.707)).evidence
    assert evidence.method == "jzs" and evidence.prior_scale == 0.707
    assert rounds_to(1.0 / evidence.bf01, row["value"], row["decimals"])
    assert evidence.posterior_null == pytest.approx(evidence.bf01 / (1 + evidence.bf01))


GRID_T = [0.0, 0.5, 1.96, 3.5, 10.0, 50.0]
GRID_N = [5, 20, 80, 1000, 100000]
GRID_SCALE = [0.5, SQRT_HALF, 1.0, math.sqrt(2.0)]


@pytest.mark.parametrize("paired", [True, False], ids=["paired", "independent"])
@pytest.mark.parametrize("scale", GRID_SCALE, ids=lambda s: f"r={s:.3f}")
def test_jzs_bf10_agrees_with_pingouin_over_a_grid(paired, scale):
    """pingouin.bayesfactor_ttest (scipy quad of eq. 1) over t up to 50 and n up to 1e5 per
    group: relative error below 1e-6. Where pingouin's null likelihood (1 + t^2/df)^(-(df+1)/2)
    underflows (t = 50 with n >= 1000) it returns infinity; those cases are checked against
    the mpmath integral in test_jzs_bf10_extreme_cases_against_mpmath."""
    compared = 0
    for t in GRID_T:
        for n in GRID_N:
            expected = pingouin_bf10(t, n, n, paired, scale)
            if not math.isfinite(expected):
                assert t == 50.0 and n >= 1000, (t, n)
                continue
            size, df = sample("paired" if paired else "independent", n, n)
            assert jzs_bf10(t, size, df, scale) == pytest.approx(expected, rel=1e-6), (t, n)
            compared += 1
    assert compared >= 26


@pytest.mark.parametrize("t, n, df, scale", [
    (50.0, 1000, 999, SQRT_HALF),         # paired, BF10 = e^621.6
    (50.0, 50000, 199998, 1.0),           # independent, 1e5 + 1e5: BF10 = e^1250, capped
    (50.0, 100000, 99999, SQRT_HALF),     # paired n = 1e5: BF10 = e^1229, capped
    (0.0, 100000, 99999, 0.5),            # t = 0 at n = 1e5: strong evidence for the null
    (2.0, 50000, 199998, SQRT_HALF),      # significant at .05, yet BF01 = 27
])
def test_jzs_bf10_extreme_cases_against_mpmath(t, n, df, scale):
    """Where BF10 exceeds e^700 scrutiny reports e^700 (BF01 = 1e-304, 'overwhelming')."""
    expected = float(mp_log_bf10(t, n, df, scale))
    got = math.log(jzs_bf10(t, n, df, scale))
    if expected > 700.0:
        assert got == 700.0
    else:
        assert got == pytest.approx(expected, abs=1e-6)


def test_f_with_one_df_is_the_jzs_of_its_t():
    """F(1, 38) = 3.5^2 as t = 3.5 of two groups of 20: JZS-06 (pingouin docstring, seen)."""
    evidence = recompute(claim("F", ("1", "38"), "12.25"), Settings(prior_scale=0.707)).evidence
    assert evidence.method == "jzs"
    assert rounds_to(1.0 / evidence.bf01, "26.743", 3)


@pytest.mark.parametrize("r, df", [(".03", "12000"), (".45", "28"), ("-.32", "48"), (".2", "8"),
                                   (".8", "3")])
def test_correlation_bf_is_that_of_wetzels_and_wagenmakers(r, df):
    """r(df) enters the JZS integral through its t with N = df + 2 observations: the default
    correlation Bayes factor of Wetzels & Wagenmakers (2012), as pingouin computes it
    (`bayesfactor_pearson(method="wetzels")`, whose g-prior has scale 1)."""
    evidence = recompute(claim("r", (df,), r), Settings(prior_scale=1.0)).evidence
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        expected = 1.0 / float(pingouin.bayesfactor_pearson(float(r), int(df) + 2,
                                                            method="wetzels"))
    assert evidence.bf01 == pytest.approx(expected, rel=1e-6)
    assert f"N = df + 2 = {int(df) + 2:,}" in evidence.assumption


@settings(max_examples=150, deadline=None)
@given(p=st.floats(0.001, 0.2), n=st.integers(100, 100000), factor=st.floats(1.5, 100.0),
       design=st.sampled_from(["within", "between"]),
       scale=st.sampled_from([0.5, SQRT_HALF, 1.0]))
def test_at_a_fixed_p_bf01_grows_with_n(p, n, factor, design, scale):
    """The large-n paradox (Lindley 1957; Rouder et al. 2009, fig. 5): the same p-value is
    weaker evidence against the null in a larger sample. Below n = 100 and for p < .001 it
    need not hold (the t distribution's heavy tails: at p = 1e-4, BF01 falls from n = 4 to 5
    for pingouin as well), so the property is asserted from n = 100 on. The t of each p is
    generated with scipy's inverse t (input generation only); the assertion compares BF01
    across n."""
    def bf01(size: float) -> float:
        df = size - 1.0 if design == "within" else size - 2.0
        effective = size if design == "within" else size / 4.0
        t = float(special.stdtrit(df, 1.0 - p / 2.0))
        return 1.0 / jzs_bf10(t, effective, df, scale)

    small, large = bf01(float(n)), bf01(float(round(n * factor)))
    assert large > small


def test_small_samples_are_exempt_from_the_paradox_for_pingouin_too():
    """The exemption above is not scrutiny's: at p = 1e-4, two groups of 2 + 2 give a larger
    BF01 than 2.5 + 2.5 (pingouin.bayesfactor_ttest with the t of that p and df)."""
    t4, t5 = (float(special.stdtrit(df, 1.0 - 0.0001 / 2.0)) for df in (2.0, 3.0))
    assert 1.0 / pingouin_bf10(t4, 2, 2, False, SQRT_HALF) > 1.0 / pingouin_bf10(
        t5, 3, 2, False, SQRT_HALF)
    assert 1.0 / jzs_bf10(t4, 1.0, 2.0, SQRT_HALF) > 1.0 / jzs_bf10(t5, 1.2, 3.0, SQRT_HALF)


# -- 3. the BIC (unit-information) approximation (section 6, Wagenmakers 2007) -------------------

def mp_bic_bf01(chi_square: float, df: float, n: float) -> float:
    """BIC-01 for a likelihood-ratio chi-square on df: BF01 = N^(df/2) exp(-X2/2)."""
    mpmath.mp.dps = 30
    return float(mpmath.mpf(n) ** (mpmath.mpf(df) / 2) * mpmath.exp(-mpmath.mpf(chi_square) / 2))


def mp_bic_bf01_t(t: float, n: float, df: float) -> mpmath.mpf:
    """BIC-02: BF01 = sqrt(n) (1 + t^2/df)^(-n/2)."""
    mpmath.mp.dps = 30
    return mpmath.sqrt(n) * (1 + mpmath.mpf(t) ** 2 / df) ** (-mpmath.mpf(n) / 2)


@pytest.mark.parametrize("row", BIC_T, ids=[
    f"{r['id']} t = {r['t']}, n = {r['n1']} {_source(r)}" for r in BIC_T])
def test_bic_rows_follow_the_one_sample_convention(row):
    """BIC-03..07 were computed with BIC-02 and df = n - 1 (one sample); the two-sample
    convention (n = N, df = N - 2; section 6 note) gives other numbers."""
    t, n = float(row["t"]), float(row["n1"])
    one_sample = mp_bic_bf01_t(t, n, n - 1)
    assert rounds_to(float(one_sample), row["value"], row["decimals"])
    assert rounds_to(float(one_sample / (1 + one_sample)), row["posterior_null"],
                     row["posterior_decimals"])
    assert not rounds_to(float(mp_bic_bf01_t(t, n, n - 2)), row["value"], row["decimals"])


@pytest.mark.parametrize("chi_square, df, n", [
    (4.41, 1, 50000), (9.84, 1, 24310), (5.49, 2, 640), (30.07, 2, 2757), (0.0, 3, 10),
    (9.1204, 1, 12480), (40.0, 6, 1e6),
])
def test_bic_bf01_equals_mpmath(chi_square, df, n):
    assert bic_bf01(chi_square, df, n) == pytest.approx(mp_bic_bf01(chi_square, df, n), rel=1e-12)


def test_bic_bf01_rejects_what_it_cannot_compute():
    with pytest.raises(ValueError):
        bic_bf01(4.0, 1, 1)
    with pytest.raises(ValueError):
        bic_bf01(4.0, 0, 100)


# -- 4. Lindley's paradox (section 7) --------------------------------------------------------------

LINDLEY = {(r["id"], r["quantity"]): r for r in _load("lindley.csv")}


def test_lindley_normal_prior_example_is_the_unit_information_bf():
    """LIN-07/08: with tau = sigma the normal prior is the unit-information prior, whose Bayes
    factor sqrt(1 + n) exp(-(z^2/2) n/(1 + n)) differs from BIC's sqrt(n) exp(-z^2/2) by the
    factor sqrt(1 + 1/n) exp(z^2 / (2 (n + 1))), exactly; with it the published 13.537 and
    P(H0 | x) = .931 come back."""
    row, posterior = LINDLEY[("LIN-08", "bf01")], LINDLEY[("LIN-08", "posterior_null")]
    z, n = float(row["z"]), float(row["n"])
    ours = bic_bf01(z * z, 1, n)
    exact = ours * math.sqrt(1.0 + 1.0 / n) * math.exp(z * z / (2.0 * (n + 1.0)))
    assert rounds_to(exact, row["value"], row["decimals"])
    assert rounds_to(posterior_null(exact), posterior["value"], posterior["decimals"])
    assert ours == pytest.approx(exact, rel=3.0 / n)   # BIC's own error is O(1/n)


def test_lindley_births_example():
    """LIN-01..06: 49,581 boys and 48,870 girls. The published Bayes factor (uniform prior on
    the proportion, BF01 = LIN-04 / LIN-05 = 19.21, P(H0 | x) = .9505) and scrutiny's BIC Bayes
    factor from z differ only in the prior density at the observed proportion: the
    unit-information prior N(1/2, 1/4) has density 1/(sqrt(2 pi) / 2) there, the uniform 1
    (Laplace's method; Kass & Raftery 1995). So BIC BF01 = 19.21 sqrt(2 pi) / 2 = 24.08, to
    O(1/n); z itself gives the p of LIN-02."""
    boys = float(LINDLEY[("LIN-04", "likelihood_null")]["successes"])
    girls = float(LINDLEY[("LIN-04", "likelihood_null")]["failures"])
    n = boys + girls
    z = (boys - n / 2.0) / math.sqrt(n / 4.0)
    p_row = LINDLEY[("LIN-02", "p_two_sided")]
    result = recompute(claim("z", (), f"{z:.6f}", n=f"{n:.0f}"), Settings())
    assert rounds_to(result.p, p_row["value"], p_row["decimals"])

    null = float(LINDLEY[("LIN-04", "likelihood_null")]["value"])
    alternative = float(LINDLEY[("LIN-05", "likelihood_alternative")]["value"])
    uniform_bf01 = null / alternative
    posterior = LINDLEY[("LIN-06", "posterior_null")]
    assert rounds_to(posterior_null(uniform_bf01), posterior["value"], posterior["decimals"])
    evidence = result.evidence
    assert evidence.method == "bic"
    assert evidence.bf01 == pytest.approx(uniform_bf01 * math.sqrt(2.0 * math.pi) / 2.0, rel=1e-4)
    assert evidence.bf01 > 1.0 and result.p < 0.05      # the paradox


# -- 5. what cannot be computed ---------------------------------------------------------------------

@pytest.mark.parametrize("test, df, statistic, n, reason", [
    ("chi2", ("1",), "9.00", None, "no N printed for the chi2 result"),
    ("z", (), "3.00", None, "no N printed for the z result"),
    ("chi2", ("1",), "4.00", "1", "N = 1: the BIC approximation needs N > 1"),
    ("z", (), "2.10", "1", "N = 1: the BIC approximation needs N > 1"),
    ("r", ("28",), "1.00", None, "|r| = 1: no Bayes factor"),
    ("r", ("28",), "-1.00", None, "|r| = 1: no Bayes factor"),
])
def test_evidence_without_a_bayes_factor_says_why(test, df, statistic, n, reason):
    """The Sellke-Bayarri-Berger bound needs only p, so it is still given."""
    evidence = recompute(claim(test, df, statistic, n=n), Settings()).evidence
    assert evidence.bf01 is None and evidence.reason == reason
    assert evidence.min_bf01 is not None and 0.0 <= evidence.min_bf01 <= 1.0


def test_prior_settings_reach_the_evidence():
    evidence = recompute(claim("t", ("38",), "3.5", design="between"),
                         Settings(prior_scale=1.0, prior_null=0.9)).evidence
    n, df = sample("independent", 20, 20)
    assert evidence.bf01 == pytest.approx(1.0 / pingouin_bf10(3.5, 20, 20, False, 1.0), rel=1e-6)
    assert evidence.bf01 == pytest.approx(1.0 / jzs_bf10(3.5, n, df, 1.0))
    assert evidence.prior_scale == 1.0 and evidence.prior_null == 0.9
    assert evidence.posterior_null == pytest.approx(1.0 / (1.0 + (0.1 / 0.9) / evidence.bf01))
