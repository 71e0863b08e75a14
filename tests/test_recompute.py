"""Recomputation checked against sources outside the project.

Expected values come from published tables and worked examples (copied with their sources into
tests/data/reference/, see the README there) or from mpmath, a reference library with its own
arbitrary-precision incomplete beta and gamma functions. Nothing here compares scipy with
scipy: where the reference data holds a value that was computed rather than published, the test
recomputes it with mpmath too.

Each parametrized check carries its entry ID and source in its test id, e.g.
``CV-T-04 t(10) = 2.228 ... [NIST-derived table ..., seen]``.
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

import mpmath
import pytest

from scrutiny.model import Claim, Interval, Location, PValue, Settings
from scrutiny.recompute import (
    implied_effect,
    p_chi2,
    p_f,
    p_interval,
    p_r,
    p_t,
    p_value,
    p_z,
    recompute,
    t_from_r,
)
from scrutiny.rounding import intervals_meet, parse_printed, reported_p_interval, statistic_interval

REFERENCE = Path(__file__).parent / "data" / "reference"


def _load(name: str) -> list[dict[str, str]]:
    with open(REFERENCE / name, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def _df(row: dict[str, str]) -> tuple[float, ...]:
    return tuple(float(row[key]) for key in ("df1", "df2") if row[key])


def _source(row: dict[str, str]) -> str:
    """Entry ID's source for a test id: the source's first clause and the provenance tag."""
    return f"[{row['source'].split(',')[0]}, {row['provenance']}]"


def _printed_df(row: dict[str, str]) -> str:
    return ", ".join(row[key] for key in ("df1", "df2") if row[key])


# -- the reference library: p-values from mpmath ---------------------------------------------
# Closed forms (Abramowitz & Stegun 26.5.27, 26.6.8, 26.4.19; for r, df/(df + t^2) = 1 - r^2):
#   t, two-sided:   p = I_{df/(df + t^2)}(df/2, 1/2)
#   r, two-sided:   p = I_{1 - r^2}(df/2, 1/2),            df = n - 2
#   F, upper tail:  p = I_{df2/(df2 + df1 F)}(df2/2, df1/2)
#   chi2, upper:    p = Q(df/2, x/2)  (regularized upper incomplete gamma)
#   z, two-sided:   p = erfc(|z| / sqrt(2))
# I is mpmath's regularized incomplete beta function, evaluated at 40 significant digits from
# the exact binary value of each double argument.

MP_DIGITS = 40


def mp_p_t(t: float, df: float) -> mpmath.mpf:
    with mpmath.workdps(MP_DIGITS):
        t, df = mpmath.mpf(t), mpmath.mpf(df)
        return +mpmath.betainc(df / 2, mpmath.mpf(1) / 2, 0, df / (df + t * t), regularized=True)


def mp_p_r(r: float, df: float) -> mpmath.mpf:
    with mpmath.workdps(MP_DIGITS):
        r, df = mpmath.mpf(r), mpmath.mpf(df)
        return +mpmath.betainc(df / 2, mpmath.mpf(1) / 2, 0, 1 - r * r, regularized=True)


def mp_p_f(f: float, df1: float, df2: float) -> mpmath.mpf:
    with mpmath.workdps(MP_DIGITS):
        f, df1, df2 = mpmath.mpf(f), mpmath.mpf(df1), mpmath.mpf(df2)
        return +mpmath.betainc(df2 / 2, df1 / 2, 0, df2 / (df2 + df1 * f), regularized=True)


def mp_p_chi2(x: float, df: float) -> mpmath.mpf:
    with mpmath.workdps(MP_DIGITS):
        return +mpmath.gammainc(mpmath.mpf(df) / 2, mpmath.mpf(x) / 2, mpmath.inf,
                                regularized=True)


def mp_p_z(z: float) -> mpmath.mpf:
    with mpmath.workdps(MP_DIGITS):
        return +mpmath.erfc(abs(mpmath.mpf(z)) / mpmath.sqrt(2))


def mp_p(test: str, statistic: float, df: tuple[float, ...]) -> mpmath.mpf:
    if test == "t":
        return mp_p_t(statistic, df[0])
    if test == "r":
        return mp_p_r(statistic, df[0])
    if test == "F":
        return mp_p_f(statistic, df[0], df[1])
    if test == "chi2":
        return mp_p_chi2(statistic, df[0])
    if test == "z":
        return mp_p_z(statistic)
    raise ValueError(test)


def mp_p_interval(test: str, values: Interval, df: tuple[float, ...]) -> tuple[mpmath.mpf, ...]:
    """p over a statistic interval that does not straddle zero (p falls as |statistic| grows)."""
    assert values.low > 0 or values.high < 0
    near, far = sorted((abs(values.low), abs(values.high)))
    return mp_p(test, far, df), mp_p(test, near, df)


def relative_error(ours: float, reference: mpmath.mpf) -> float:
    return float(abs(mpmath.mpf(ours) - reference) / reference)


# -- 1. critical values from published tables --------------------------------------------------

CRITICAL = _load("critical_values.csv")


def _critical_id(row: dict[str, str]) -> str:
    what = f"{row['test']}({_printed_df(row)})" if row["df1"] else row["test"]
    return (f"{row['id']} {what} = {row['printed']} {row['table_column']} {row['expect']} "
            f"{_source(row)}")


@pytest.mark.parametrize("row", CRITICAL, ids=[_critical_id(r) for r in CRITICAL])
def test_tabled_critical_value_gives_the_tables_alpha(row):
    """A tabled critical value, read as a printed statistic, gives p intervals around alpha.

    "2.228" with df 10 stands for t in [2.2275, 2.2285], whose two-sided p interval must contain
    .05 (NIST). A known table typo ("expect = disagrees") must not contain it, and mpmath must
    see the same as scrutiny.
    """
    test, df, alpha = row["test"], _df(row), float(row["alpha"])
    assert parse_printed(row["printed"]).decimals == int(row["decimals"])
    values = statistic_interval(row["printed"], "=")
    ours = p_interval(test, values, df)
    reference_low, reference_high = mp_p_interval(test, values, df)
    agrees = row["expect"] == "agrees"
    assert (ours.low <= alpha <= ours.high) is agrees, (row["id"], ours)
    assert (reference_low <= alpha <= reference_high) is agrees, (row["id"], reference_low,
                                                                  reference_high)


def test_critical_values_cover_the_tables():
    """The reference data holds the families, levels and negative vectors this file promises."""
    levels = {(r["test"], r["alpha"], r["expect"]) for r in CRITICAL}
    for expected in [("t", ".05", "agrees"), ("t", ".01", "agrees"), ("chi2", ".05", "agrees"),
                     ("chi2", ".01", "agrees"), ("F", ".05", "agrees"), ("t", ".002", "disagrees"),
                     ("F", ".05", "disagrees")]:
        assert expected in levels
    ids = {r["id"] for r in CRITICAL if r["expect"] == "disagrees"}
    assert {"CV-F-18", "CV-F-19", "CV-T-12", "CV-T-13"} <= ids


# -- 2. worked examples: published p of a published statistic ----------------------------------

EXAMPLES = _load("worked_examples.csv")


def _example_id(row: dict[str, str]) -> str:
    return (f"{row['id']} {row['test']}({_printed_df(row)}) = {row['statistic']}, "
            f"p = {row['published_p']} ({row['tails']}) {_source(row)}")


def _claim(test: str, df: tuple[str, ...], statistic: str, p: str) -> Claim:
    return Claim(test=test, df=df, statistic=statistic, statistic_comparator="=",
                 p=PValue("=", p), location=Location(0, 0, 1), text="", sentence="")


@pytest.mark.parametrize("row", EXAMPLES, ids=[_example_id(r) for r in EXAMPLES])
def test_worked_example_p_is_consistent(row):
    """The published p meets scrutiny's p interval for the statistic as printed.

    Both numbers are rounded, so "the published p falls inside the interval" means: the
    interval the printed p stands for meets the interval of p over every statistic that rounds
    to the printed one (design notes, section Rounding). The point p of the printed statistic
    agrees with the published p to its printed precision unless the example's p was computed
    from the unrounded statistic (`point_agrees = no`); mpmath must agree in both respects.
    """
    df_printed = tuple(row[key] for key in ("df1", "df2") if row[key])
    claim = _claim(row["test"], df_printed, row["statistic"], row["published_p"])
    recomputed = recompute(claim, Settings())
    assert recomputed.reason is None
    published = recomputed.reported_p_interval
    assert published == reported_p_interval("=", row["published_p"], 0.05)
    assert parse_printed(row["published_p"]).decimals == int(row["p_decimals"])
    assert parse_printed(row["statistic"]).decimals == int(row["statistic_decimals"])

    one_sided = row["tails"] == "one"
    halve = 2.0 if one_sided else 1.0
    interval = recomputed.p_interval_one_sided if one_sided else recomputed.p_interval
    point = recomputed.p / halve
    assert intervals_meet(interval, published), (interval, published)

    df = _df(row)
    statistic = parse_printed(row["statistic"]).value
    reference_point = mp_p(row["test"], statistic, df) / halve
    reference_low, reference_high = mp_p_interval(row["test"], recomputed.statistic_interval, df)
    assert relative_error(point, reference_point) < 1e-9
    assert intervals_meet(Interval(float(reference_low / halve), float(reference_high / halve)),
                          published)

    point_agrees = row["point_agrees"] == "yes"
    assert published.contains(point) is point_agrees, (point, published)
    assert (published.low <= reference_point <= published.high) is point_agrees


ROUNDED = _load("rounded_statistics.csv")


def _rounded_id(row: dict[str, str]) -> str:
    what = f"{row['test']}({_printed_df(row)})" if row["df1"] else row["test"]
    example = f" from {row['example']}" if row["example"] else ""
    return f"{row['id']}{example} {what} = {row['statistic']} -> p {row['p']} [section 2.5, computed]"


@pytest.mark.parametrize("row", ROUNDED, ids=[_rounded_id(r) for r in ROUNDED])
def test_p_of_a_rounded_statistic(row):
    """p of the statistic as printed, to the 6 digits the reference compilation gives.

    These values were computed, not published; mpmath recomputes them here as well.
    """
    test, df = row["test"], _df(row)
    statistic = parse_printed(row["statistic"]).value
    expected = reported_p_interval("=", row["p"], 0.05)
    assert parse_printed(row["p"]).decimals == int(row["p_decimals"])
    ours = p_value(test, statistic, df)
    reference = mp_p(test, statistic, df)
    assert expected.contains(ours), (ours, expected)
    assert expected.low <= reference <= expected.high
    assert relative_error(ours, reference) < 1e-9


# -- 3. a grid against mpmath ------------------------------------------------------------------
# scrutiny's p_t / p_r / p_f / p_chi2 / p_z against the mpmath closed forms above, to a
# relative error of 1e-9 everywhere, far tails included: scipy.special's stdtr, fdtrc and
# chdtrc work in the tail directly (no 1 - cdf cancellation), so no looser tail tolerance is
# needed. p below 1e-300 is beyond what a double holds reliably; there scrutiny must return a
# number that small (usually 0.0), not an error or NaN.

TOLERANCE = 1e-9
UNDERFLOW = 1e-300

T_DF = [1, 2, 3, 5, 9, 17.776, 30, 42.909, 100, 1000, 10_000]
T_VALUES = [0.0, 0.01, -0.5, 1.0, 1.96, 2.228, 2.5, 4.0, 8.0, 15.0, 30.0, 60.0, 200.0]
R_DF = [1, 2, 3, 5, 7, 10, 30, 37, 100, 1000, 10_000]
R_VALUES = [0.0, 0.001, 0.1, -0.3, 0.5, 0.7, 0.9, 0.99, 0.999, 0.99999, 0.999999, 0.9999999]
F_DF1 = [1, 2, 3, 4, 6, 10, 40.5]
F_DF2 = [1, 2, 5, 10, 17.776, 34, 100, 1000, 10_000]
F_VALUES = [0.0, 0.01, 0.5, 1.0, 2.0, 4.0, 10.0, 30.0, 100.0, 1000.0]
CHI2_DF = [1, 2, 3, 4, 5, 10, 17.5, 30, 100, 1000, 10_000]
CHI2_VALUES = [0.001, 0.5, 1.0, 3.84, 10.0, 30.0, 55.0, 100.0, 200.0, 1000.0, 10_500.0, 12_000.0]
Z_VALUES = [0.0, 0.01, -0.5, 1.0, 1.96, 2.58, 3.29, 5.0, 7.13, 10.0, 20.0, 30.0, 37.0]

GRID = (
    [("t", (df,), T_VALUES) for df in T_DF]
    + [("r", (df,), R_VALUES) for df in R_DF]
    + [("F", (df1, df2), F_VALUES) for df1 in F_DF1 for df2 in F_DF2]
    + [("chi2", (df,), CHI2_VALUES) for df in CHI2_DF]
    + [("z", (), Z_VALUES)]
)

OURS = {
    "t": lambda x, df: p_t(x, df[0]),
    "r": lambda x, df: p_r(x, df[0]),
    "F": lambda x, df: p_f(x, df[0], df[1]),
    "chi2": lambda x, df: p_chi2(x, df[0]),
    "z": lambda x, df: p_z(x),
}


@pytest.mark.parametrize("test, df, values", GRID,
                         ids=[f"{t}{list(df)} vs mpmath" for t, df, _ in GRID])
def test_p_agrees_with_mpmath(test, df, values):
    failures = []
    for x in values:
        ours = OURS[test](x, df)
        reference = mp_p(test, x, df)
        if reference < UNDERFLOW:
            if not 0.0 <= ours < UNDERFLOW:
                failures.append((x, ours, float(reference)))
        elif not relative_error(ours, reference) < TOLERANCE:
            failures.append((x, ours, float(reference), relative_error(ours, reference)))
    assert not failures


def test_grid_reaches_far_tails_and_p_near_one():
    """Every family's grid spans p from near 1 down to 1e-12 and beyond."""
    for test in OURS:
        ps = [float(mp_p(test, x, df)) for t, df, values in GRID if t == test for x in values]
        assert max(ps) > 0.9
        assert min(ps) < 1e-12


