"""Printed numbers and the intervals their rounding stands for.

The expected values here are facts of the rounding rule in the design notes (section
"Rounding"): a number printed to k decimals stands for every value within half a unit of its
last digit ("2.45" -> [2.445, 2.455], "p = .021" -> [.0205, .0215]); "p < .001" is a bound
taken at face value ([0, .001]); "p = .000" is a rounded zero ([0, .0005]); "ns" means p at or
above alpha; a bound on a statistic printed with decimals is itself rounded, so it is read
leniently by half a unit, while a whole-number bound ("F < 1") is read exactly.
APA-01 (report p < .001, never p = .000) comes from tests/data/reference/reporting_rules.csv.
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

import pytest

from scrutiny.model import Interval
from scrutiny.rounding import (
    FLOAT_SLACK,
    UnreadableNumber,
    intervals_meet,
    magnitude_interval,
    parse_printed,
    reported_p_interval,
    statistic_interval,
)

REFERENCE = Path(__file__).parent / "data" / "reference"


def approx_interval(low: float, high: float):
    return pytest.approx((low, high), rel=1e-12, abs=1e-15)


def as_tuple(interval: Interval) -> tuple[float, float]:
    return interval.low, interval.high


# -- parse_printed: every printed form the module docstring lists -----------------------------
# (printed, value, half unit, decimals); the half unit is half of the last printed digit.
PRINTED_FORMS = [
    # plain numbers
    ("2.45", 2.45, 0.005, 2),
    ("12", 12.0, 0.5, 0),
    ("3.0", 3.0, 0.05, 1),
    ("1.", 1.0, 0.5, 0),
    ("0.021", 0.021, 0.0005, 3),
    # no leading zero (APA-02 style for p and r)
    (".021", 0.021, 0.0005, 3),
    (".000", 0.0, 0.0005, 3),
    ("-.5", -0.5, 0.05, 1),
    ("+2.1", 2.1, 0.05, 1),
    # minus and dash variants (ingest maps them to "-"; parse_printed normalises a fragment too)
    ("\u22122.45", -2.45, 0.005, 2),   # U+2212 minus sign
    ("\u20132.45", -2.45, 0.005, 2),   # en dash
    # thousands separators: a comma followed by exactly three digits
    ("2,506.01", 2506.01, 0.005, 2),
    ("1,234", 1234.0, 0.5, 0),
    ("12,345,678", 12_345_678.0, 0.5, 0),
    # decimal commas
    ("4,77", 4.77, 0.005, 2),
    ("0,5", 0.5, 0.05, 1),
    ("0,021", 0.021, 0.0005, 3),       # a lone zero before the comma: not a thousands group
    ("1,2345", 1.2345, 0.00005, 4),
    # stray spaces inside a number
    ("2 506.01", 2506.01, 0.005, 2),
    ("2. 45", 2.45, 0.005, 2),
    # scientific notation: the half unit is that of the mantissa times the power of ten
    ("2.8 × 10-4", 2.8e-4, 0.5e-5, 5),
    ("2.8 × 10\u22124", 2.8e-4, 0.5e-5, 5),       # Unicode minus in the exponent
    ("2.8 × 10\u207b\u2074", 2.8e-4, 0.5e-5, 5),  # superscript exponent
    ("2.8×10⁻⁴", 2.8e-4, 0.5e-5, 5),
    ("2.8x10^-4", 2.8e-4, 0.5e-5, 5),
    ("2.8 X 10-4", 2.8e-4, 0.5e-5, 5),
    ("2.8*10^-4", 2.8e-4, 0.5e-5, 5),
    ("2.8 · 10-4", 2.8e-4, 0.5e-5, 5),
    ("2.8·10-4", 2.8e-4, 0.5e-5, 5),             # middle dot as multiplication sign, no spaces
    ("2,8 × 10-4", 2.8e-4, 0.5e-5, 5),           # decimal comma in the mantissa
    ("3e-5", 3e-5, 0.5e-5, 5),
    ("3E-5", 3e-5, 0.5e-5, 5),
    ("2.954e-07", 2.954e-7, 0.5e-10, 10),
    ("1.5e+3", 1500.0, 50.0, -2),
    ("10-6", 1e-6, 0.5e-6, 6),                   # a bare power of ten: mantissa 1
    ("10^-6", 1e-6, 0.5e-6, 6),
    ("10\u207b\u2076", 1e-6, 0.5e-6, 6),
]


@pytest.mark.parametrize("printed, value, half_unit, decimals", PRINTED_FORMS,
                         ids=[f[0] for f in PRINTED_FORMS])
def test_parse_printed(printed, value, half_unit, decimals):
    number = parse_printed(printed)
    assert number.value == pytest.approx(value, rel=1e-15)
    assert number.half_unit == pytest.approx(half_unit, rel=1e-12)
    assert number.decimals == decimals
    assert as_tuple(number.interval) == approx_interval(value - half_unit, value + half_unit)


def test_scientific_value_is_the_decimal_value():
    """3e-5 is read as the double nearest 3e-5, not as 3 * 1e-5 (which differs in the last bit)."""
    assert parse_printed("3e-5").value == 3e-5
    assert parse_printed("2.8 × 10-4").value == 2.8e-4


@pytest.mark.parametrize("printed", ["", ".", "abc", "1.2.3", "1,2,3", "2.506,01", "p", "--1",
                                     "1e", "× 10-4"])
def test_unreadable_numbers_raise(printed):
    with pytest.raises(UnreadableNumber):
        parse_printed(printed)


# -- statistic_interval -----------------------------------------------------------------------

def test_statistic_interval_equals():
    assert as_tuple(statistic_interval("2.45", "=")) == approx_interval(2.445, 2.455)
    assert as_tuple(statistic_interval("-2.45", "=")) == approx_interval(-2.455, -2.445)
    assert as_tuple(statistic_interval("2.228", "=")) == approx_interval(2.2275, 2.2285)
    assert as_tuple(statistic_interval("12", "=", 0.0)) == approx_interval(11.5, 12.5)


def test_statistic_interval_is_clipped_to_the_range():
    # an F or chi-square printed as 0.00 stands for [0, 0.005], not [-0.005, 0.005]
    assert as_tuple(statistic_interval("0.00", "=", 0.0)) == approx_interval(0.0, 0.005)
    # r = 1.00 stands for [0.995, 1]
    assert as_tuple(statistic_interval("1.00", "=", -1.0, 1.0)) == approx_interval(0.995, 1.0)
    assert as_tuple(statistic_interval("-1.00", "=", -1.0, 1.0)) == approx_interval(-1.0, -0.995)


def test_statistic_interval_of_an_impossible_value_is_the_nearest_possible_point():
    # r = 1.20 lies outside [-1, 1]: the interval collapses to the range's end
    assert as_tuple(statistic_interval("1.20", "=", -1.0, 1.0)) == (1.0, 1.0)


@pytest.mark.parametrize("comparator", [">", ">="])
def test_lower_bound_is_lenient_by_half_a_unit(comparator):
    # "t >= 3.19": the bound is itself rounded, so t may be as low as 3.185
    assert as_tuple(statistic_interval("3.19", comparator)) == (pytest.approx(3.185), math.inf)
    assert as_tuple(statistic_interval("3.19", comparator, 0.0, 10.0)) == approx_interval(3.185, 10.0)


@pytest.mark.parametrize("comparator", ["<", "<="])
def test_upper_bound_is_lenient_by_half_a_unit(comparator):
    # "F < 1": a whole-number threshold chosen by the authors is read exactly
    assert as_tuple(statistic_interval("1", comparator, 0.0)) == approx_interval(0.0, 1.0)
    # "F < 1.00": a rounded bound, F up to 1.005
    assert as_tuple(statistic_interval("1.00", comparator, 0.0)) == approx_interval(0.0, 1.005)
    # without a range the lower end is unbounded
    assert statistic_interval("2.0", comparator).low == -math.inf


# -- magnitude_interval -----------------------------------------------------------------------

@pytest.mark.parametrize("low, high, expected", [
    (2.445, 2.455, (2.445, 2.455)),
    (-2.455, -2.445, (2.445, 2.455)),
    (-0.005, 0.005, (0.0, 0.005)),   # a printed 0.00: |t| from 0
    (-1.0, 3.0, (0.0, 3.0)),
    (-3.0, 1.0, (0.0, 3.0)),
    (0.0, 0.0, (0.0, 0.0)),
])
def test_magnitude_interval(low, high, expected):
    assert as_tuple(magnitude_interval(Interval(low, high))) == expected


# -- reported_p_interval ----------------------------------------------------------------------

@pytest.mark.parametrize("comparator, printed, expected", [
    ("=", ".021", (0.0205, 0.0215)),       # design notes: "p = .021" means [.0205, .0215]
    ("=", "0.021", (0.0205, 0.0215)),
    ("=", "0,021", (0.0205, 0.0215)),      # decimal comma
    ("=", ".04", (0.035, 0.045)),
    ("=", ".000", (0.0, 0.0005)),          # design notes: "p = .000" means p < .0005
    ("=", "0", (0.0, 0.5)),                # a zero with no decimals is rounded to a unit
    ("=", "1.00", (0.995, 1.0)),           # clipped at 1
    ("=", "2.8 × 10-4", (2.75e-4, 2.85e-4)),
    ("=", "2.954e-07", (2.9535e-7, 2.9545e-7)),
    ("<", ".001", (0.0, 0.001)),           # a bound at face value, not lenient
    ("<=", ".05", (0.0, 0.05)),
    ("<", "10-6", (0.0, 1e-6)),
    (">", ".05", (0.05, 1.0)),
    (">=", ".10", (0.10, 1.0)),
])
def test_reported_p_interval(comparator, printed, expected):
    assert as_tuple(reported_p_interval(comparator, printed, 0.05)) == approx_interval(*expected)


@pytest.mark.parametrize("alpha", [0.05, 0.01, 0.10])
def test_ns_means_p_at_or_above_alpha(alpha):
    assert as_tuple(reported_p_interval("ns", "", alpha)) == (alpha, 1.0)


def test_p_outside_zero_one_is_clipped_to_a_point():
    # "p = 1.20" is impossible (impossible-value reports it); the interval is the nearest p
    assert as_tuple(reported_p_interval("=", "1.20", 0.05)) == (1.0, 1.0)


def test_unknown_p_comparator_raises():
    with pytest.raises(ValueError):
        reported_p_interval("~", ".05", 0.05)


with open(REFERENCE / "reporting_rules.csv", newline="", encoding="utf-8") as _handle:
    REPORTING = list(csv.DictReader(_handle))


@pytest.mark.parametrize("row", REPORTING, ids=[
    f"{r['id']} p {r['comparator']} {r['printed']} [{r['source'].split(',')[0]}, {r['provenance']}]"
    for r in REPORTING])
def test_apa_p_forms(row):
    """APA-01: p below .001 is printed "p < .001"; a printed "p = .000" still means p < .0005."""
    interval = reported_p_interval(row["comparator"], row["printed"], 0.05)
    assert as_tuple(interval) == approx_interval(float(row["low"]), float(row["high"]))


def test_p_zero_and_p_below_001_differ():
    """p = .000 is a tighter claim than p < .001: a p of .0007 fits the second only."""
    zero = reported_p_interval("=", ".000", 0.05)
    below = reported_p_interval("<", ".001", 0.05)
    assert not zero.contains(0.0007)
    assert below.contains(0.0007)


# -- intervals_meet ---------------------------------------------------------------------------

def test_intervals_meet_when_they_overlap():
    assert intervals_meet(Interval(0.0205, 0.0215), Interval(0.0210, 0.0300))
    assert intervals_meet(Interval(0.0, 1.0), Interval(0.25, 0.5))   # one inside the other


def test_intervals_meet_when_they_touch():
    # p = .021 (up to .0215) and a recomputed p from exactly .0215: the rounded p fits
    assert intervals_meet(Interval(0.0205, 0.0215), Interval(0.0215, 0.0300))
    assert intervals_meet(Interval(0.0215, 0.0300), Interval(0.0205, 0.0215))
    # a point interval at the edge
    assert intervals_meet(Interval(0.0, 0.001), Interval(0.001, 0.001))


def test_intervals_meet_allows_floating_point_error_only():
    edge = reported_p_interval("=", ".021", 0.05).high   # .021 + .0005 in floating point
    tiny = 0.0215 * FLOAT_SLACK / 10                      # well inside the float slack
    assert intervals_meet(Interval(0.0205, edge), Interval(edge + tiny, 0.03))
    # a gap far beyond floating-point error, even a tiny one in p terms, is a gap
    assert not intervals_meet(Interval(0.0205, 0.0215), Interval(0.0215 + 1e-9, 0.03))
    assert not intervals_meet(Interval(0.0, 0.0005), Interval(0.000501, 0.0006))


def test_intervals_apart_do_not_meet():
    assert not intervals_meet(Interval(0.0205, 0.0215), Interval(0.0220, 0.0300))
    assert not intervals_meet(Interval(0.0220, 0.0300), Interval(0.0205, 0.0215))
    assert not intervals_meet(Interval(0.0, 0.001), Interval(0.0011, 0.002))