def test_p_interval_of_a_printed_zero_reaches_one():
    """t(10) = 0.00 stands for |t| <= 0.005, so its two-sided p runs from p(0.005) to 1."""
    interval = p_interval("t", statistic_interval("0.00", "="), (10.0,))
    assert interval.high == 1.0
    assert relative_error(interval.low, mp_p_t(0.005, 10)) < TOLERANCE


# -- 4. implied effects against published conversions -------------------------------------------

EFFECTS = _load("effect_sizes.csv")


def _effect_id(row: dict[str, str]) -> str:
    design = f" {row['design']}" if row["design"] else ""
    n = f", N = {row['n']}" if row["n"] else ""
    return (f"{row['id']} ({row['formula']}) {row['test']}({_printed_df(row)}{n}) = "
            f"{row['statistic']}{design} -> {row['measure']} {row['value']} {row['expect']} "
            f"{_source(row)}")


@pytest.mark.parametrize("row", EFFECTS, ids=[_effect_id(r) for r in EFFECTS])
def test_implied_effect_matches_published_conversion(row):
    """scrutiny's effect size, rounded as the source prints it, equals the published value.

    Negative rows are the conventions scrutiny does not follow (Rosenthal's 2t/sqrt(df) for
    d_s, t/sqrt(df) for d_z): scrutiny's value must differ from them at their printed precision.
    """
    published = parse_printed(row["value"])
    assert published.decimals == int(row["decimals"])
    df = _df(row)
    if row["function"] == "implied_effect":
        effect = implied_effect(row["test"], parse_printed(row["statistic"]).value, df,
                                float(row["n"]) if row["n"] else None, row["design"] or None)
        assert effect is not None
        assert effect.measure == row["measure"]
        agrees = intervals_meet(Interval(effect.value, effect.value), published.interval)
    else:
        # ES-F-04: r = sqrt(t^2 / (t^2 + df)); scrutiny inverts it with t_from_r, so the t must
        # come back over the values of r that round to the printed r.
        assert row["function"] == "t_from_r"
        r = statistic_interval(row["statistic"], "=", -1.0, 1.0)
        t = Interval(t_from_r(r.low, df[0]), t_from_r(r.high, df[0]))
        agrees = intervals_meet(t, published.interval)
    assert agrees is (row["expect"] == "agrees")


def test_no_implied_w_without_n():
    """Cohen's w needs N; a chi-square without N implies no effect size (ES-W-12 without N)."""
    assert implied_effect("chi2", 4.0, (1.0,), None, None) is None
    assert implied_effect("chi2", 4.0, (1.0,), 100.0, None).value == pytest.approx(0.2, abs=1e-12)
